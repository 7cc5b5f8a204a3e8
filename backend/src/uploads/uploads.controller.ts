import { Body, Controller, Get, Param, Post, UploadedFile, UseInterceptors } from '@nestjs/common';
import { FileInterceptor } from '@nestjs/platform-express';
import { ApiBearerAuth, ApiBody, ApiConsumes, ApiOperation, ApiTags } from '@nestjs/swagger';
import { z } from 'zod';
import { idParamSchema, UPLOAD_KINDS, UPLOAD_LIMITS, type Run, type UploadInfo, type UploadKind } from '@kiln/shared';
import { CurrentUser } from '../auth/auth.decorators';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { badInput } from '../common/api-error';
import { ZodValidationPipe } from '../common/zod-validation.pipe';
import { UploadsService } from './uploads.service';

const uploadFormSchema = z.object({ kind: z.enum(UPLOAD_KINDS, { error: `kind must be one of ${UPLOAD_KINDS.join(', ')}` }) });
const importSchema = z.strictObject({ studyId: idParamSchema });

@ApiTags('uploads')
@ApiBearerAuth()
@Controller('uploads')
export class UploadsController {
  constructor(private readonly uploads: UploadsService) {}

  @Post()
  @ApiOperation({ summary: 'Upload an initial profile (CSV r,h), a target profile (CSV h,f,z) or a checkpoint file; checked before it is stored' })
  @ApiConsumes('multipart/form-data')
  @ApiBody({ schema: { type: 'object', properties: { kind: { type: 'string', enum: [...UPLOAD_KINDS] }, file: { type: 'string', format: 'binary' } }, required: ['kind', 'file'] } })
  // Memory storage with a hard size cap: nothing touches the disk or the database before the checks.
  @UseInterceptors(FileInterceptor('file', { limits: { fileSize: UPLOAD_LIMITS.checkpointBytes, files: 1, fields: 5 } }))
  upload(
    @CurrentUser() user: AuthenticatedUser,
    @Body(new ZodValidationPipe(uploadFormSchema)) body: { kind: UploadKind },
    @UploadedFile() file: { originalname: string; buffer: Buffer; size: number } | undefined,
  ): Promise<UploadInfo> {
    if (!file) throw badInput('a file is required (multipart field "file")', [{ path: 'file', message: 'missing' }]);
    return this.uploads.store(user, body.kind, file);
  }

  @Get()
  @ApiOperation({ summary: "The caller's uploads" })
  list(@CurrentUser() user: AuthenticatedUser): Promise<UploadInfo[]> {
    return this.uploads.list(user);
  }

  @Post(':id/import')
  @ApiOperation({ summary: 'Resume an uploaded checkpoint as a new run in one of your studies' })
  import(
    @CurrentUser() user: AuthenticatedUser,
    @Param('id', new ZodValidationPipe(idParamSchema)) id: string,
    @Body(new ZodValidationPipe(importSchema)) body: { studyId: string },
  ): Promise<Run> {
    return this.uploads.importCheckpoint(user, id, body.studyId);
  }
}
