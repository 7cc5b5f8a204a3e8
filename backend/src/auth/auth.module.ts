import { Module } from '@nestjs/common';
import { APP_GUARD } from '@nestjs/core';
import { JwtModule } from '@nestjs/jwt';
import { PassportModule } from '@nestjs/passport';
import { ThrottlerModule } from '@nestjs/throttler';
import { KILN_CONFIG } from '../config/config.module';
import type { KilnConfig } from '../config/config.schema';
import { UsersModule } from '../users/users.module';
import { AuthController } from './auth.controller';
import { AuthService } from './auth.service';
import { JwtAuthGuard } from './jwt-auth.guard';
import { JwtStrategy } from './jwt.strategy';
import { PasswordService } from './password.service';
import { RolesGuard } from './roles.guard';

@Module({
  imports: [
    UsersModule,
    PassportModule,
    JwtModule.registerAsync({
      inject: [KILN_CONFIG],
      useFactory: (config: KilnConfig) => ({ secret: config.JWT_SECRET, signOptions: { algorithm: 'HS256' } }),
    }),
    ThrottlerModule.forRootAsync({
      inject: [KILN_CONFIG],
      useFactory: (config: KilnConfig) => [{ name: 'login', ttl: 60_000, limit: config.KILN_LOGIN_LIMIT_PER_MINUTE }],
    }),
  ],
  controllers: [AuthController],
  providers: [
    AuthService,
    PasswordService,
    JwtStrategy,
    // Order matters: who you are, then what your role allows.
    { provide: APP_GUARD, useClass: JwtAuthGuard },
    { provide: APP_GUARD, useClass: RolesGuard },
  ],
  exports: [PasswordService, JwtModule, AuthService],
})
export class AuthModule {}
