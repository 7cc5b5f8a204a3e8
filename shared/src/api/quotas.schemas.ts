import { z } from 'zod';
import { Role } from './roles';

/** A person's share of the lab's machines (architecture.md, "The API surface"). */
export interface Quota {
  /** Runs the person may have in flight at once. */
  slots: number;
  /** CPU-hours per calendar month (UTC). */
  cpuHoursPerMonth: number;
  /** Largest grid a run may start with or refine to. */
  maxGridPoints: number;
  /** Longest a single run may compute, in CPU seconds. */
  maxRunCpuSeconds: number;
}

/** Quotas of people nobody has set one for, by role. */
export const DEFAULT_QUOTAS: Record<Role, Quota> = {
  [Role.Admin]: { slots: 8, cpuHoursPerMonth: 1000, maxGridPoints: 50_000, maxRunCpuSeconds: 7 * 24 * 3600 },
  [Role.Researcher]: { slots: 4, cpuHoursPerMonth: 300, maxGridPoints: 20_000, maxRunCpuSeconds: 2 * 24 * 3600 },
  [Role.Collaborator]: { slots: 2, cpuHoursPerMonth: 50, maxGridPoints: 10_000, maxRunCpuSeconds: 12 * 3600 },
};

const bounded = (field: string, min: number, max: number, integer = false) => {
  const message = `${field} must be ${integer ? 'an integer' : 'a number'} from ${min} to ${max}`;
  let schema = z.number({ error: message });
  if (integer) schema = schema.int({ error: message });
  return schema.min(min, { error: message }).max(max, { error: message });
};

/** Body of `PUT /api/admin/quotas/:userId`. */
export const quotaSchema = z.strictObject({
  slots: bounded('slots', 0, 1024, true),
  cpuHoursPerMonth: bounded('cpuHoursPerMonth', 0, 1_000_000),
  maxGridPoints: bounded('maxGridPoints', 20, 50_000, true),
  maxRunCpuSeconds: bounded('maxRunCpuSeconds', 1, 32_000_000),
});

export interface QuotaView extends Quota {
  userId: string;
  /** False while the role's default applies. */
  custom: boolean;
  /** CPU-hours used this month. */
  cpuHoursUsed: number;
  /** Runs in flight now. */
  slotsInUse: number;
}

export interface UsageRow {
  userId: string;
  name: string;
  email: string;
  /** First day of the month, YYYY-MM-DD. */
  month: string;
  cpuHours: number;
}

export interface AuditEntry {
  id: string;
  at: string;
  actorId: string | null;
  actorName: string | null;
  action: string;
  subjectType: string;
  subjectId: string | null;
  before: unknown;
  after: unknown;
}

/** Query of `GET /api/admin/audit`. */
export const auditQuerySchema = z.strictObject({
  action: z.string().max(100).optional(),
  subjectType: z.string().max(100).optional(),
  subjectId: z.string().max(100).optional(),
  actorId: z.string().uuid({ error: 'actorId must be an id' }).optional(),
  from: z.iso.datetime({ error: 'from must be an ISO date-time' }).optional(),
  to: z.iso.datetime({ error: 'to must be an ISO date-time' }).optional(),
  page: z.coerce.number().int().min(1, { error: 'page must be a whole number from 1' }).default(1),
  pageSize: z.coerce.number().int().min(1).max(500, { error: 'pageSize must be from 1 to 500' }).default(50),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

/** Body of `PATCH /api/admin/users/:id`. */
export const updatePersonSchema = z
  .strictObject({
    role: z.enum(Role, { error: 'role must be admin, researcher or collaborator' }).optional(),
    disabled: z.boolean({ error: 'disabled must be true or false' }).optional(),
    name: z.string().trim().min(1).max(200).optional(),
  })
  .refine((body) => Object.keys(body).length > 0, { message: 'nothing to change' });
export type UpdatePersonRequest = z.infer<typeof updatePersonSchema>;

/** Query of `GET /api/admin/usage`. */
export const usageQuerySchema = z.strictObject({
  months: z.coerce.number().int().min(1, { error: 'months must be from 1 to 36' }).max(36, { error: 'months must be from 1 to 36' }).default(6),
});
