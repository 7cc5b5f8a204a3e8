import { Inject, Injectable } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import type { LoginRequest, LoginResponse } from '@kiln/shared';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';
import { unauthenticated } from '../common/api-error';
import { toUser } from '../users/users.mapper';
import { UsersRepository } from '../users/users.repository';
import type { AccessTokenPayload } from './jwt.strategy';
import { PasswordService } from './password.service';

@Injectable()
export class AuthService {
  constructor(
    @Inject(KILN_CONFIG) private readonly config: KilnConfig,
    private readonly users: UsersRepository,
    private readonly passwords: PasswordService,
    private readonly jwt: JwtService,
  ) {}

  async login({ email, password }: LoginRequest): Promise<LoginResponse> {
    const row = await this.users.findByEmail(email);
    const valid = await this.passwords.verify(row?.password_hash ?? null, password);
    // One message for an unknown e-mail and a wrong password: no account probing.
    if (!row || !valid) throw unauthenticated('E-mail or password is wrong.');
    if (row.disabled) throw unauthenticated('This account is disabled; ask your lab admin.');
    const payload: AccessTokenPayload = { sub: row.id, role: row.role };
    const accessToken = await this.jwt.signAsync(payload, { expiresIn: this.config.KILN_TOKEN_TTL_SECONDS });
    return { accessToken, expiresIn: this.config.KILN_TOKEN_TTL_SECONDS, user: toUser(row) };
  }
}
