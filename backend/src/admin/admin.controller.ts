import { Body, Controller, Get, Param, Patch, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiBody, ApiOperation, ApiTags } from '@nestjs/swagger';
import { auditQuerySchema, idParamSchema, Role, updatePersonSchema, type AuditEntry, type AuditQuery, type Page, type UpdatePersonRequest, type User } from '@kiln/shared';
import { AuditService } from '../audit/audit.service';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { openApiSchema } from '../common/openapi';
import { ZodValidationPipe } from '../common/zod-validation.pipe';
import { AdminService } from './admin.service';

@ApiTags('lab administration')
@ApiBearerAuth()
@Roles(Role.Admin)
@Controller('admin')
export class AdminController {
  constructor(
    private readonly admin: AdminService,
    private readonly audit: AuditService,
  ) {}

  @Patch('users/:id')
  @ApiOperation({ summary: "Change a person's role, name, or disable them; audited" })
  @ApiBody({ schema: openApiSchema(updatePersonSchema) })
  updatePerson(
    @CurrentUser() actor: AuthenticatedUser,
    @Param('id', new ZodValidationPipe(idParamSchema)) id: string,
    @Body(new ZodValidationPipe(updatePersonSchema)) body: UpdatePersonRequest,
  ): Promise<User> {
    return this.admin.updatePerson(actor, id, body);
  }

  @Get('audit')
  @ApiOperation({ summary: 'The audit log, newest first, filterable' })
  auditLog(@Query(new ZodValidationPipe(auditQuerySchema)) query: AuditQuery): Promise<Page<AuditEntry>> {
    return this.audit.list(query);
  }
}
