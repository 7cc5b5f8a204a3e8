import { z } from 'zod';

export const STUDY_ROLES = ['owner', 'member', 'viewer'] as const;
export type StudyRole = (typeof STUDY_ROLES)[number];

export const createStudyRequestSchema = z.strictObject({
  name: z.string({ error: 'name is required' }).trim().min(1, { error: 'name is required' }).max(200, { error: 'name may have at most 200 characters' }),
  description: z.string().max(5_000, { error: 'description may have at most 5000 characters' }).default(''),
});
export type CreateStudyRequest = z.infer<typeof createStudyRequestSchema>;

export interface StudyMember {
  userId: string;
  name: string;
  email: string;
  role: StudyRole;
}

export interface Study {
  id: string;
  name: string;
  description: string;
  ownerId: string;
  createdAt: string;
  /** The caller's role in the study; null for a lab admin who is not a member. */
  myRole: StudyRole | null;
  members: StudyMember[];
}
