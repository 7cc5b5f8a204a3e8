import { Injectable } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';

const AUDIENCE = 'kiln-run-events';
/** A browser's EventSource cannot send headers; it gets a ticket valid this long for one run. */
export const EVENT_TICKET_SECONDS = 60;

@Injectable()
export class EventTicketService {
  constructor(private readonly jwt: JwtService) {}

  issue(userId: string, runId: string): Promise<string> {
    return this.jwt.signAsync({ sub: userId, runId }, { audience: AUDIENCE, expiresIn: EVENT_TICKET_SECONDS });
  }

  /** The user id the ticket was issued to, when it is valid for this run; otherwise undefined. */
  async verify(ticket: string, runId: string): Promise<string | undefined> {
    try {
      const payload = await this.jwt.verifyAsync<{ sub: string; runId: string }>(ticket, { audience: AUDIENCE, algorithms: ['HS256'] });
      return payload.runId === runId ? payload.sub : undefined;
    } catch {
      return undefined;
    }
  }

  /** The user id of a valid sign-in token (for scripts that stream with a bearer header). */
  async verifyAccessToken(token: string): Promise<string | undefined> {
    try {
      const payload = await this.jwt.verifyAsync<{ sub: string; aud?: unknown }>(token, { algorithms: ['HS256'] });
      return payload.aud === undefined ? payload.sub : undefined;
    } catch {
      return undefined;
    }
  }
}
