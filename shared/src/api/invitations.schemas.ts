import { z } from 'zod';

export const createInvitationSchema = z.strictObject({
  email: z.string({ error: 'email is required' }).trim().toLowerCase().email({ error: 'email must be an e-mail address' }).max(254),
  role: z.enum(['member', 'viewer'], { error: 'role must be member or viewer' }).default('member'),
});
export type CreateInvitationRequest = z.infer<typeof createInvitationSchema>;

/** A password a person chooses: long enough to resist guessing, short enough to hash. */
export const newPasswordSchema = z
  .string({ error: 'password is required' })
  .min(10, { error: 'password must have at least 10 characters' })
  .max(1024, { error: 'password may have at most 1024 characters' });

export const acceptInvitationSchema = z.strictObject({
  token: z.string({ error: 'token is required' }).min(10, { error: 'token is not valid' }).max(200, { error: 'token is not valid' }),
  name: z.string({ error: 'name is required' }).trim().min(1, { error: 'name is required' }).max(200),
  password: newPasswordSchema,
});
export type AcceptInvitationRequest = z.infer<typeof acceptInvitationSchema>;

export const invitationTokenSchema = z.strictObject({
  token: z.string({ error: 'token is required' }).min(10, { error: 'token is not valid' }).max(200, { error: 'token is not valid' }),
});

export const passwordResetRequestSchema = z.strictObject({
  email: z.string({ error: 'email is required' }).trim().toLowerCase().email({ error: 'email must be an e-mail address' }).max(254),
});

export const passwordResetConfirmSchema = z.strictObject({
  token: z.string({ error: 'token is required' }).min(10, { error: 'token is not valid' }).max(200, { error: 'token is not valid' }),
  password: newPasswordSchema,
});

export interface Invitation {
  id: string;
  studyId: string;
  email: string;
  role: 'member' | 'viewer';
  invitedBy: string;
  expiresAt: string;
  status: 'pending' | 'accepted' | 'revoked' | 'expired';
  createdAt: string;
}

/** What the invitation link shows before accepting (no sign-in needed). */
export interface InvitationPreview {
  studyName: string;
  invitedByName: string;
  email: string;
  role: 'member' | 'viewer';
  expiresAt: string;
  /** An account with this e-mail exists: sign in instead of choosing a password. */
  accountExists: boolean;
}

export const notificationSettingsSchema = z.strictObject({
  sweepFinished: z.boolean().optional(),
  runFailed: z.boolean().optional(),
  candidate: z.boolean().optional(),
  quotaNearlyUsed: z.boolean().optional(),
});
export type NotificationSettings = Required<z.infer<typeof notificationSettingsSchema>>;

export const createApiTokenSchema = z.strictObject({
  name: z.string({ error: 'name is required' }).trim().min(1, { error: 'name is required' }).max(100, { error: 'name may have at most 100 characters' }),
});

export interface ApiTokenInfo {
  id: string;
  name: string;
  createdAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
}
