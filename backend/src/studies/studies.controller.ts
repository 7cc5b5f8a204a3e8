import { Body, Controller, Get, Param, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiBody, ApiOperation, ApiTags } from '@nestjs/swagger';
import { createStudyRequestSchema, idParamSchema, Role, type CreateStudyRequest, type Study } from '@kiln/shared';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { openApiSchema } from '../common/openapi';
import { ZodValidationPipe } from '../common/zod-validation.pipe';
import { StudiesService } from './studies.service';

@ApiTags('studies')
@ApiBearerAuth()
@Controller('studies')
export class StudiesController {
  constructor(private readonly studies: StudiesService) {}

  @Get()
  @ApiOperation({ summary: 'Studies the caller belongs to (all studies for lab admins)' })
  list(@CurrentUser() user: AuthenticatedUser): Promise<Study[]> {
    return this.studies.list(user);
  }

  @Get(':id')
  @ApiOperation({ summary: 'A study with its members' })
  get(@CurrentUser() user: AuthenticatedUser, @Param('id', new ZodValidationPipe(idParamSchema)) id: string): Promise<Study> {
    return this.studies.get(user, id);
  }

  @Post()
  @Roles(Role.Admin, Role.Researcher)
  @ApiOperation({ summary: 'Create a study; the caller becomes its owner' })
  @ApiBody({ schema: openApiSchema(createStudyRequestSchema) })
  create(@CurrentUser() user: AuthenticatedUser, @Body(new ZodValidationPipe(createStudyRequestSchema)) body: CreateStudyRequest): Promise<Study> {
    return this.studies.create(user, body);
  }
}
