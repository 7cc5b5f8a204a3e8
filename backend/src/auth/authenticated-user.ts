import type { User } from '@kiln/shared';

/** What `request.user` holds after the bearer token was checked. */
export type AuthenticatedUser = User;
