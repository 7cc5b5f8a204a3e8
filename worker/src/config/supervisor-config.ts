import { z } from 'zod';
import { describeZodError } from '@kiln/shared';

/** Environment variables the worker supervisor reads (the workers read their own). */
export const supervisorConfigSchema = z.object({
  /** Worker processes to keep running on this machine (default 2). */
  KILN_WORKER_PROCESSES: z.coerce.number().int().min(1).max(64).default(2),
});

export type SupervisorConfig = z.infer<typeof supervisorConfigSchema>;

export function loadSupervisorConfig(env: NodeJS.ProcessEnv = process.env): SupervisorConfig {
  const parsed = supervisorConfigSchema.safeParse(env);
  if (!parsed.success) throw new Error(`Kiln worker supervisor cannot start: ${describeZodError(parsed.error)}`);
  return parsed.data;
}
