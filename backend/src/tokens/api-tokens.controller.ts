import { Body, Controller, Delete, Get, HttpCode, Param, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiBody, ApiOperation, ApiTags } from '@nestjs/swagger';
import { createApiTokenSchema, idParamSchema, type ApiTokenInfo } from '@kiln/shared';
import { CurrentUser } from '../auth/auth.decorators';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { openApiSchema } from '../common/openapi';
import { ZodValidationPipe } from '../common/zod-validation.pipe';
import { ApiTokensService } from './api-tokens.service';

@ApiTags('api tokens')
@ApiBearerAuth()
@Controller('tokens')
export class ApiTokensController {
  constructor(private readonly tokens: ApiTokensService) {}

  @Post()
  @ApiOperation({ summary: 'Create a personal API token; the secret is in this response only' })
  @ApiBody({ schema: openApiSchema(createApiTokenSchema) })
  create(@CurrentUser() user: AuthenticatedUser, @Body(new ZodValidationPipe(createApiTokenSchema)) body: { name: string }) {
    return this.tokens.create(user, body.name);
  }

  @Get()
  @ApiOperation({ summary: "The caller's tokens (never their secrets)" })
  list(@CurrentUser() user: AuthenticatedUser): Promise<ApiTokenInfo[]> {
    return this.tokens.list(user);
  }

  @Delete(':id')
  @HttpCode(204)
  @ApiOperation({ summary: 'Revoke a token; it stops working at once' })
  revoke(@CurrentUser() user: AuthenticatedUser, @Param('id', new ZodValidationPipe(idParamSchema)) id: string): Promise<void> {
    return this.tokens.revoke(user, id);
  }
}
