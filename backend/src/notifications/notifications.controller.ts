import { Body, Controller, Get, Put } from '@nestjs/common';
import { ApiBearerAuth, ApiBody, ApiOperation, ApiTags } from '@nestjs/swagger';
import { notificationSettingsSchema, type NotificationSettings } from '@kiln/shared';
import { CurrentUser } from '../auth/auth.decorators';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { openApiSchema } from '../common/openapi';
import { ZodValidationPipe } from '../common/zod-validation.pipe';
import { NotificationsService } from './notifications.service';

@ApiTags('account')
@ApiBearerAuth()
@Controller('me/notifications')
export class NotificationsController {
  constructor(private readonly notifications: NotificationsService) {}

  @Get()
  @ApiOperation({ summary: 'Which e-mails the caller wants' })
  get(@CurrentUser() user: AuthenticatedUser): Promise<NotificationSettings> {
    return this.notifications.settings(user);
  }

  @Put()
  @ApiOperation({ summary: 'Switch e-mails on or off (sweep finished, run failed, candidate, quota nearly used)' })
  @ApiBody({ schema: openApiSchema(notificationSettingsSchema) })
  update(@CurrentUser() user: AuthenticatedUser, @Body(new ZodValidationPipe(notificationSettingsSchema)) body: Partial<NotificationSettings>): Promise<NotificationSettings> {
    return this.notifications.update(user, body);
  }
}
