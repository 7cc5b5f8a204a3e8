import path from 'node:path';
import { z } from 'zod';
import { describeZodError } from '@kiln/shared';

const url = (name: string, schemes: string[]) =>
  z
    .string({ error: `${name} is required` })
    .refine((value) => schemes.some((scheme) => value.startsWith(`${scheme}://`)), {
      message: `${name} must be a URL starting with ${schemes.map((s) => `${s}://`).join(' or ')}`,
    });

/** Environment variables the API reads; defaults suit local mode (scripts/start.sh). */
export const configSchema = z.object({
  DATABASE_URL: url('DATABASE_URL', ['postgres', 'postgresql']),
  REDIS_URL: url('REDIS_URL', ['redis', 'rediss']),
  /** Outgoing mail; locally the SMTP sink. */
  SMTP_URL: url('SMTP_URL', ['smtp', 'smtps']).default('smtp://127.0.0.1:2525'),
  PORT: z.coerce.number().int().min(1).max(65535).default(8080),
  /** Address the API listens on; 0.0.0.0 to serve other machines (default loopback). */
  HOST: z.string().min(1).default('127.0.0.1'),
  /** Signs access tokens; scripts/start.sh generates one into the data folder when unset. */
  JWT_SECRET: z.string({ error: 'JWT_SECRET is required' }).min(32, 'JWT_SECRET must be at least 32 characters'),
  /** Lifetime of an access token in seconds (default 8 hours). */
  KILN_TOKEN_TTL_SECONDS: z.coerce.number().int().min(60).max(30 * 24 * 3600).default(8 * 3600),
  /** Sign-in attempts allowed per minute for one e-mail address from one client (default 10). */
  KILN_LOGIN_LIMIT_PER_MINUTE: z.coerce.number().int().min(1).max(1000).default(10),
  /** The built web app; served at / beside the API. */
  KILN_WEB_DIR: z.string().default(path.resolve(__dirname, '../../../frontend/dist')),
  /** A worker counts as alive while its last heartbeat is younger than this (default 30 s). */
  /** How often the scheduler admits runs, in milliseconds (default 1000). */
  KILN_SCHEDULER_TICK_MS: z.coerce.number().int().min(50).max(60_000).default(1000),
  /** `0` runs the API without a scheduler (e.g. extra API replicas that should never admit). */
  KILN_SCHEDULER: z.enum(['0', '1']).default('1'),
  /** Where links in e-mails point (default http://127.0.0.1:PORT). */
  KILN_PUBLIC_URL: z.string().regex(/^https?:\/\//, 'KILN_PUBLIC_URL must start with http:// or https://').optional(),
  /** Sender of Kiln's e-mails. */
  KILN_MAIL_FROM: z.string().min(3).default('Kiln <kiln@localhost>'),
  /** `1` in local mode: the SMTP sink stores mail in PostgreSQL and admins may read it (the outbox page). */
  KILN_MAIL_SINK: z.enum(['0', '1']).default('0'),
  /** Days an invitation link stays valid (default 7). */
  KILN_INVITATION_DAYS: z.coerce.number().min(0.0001).max(90).default(7),
  KILN_WORKER_STALE_SECONDS: z.coerce.number().int().min(5).max(3600).default(30),
});

export type KilnConfig = z.infer<typeof configSchema> & { KILN_PUBLIC_URL: string };

/** Reads and checks the configuration; throws one readable message naming every bad variable. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): KilnConfig {
  const parsed = configSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  - ${issue.path.join('.')}: ${issue.message}`);
    throw new Error(`Kiln cannot start: the configuration is not valid (${describeZodError(parsed.error)}).\n${lines.join('\n')}`);
  }
  return { ...parsed.data, KILN_PUBLIC_URL: parsed.data.KILN_PUBLIC_URL ?? `http://127.0.0.1:${parsed.data.PORT}` };
}
