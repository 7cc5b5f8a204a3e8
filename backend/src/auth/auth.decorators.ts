import { createParamDecorator, SetMetadata, type ExecutionContext } from '@nestjs/common';
import type { Role } from '@kiln/shared';
import type { AuthenticatedUser } from './authenticated-user';

export const IS_PUBLIC = 'kiln:public';
export const REQUIRED_ROLES = 'kiln:roles';

/** The route needs no sign-in (health, login, the web app). */
export const Public = () => SetMetadata(IS_PUBLIC, true);

/** Only these roles may call the route; everyone signed in when absent. */
export const Roles = (...roles: Role[]) => SetMetadata(REQUIRED_ROLES, roles);

/** The signed-in user of this request. */
export const CurrentUser = createParamDecorator(
  (_data: unknown, context: ExecutionContext): AuthenticatedUser => context.switchToHttp().getRequest().user,
);
