import { Injectable } from '@nestjs/common';
import { ThrottlerGuard } from '@nestjs/throttler';

/** Counts sign-in attempts per client address and e-mail, so one person's typos do not lock out the lab. */
@Injectable()
export class LoginThrottlerGuard extends ThrottlerGuard {
  protected override async getTracker(request: Record<string, any>): Promise<string> {
    const email = typeof request.body?.email === 'string' ? request.body.email.trim().toLowerCase() : '';
    return `${request.ip ?? 'unknown'}|${email}`;
  }
}
