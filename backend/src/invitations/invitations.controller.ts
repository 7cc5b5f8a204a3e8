import { Body, Controller, Delete, Get, HttpCode, Param, Post, Query, UseGuards } from '@nestjs/common';
import { ApiBearerAuth, ApiBody, ApiOperation, ApiTags } from '@nestjs/swagger';
import {
  acceptInvitationSchema,
  createInvitationSchema,
  idParamSchema,
  invitationTokenSchema,
  type AcceptInvitationRequest,
  type CreateInvitationRequest,
  type Invitation,
  type InvitationPreview,
  type LoginResponse,
} from '@kiln/shared';
import { CurrentUser, Public } from '../auth/auth.decorators';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { LoginThrottlerGuard } from '../auth/login-throttler.guard';
import { openApiSchema } from '../common/openapi';
import { ZodValidationPipe } from '../common/zod-validation.pipe';
import { InvitationsService } from './invitations.service';

const id = new ZodValidationPipe(idParamSchema);

@ApiTags('studies')
@Controller()
export class InvitationsController {
  constructor(private readonly invitations: InvitationsService) {}

  @Post('studies/:id/invitations')
  @ApiBearerAuth()
  @ApiOperation({ summary: 'Invite someone into the study by e-mail (study owner or lab admin)' })
  @ApiBody({ schema: openApiSchema(createInvitationSchema) })
  create(
    @CurrentUser() user: AuthenticatedUser,
    @Param('id', id) studyId: string,
    @Body(new ZodValidationPipe(createInvitationSchema)) body: CreateInvitationRequest,
  ): Promise<Invitation> {
    return this.invitations.create(user, studyId, body);
  }

  @Get('studies/:id/invitations')
  @ApiBearerAuth()
  @ApiOperation({ summary: "The study's invitations and their status" })
  list(@CurrentUser() user: AuthenticatedUser, @Param('id', id) studyId: string): Promise<Invitation[]> {
    return this.invitations.list(user, studyId);
  }

  @Post('invitations/:id/resend')
  @ApiBearerAuth()
  @ApiOperation({ summary: 'Mail a fresh link; the old one stops working' })
  resend(@CurrentUser() user: AuthenticatedUser, @Param('id', id) invitationId: string): Promise<Invitation> {
    return this.invitations.resend(user, invitationId);
  }

  @Delete('invitations/:id')
  @ApiBearerAuth()
  @ApiOperation({ summary: 'Withdraw an invitation' })
  revoke(@CurrentUser() user: AuthenticatedUser, @Param('id', id) invitationId: string): Promise<Invitation> {
    return this.invitations.revoke(user, invitationId);
  }

  @Public()
  @Get('invitations/preview')
  @ApiOperation({ summary: 'What an invitation link opens (no sign-in)' })
  preview(@Query(new ZodValidationPipe(invitationTokenSchema)) query: { token: string }): Promise<InvitationPreview> {
    return this.invitations.preview(query.token);
  }

  @Public()
  @Post('invitations/accept')
  @HttpCode(200)
  @UseGuards(LoginThrottlerGuard)
  @ApiOperation({ summary: 'Accept with a new collaborator account (name and password); signs in' })
  @ApiBody({ schema: openApiSchema(acceptInvitationSchema) })
  accept(@Body(new ZodValidationPipe(acceptInvitationSchema)) body: AcceptInvitationRequest): Promise<LoginResponse> {
    return this.invitations.acceptNewAccount(body);
  }

  @Post('invitations/accept-signed-in')
  @HttpCode(200)
  @ApiBearerAuth()
  @ApiOperation({ summary: 'Accept as the signed-in person the invitation names' })
  acceptSignedIn(@CurrentUser() user: AuthenticatedUser, @Body(new ZodValidationPipe(invitationTokenSchema)) body: { token: string }): Promise<{ studyId: string }> {
    return this.invitations.acceptSignedIn(user, body.token);
  }
}
