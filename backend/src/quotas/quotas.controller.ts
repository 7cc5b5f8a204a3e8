import { Body, Controller, Get, Param, Put, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiBody, ApiOperation, ApiTags } from '@nestjs/swagger';
import { idParamSchema, quotaSchema, Role, usageQuerySchema, type Quota, type QuotaView, type UsageRow } from '@kiln/shared';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { openApiSchema } from '../common/openapi';
import { ZodValidationPipe } from '../common/zod-validation.pipe';
import { QuotasService } from './quotas.service';

const id = new ZodValidationPipe(idParamSchema);

@ApiTags('quotas')
@ApiBearerAuth()
@Controller()
export class QuotasController {
  constructor(private readonly quotas: QuotasService) {}

  @Get('quota')
  @ApiOperation({ summary: "The caller's own quota and this month's use" })
  mine(@CurrentUser() user: AuthenticatedUser): Promise<QuotaView> {
    return this.quotas.view(user.id);
  }

  @Get('usage')
  @ApiOperation({ summary: "The caller's own CPU-hours per month" })
  myUsage(@CurrentUser() user: AuthenticatedUser, @Query(new ZodValidationPipe(usageQuerySchema)) query: { months: number }): Promise<UsageRow[]> {
    return this.quotas.usage(query.months, user.id);
  }

  @Get('admin/quotas')
  @Roles(Role.Admin)
  @ApiOperation({ summary: "Everyone's quota with current use (lab admins)" })
  list() {
    return this.quotas.list();
  }

  @Get('admin/quotas/:userId')
  @Roles(Role.Admin)
  @ApiOperation({ summary: "One person's quota and use (lab admins)" })
  get(@Param('userId', id) userId: string): Promise<QuotaView> {
    return this.quotas.view(userId);
  }

  @Put('admin/quotas/:userId')
  @Roles(Role.Admin)
  @ApiOperation({ summary: "Set one person's quota (lab admins); audited" })
  @ApiBody({ schema: openApiSchema(quotaSchema) })
  set(@CurrentUser() user: AuthenticatedUser, @Param('userId', id) userId: string, @Body(new ZodValidationPipe(quotaSchema)) body: Quota): Promise<QuotaView> {
    return this.quotas.set(user, userId, body);
  }

  @Get('admin/usage')
  @Roles(Role.Admin)
  @ApiOperation({ summary: 'CPU-hours per person per month (lab admins)' })
  usage(@Query(new ZodValidationPipe(usageQuerySchema)) query: { months: number }): Promise<UsageRow[]> {
    return this.quotas.usage(query.months);
  }
}
