import { Injectable, type ExecutionContext } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { AuthGuard } from '@nestjs/passport';
import { unauthenticated } from '../common/api-error';
import { API_TOKEN_PREFIX, ApiTokensService } from '../tokens/api-tokens.service';
import { IS_PUBLIC } from './auth.decorators';

/** Global guard: every route needs a valid bearer token unless marked @Public(). */
@Injectable()
export class JwtAuthGuard extends AuthGuard('jwt') {
  constructor(
    private readonly reflector: Reflector,
    private readonly apiTokens: ApiTokensService,
  ) {
    super();
  }

  override async canActivate(context: ExecutionContext): Promise<boolean> {
    const isPublic = this.reflector.getAllAndOverride<boolean>(IS_PUBLIC, [context.getHandler(), context.getClass()]);
    if (isPublic) return true;
    const request = context.switchToHttp().getRequest();
    const header: unknown = request.headers?.authorization;
    // Personal API tokens (scripts, notebooks) carry their own prefix; everything else is a sign-in JWT.
    if (typeof header === 'string' && header.startsWith(`Bearer ${API_TOKEN_PREFIX}`)) {
      const user = await this.apiTokens.authenticate(header.slice('Bearer '.length));
      if (!user) throw unauthenticated('This API token is not valid: it was revoked, or its owner is disabled.');
      request.user = user;
      return true;
    }
    return (await super.canActivate(context)) as boolean;
  }

  override handleRequest<T>(error: unknown, user: T, info: unknown): T {
    if (error) throw error;
    if (!user) {
      const expired = info instanceof Error && info.name === 'TokenExpiredError';
      throw unauthenticated(expired ? 'Your session has expired; sign in again.' : 'Sign in first: this needs a valid bearer token.');
    }
    return user;
  }
}
