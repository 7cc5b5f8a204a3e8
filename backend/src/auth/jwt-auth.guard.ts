import { Injectable, type ExecutionContext } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { AuthGuard } from '@nestjs/passport';
import { unauthenticated } from '../common/api-error';
import { IS_PUBLIC } from './auth.decorators';

/** Global guard: every route needs a valid bearer token unless marked @Public(). */
@Injectable()
export class JwtAuthGuard extends AuthGuard('jwt') {
  constructor(private readonly reflector: Reflector) {
    super();
  }

  override canActivate(context: ExecutionContext) {
    const isPublic = this.reflector.getAllAndOverride<boolean>(IS_PUBLIC, [context.getHandler(), context.getClass()]);
    return isPublic ? true : super.canActivate(context);
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
