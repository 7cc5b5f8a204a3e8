import { Body, Controller, Get, HttpCode, Param, Post, Res, StreamableFile } from '@nestjs/common';
import type { Response } from 'express';
import { ApiBearerAuth, ApiBody, ApiOperation, ApiTags } from '@nestjs/swagger';
import { forkRequestSchema, idParamSchema, toNpy, type CheckpointProfile, type DilationProfileView, type ForkRequest, type Run } from '@kiln/shared';
import { CurrentUser } from '../auth/auth.decorators';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { csvLine } from '../common/csv';
import { openApiSchema } from '../common/openapi';
import { ZodValidationPipe } from '../common/zod-validation.pipe';
import { CheckpointsService } from './checkpoints.service';

const id = new ZodValidationPipe(idParamSchema);

@ApiTags('checkpoints')
@ApiBearerAuth()
@Controller('checkpoints')
export class CheckpointsController {
  constructor(private readonly checkpoints: CheckpointsService) {}

  @Get(':id/file')
  @ApiOperation({ summary: 'The checkpoint file (Kiln checkpoint format, docs/checkpoint-format.md)' })
  async file(
    @CurrentUser() user: AuthenticatedUser,
    @Param('id', id) checkpointId: string,
    @Res({ passthrough: true }) response: Response,
  ): Promise<StreamableFile> {
    const { bytes, name, sha256 } = await this.checkpoints.file(user, checkpointId);
    response.setHeader('X-Kiln-SHA256', sha256);
    return new StreamableFile(bytes, { type: 'application/octet-stream', disposition: `attachment; filename="${name}"`, length: bytes.length });
  }

  @Get(':id/profile')
  @ApiOperation({ summary: 'The profile h(r) stored in the checkpoint, for plots' })
  profile(@CurrentUser() user: AuthenticatedUser, @Param('id', id) checkpointId: string): Promise<CheckpointProfile> {
    return this.checkpoints.profile(user, checkpointId);
  }

  @Get(':id/profile.csv')
  @ApiOperation({ summary: 'The profile h(r) of the checkpoint as CSV (columns r,h)' })
  async profileCsv(@CurrentUser() user: AuthenticatedUser, @Param('id', id) checkpointId: string, @Res({ passthrough: true }) response: Response): Promise<string> {
    const { r, h } = await this.checkpoints.profile(user, checkpointId);
    response.setHeader('Content-Type', 'text/csv; charset=utf-8');
    response.setHeader('Content-Disposition', `attachment; filename="kiln-checkpoint-${checkpointId}-profile.csv"`);
    return csvLine(['r', 'h']) + r.map((value, i) => csvLine([value, h[i]])).join('');
  }

  @Get(':id/profile.npy')
  @ApiOperation({ summary: 'The profile as a NumPy .npy array of shape (N, 2): columns r, h' })
  async profileNpy(@CurrentUser() user: AuthenticatedUser, @Param('id', id) checkpointId: string): Promise<StreamableFile> {
    const { r, h } = await this.checkpoints.profile(user, checkpointId);
    const bytes = toNpy([r, h]);
    return new StreamableFile(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), {
      type: 'application/octet-stream',
      disposition: `attachment; filename="kiln-checkpoint-${checkpointId}-profile.npy"`,
      length: bytes.byteLength,
    });
  }

  @Get(':id/dilation-profile')
  @ApiOperation({ summary: 'The Möbius energy profile F(s) = D(h∘γ_s) of the state, its maximiser s* and the gap (sphere domain)' })
  dilationProfile(@CurrentUser() user: AuthenticatedUser, @Param('id', id) checkpointId: string): Promise<DilationProfileView> {
    return this.checkpoints.dilationProfile(user, checkpointId);
  }

  @Post(':id/jump-to-maximiser')
  @ApiOperation({ summary: 'EXPERIMENTAL: a new run (recorded as a fork) starting from h∘γ_{s*}, the state moved to the maximiser of F(s)' })
  @ApiBody({ schema: openApiSchema(forkRequestSchema) })
  jump(
    @CurrentUser() user: AuthenticatedUser,
    @Param('id', id) checkpointId: string,
    @Body(new ZodValidationPipe(forkRequestSchema)) body: ForkRequest,
  ): Promise<Run> {
    return this.checkpoints.jumpToMaximiser(user, checkpointId, body);
  }

  @Post(':id/resume')
  @HttpCode(202)
  @ApiOperation({ summary: 'Continue the same run from this checkpoint' })
  resume(@CurrentUser() user: AuthenticatedUser, @Param('id', id) checkpointId: string): Promise<Run> {
    return this.checkpoints.resume(user, checkpointId);
  }

  @Post(':id/fork')
  @HttpCode(201)
  @ApiOperation({ summary: 'Start a new run from this checkpoint with some spec fields changed' })
  @ApiBody({ schema: openApiSchema(forkRequestSchema) })
  fork(
    @CurrentUser() user: AuthenticatedUser,
    @Param('id', id) checkpointId: string,
    @Body(new ZodValidationPipe(forkRequestSchema)) body: ForkRequest,
  ): Promise<Run> {
    return this.checkpoints.fork(user, checkpointId, body);
  }
}
