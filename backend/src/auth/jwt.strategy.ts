import { Inject, Injectable } from '@nestjs/common';
import { PassportStrategy } from '@nestjs/passport';
import { ExtractJwt, Strategy } from 'passport-jwt';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';
import { unauthenticated } from '../common/api-error';
import { toUser } from '../users/users.mapper';
import { UsersRepository } from '../users/users.repository';
import type { AuthenticatedUser } from './authenticated-user';

export interface AccessTokenPayload {
  sub: string;
  role: string;
}

/**
 * Checks the bearer token's signature and expiry, then reloads the user, so a
 * disabled account or a changed role takes effect on the next request.
 */
@Injectable()
export class JwtStrategy extends PassportStrategy(Strategy, 'jwt') {
  constructor(
    @Inject(KILN_CONFIG) config: KilnConfig,
    private readonly users: UsersRepository,
  ) {
    super({
      jwtFromRequest: ExtractJwt.fromAuthHeaderAsBearerToken(),
      ignoreExpiration: false,
      secretOrKey: config.JWT_SECRET,
      algorithms: ['HS256'],
    });
  }

  async validate(payload: AccessTokenPayload): Promise<AuthenticatedUser> {
    const row = typeof payload.sub === 'string' ? await this.users.findById(payload.sub).catch(() => undefined) : undefined;
    if (!row) throw unauthenticated('Your session has ended; sign in again.');
    if (row.disabled) throw unauthenticated('This account is disabled; ask your lab admin.');
    return toUser(row);
  }
}
