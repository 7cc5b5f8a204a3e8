import os from 'node:os';
import { z } from 'zod';
import { describeZodError } from '@kiln/shared';

/** Environment variables a worker host reads. */
export const workerConfigSchema = z.object({
  DATABASE_URL: z.string({ error: 'DATABASE_URL is required' }).regex(/^postgres(ql)?:\/\//, 'DATABASE_URL must start with postgres://'),
  REDIS_URL: z.string({ error: 'REDIS_URL is required' }).regex(/^rediss?:\/\//, 'REDIS_URL must start with redis://'),
  /** Runs this process executes at once; default: the number of cores. */
  KILN_WORKER_SLOTS: z.coerce.number().int().min(1).max(256).default(os.availableParallelism()),
  /** Seconds between checkpoints of a running run (default 60). */
  KILN_CHECKPOINT_SECONDS: z.coerce.number().min(1).max(86_400).default(60),
  /** Seconds between heartbeats into the workers table (default 5). */
  KILN_HEARTBEAT_SECONDS: z.coerce.number().min(0.5).max(300).default(5),
  /**
   * Seconds a job's lock lasts without renewal (default 30). A killed worker's run is
   * handed to another worker about this long after the kill; the same value is the
   * stalled-job check interval.
   */
  KILN_JOB_LOCK_SECONDS: z.coerce.number().min(1).max(3_600).default(30),
  /** How this host names itself in the admin pages (default: the host name). */
  KILN_WORKER_HOST: z.string().min(1).default(os.hostname()),
});

export type WorkerConfig = z.infer<typeof workerConfigSchema>;

export function loadWorkerConfig(env: NodeJS.ProcessEnv = process.env): WorkerConfig {
  const parsed = workerConfigSchema.safeParse(env);
  if (!parsed.success) throw new Error(`Kiln worker cannot start: ${describeZodError(parsed.error)}`);
  return parsed.data;
}
