import { Body, Controller, Get, HttpCode, Post, UseGuards } from '@nestjs/common';
import { ApiBearerAuth, ApiBody, ApiOperation, ApiTags } from '@nestjs/swagger';
import { loginRequestSchema, passwordResetConfirmSchema, passwordResetRequestSchema, type LoginRequest, type LoginResponse, type User } from '@kiln/shared';
import { openApiSchema } from '../common/openapi';
import { ZodValidationPipe } from '../common/zod-validation.pipe';
import { CurrentUser, Public } from './auth.decorators';
import { AuthService } from './auth.service';
import { LoginThrottlerGuard } from './login-throttler.guard';

@ApiTags('auth')
@Controller('auth')
export class AuthController {
  constructor(private readonly auth: AuthService) {}

  @Public()
  @Post('login')
  @HttpCode(200)
  @UseGuards(LoginThrottlerGuard)
  @ApiOperation({ summary: 'Sign in with e-mail and password; returns a bearer token' })
  @ApiBody({ schema: openApiSchema(loginRequestSchema) })
  login(@Body(new ZodValidationPipe(loginRequestSchema)) body: LoginRequest): Promise<LoginResponse> {
    return this.auth.login(body);
  }

  @Public()
  @Post('password-reset')
  @HttpCode(202)
  @UseGuards(LoginThrottlerGuard)
  @ApiOperation({ summary: 'Mail a password-reset link (answers the same whether or not the address has an account)' })
  @ApiBody({ schema: openApiSchema(passwordResetRequestSchema) })
  async requestReset(@Body(new ZodValidationPipe(passwordResetRequestSchema)) body: { email: string }): Promise<{ message: string }> {
    await this.auth.requestPasswordReset(body.email);
    return { message: 'If this address has a Kiln account, a reset link is on its way.' };
  }

  @Public()
  @Post('password-reset/confirm')
  @HttpCode(200)
  @UseGuards(LoginThrottlerGuard)
  @ApiOperation({ summary: 'Choose a new password with the link from the e-mail' })
  @ApiBody({ schema: openApiSchema(passwordResetConfirmSchema) })
  async confirmReset(@Body(new ZodValidationPipe(passwordResetConfirmSchema)) body: { token: string; password: string }): Promise<{ message: string }> {
    await this.auth.confirmPasswordReset(body.token, body.password);
    return { message: 'Your password was changed; sign in with the new one.' };
  }

  @Get('me')
  @ApiBearerAuth()
  @ApiOperation({ summary: 'The signed-in user with their role' })
  me(@CurrentUser() user: User): User {
    return user;
  }
}
