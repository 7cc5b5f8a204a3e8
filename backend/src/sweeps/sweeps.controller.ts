import { Body, Controller, Get, HttpCode, Param, Post, Query, Res } from '@nestjs/common';
import type { Response } from 'express';
import { ApiBearerAuth, ApiBody, ApiOperation, ApiTags } from '@nestjs/swagger';
import {
  createSweepRequestSchema,
  idParamSchema,
  Role,
  runListQuerySchema,
  sweepPreviewRequestSchema,
  type CreateSweepRequest,
  type Page,
  type Run,
  type RunListQuery,
  type Sweep,
  type SweepPreviewRequest,
  type SweepPreviewResponse,
} from '@kiln/shared';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { openApiSchema } from '../common/openapi';
import { ZodValidationPipe } from '../common/zod-validation.pipe';
import { SweepsService } from './sweeps.service';

const id = new ZodValidationPipe(idParamSchema);

@ApiTags('sweeps')
@ApiBearerAuth()
@Controller()
export class SweepsController {
  constructor(private readonly sweeps: SweepsService) {}

  @Post('sweeps/preview')
  @HttpCode(200)
  @Roles(Role.Admin, Role.Researcher)
  @ApiOperation({ summary: 'Run count and estimated CPU-hours of a sweep against the quota; writes nothing' })
  @ApiBody({ schema: openApiSchema(sweepPreviewRequestSchema) })
  preview(@CurrentUser() user: AuthenticatedUser, @Body(new ZodValidationPipe(sweepPreviewRequestSchema)) body: SweepPreviewRequest): Promise<SweepPreviewResponse> {
    return this.sweeps.preview(user, body);
  }

  @Post('sweeps')
  @Roles(Role.Admin, Role.Researcher)
  @ApiOperation({ summary: 'Create a sweep: the Cartesian product of its axes applied to the base spec' })
  @ApiBody({ schema: openApiSchema(createSweepRequestSchema) })
  create(@CurrentUser() user: AuthenticatedUser, @Body(new ZodValidationPipe(createSweepRequestSchema)) body: CreateSweepRequest): Promise<Sweep> {
    return this.sweeps.create(user, body);
  }

  @Get('sweeps/:id')
  @ApiOperation({ summary: 'A sweep with its runs counted by state' })
  get(@CurrentUser() user: AuthenticatedUser, @Param('id', id) sweepId: string): Promise<Sweep> {
    return this.sweeps.get(user, sweepId);
  }

  @Get('sweeps/:id/runs')
  @ApiOperation({ summary: "A sweep's runs, filtered, sorted and paged on the server" })
  runs(
    @CurrentUser() user: AuthenticatedUser,
    @Param('id', id) sweepId: string,
    @Query(new ZodValidationPipe(runListQuerySchema)) query: RunListQuery,
  ): Promise<Page<Run>> {
    return this.sweeps.listRuns(user, sweepId, query);
  }

  @Get('sweeps/:id/results.csv')
  @ApiOperation({ summary: "The sweep's results as CSV: one row per run with axis values, outcome, T̂, final energy" })
  async results(
    @CurrentUser() user: AuthenticatedUser,
    @Param('id', id) sweepId: string,
    @Res({ passthrough: true }) response: Response,
  ): Promise<string> {
    const { name, csv } = await this.sweeps.resultsCsv(user, sweepId);
    response.setHeader('Content-Type', 'text/csv; charset=utf-8');
    response.setHeader('Content-Disposition', `attachment; filename="${name}"`);
    return csv;
  }

  @Get('studies/:id/sweeps')
  @ApiOperation({ summary: "A study's sweeps, newest first" })
  forStudy(@CurrentUser() user: AuthenticatedUser, @Param('id', id) studyId: string): Promise<Sweep[]> {
    return this.sweeps.listForStudy(user, studyId);
  }
}
