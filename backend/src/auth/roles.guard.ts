import { Injectable, type CanActivate, type ExecutionContext } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import type { Role } from '@kiln/shared';
import { forbidden } from '../common/api-error';
import { REQUIRED_ROLES } from './auth.decorators';
import type { AuthenticatedUser } from './authenticated-user';

/** Global guard after JwtAuthGuard: enforces @Roles(...). */
@Injectable()
export class RolesGuard implements CanActivate {
  constructor(private readonly reflector: Reflector) {}

  canActivate(context: ExecutionContext): boolean {
    const roles = this.reflector.getAllAndOverride<Role[] | undefined>(REQUIRED_ROLES, [context.getHandler(), context.getClass()]);
    if (!roles || roles.length === 0) return true;
    const user: AuthenticatedUser | undefined = context.switchToHttp().getRequest().user;
    if (user && roles.includes(user.role)) return true;
    throw forbidden(`This needs the role ${roles.join(' or ')}.`);
  }
}
