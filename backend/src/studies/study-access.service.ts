import { Injectable } from '@nestjs/common';
import { Role, type StudyRole } from '@kiln/shared';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { forbidden, notFound } from '../common/api-error';
import { StudiesRepository } from './studies.repository';

/**
 * Who may see and change what inside a study (architecture.md, "People and access").
 * Lab admins see everything; everyone else sees a study only as a member. A study
 * the caller may not see is reported as not found, so ids reveal nothing.
 */
@Injectable()
export class StudyAccessService {
  constructor(private readonly studies: StudiesRepository) {}

  /** The caller's role in the study (null for an admin who is not a member); 404 when not visible. */
  async assertCanView(user: AuthenticatedUser, studyId: string): Promise<StudyRole | null> {
    const role = (await this.studies.memberRole(studyId, user.id)) ?? null;
    if (role) return role;
    if (user.role === Role.Admin && (await this.studies.findById(studyId))) return null;
    throw notFound('study');
  }

  /** Launching, resuming, forking and controlling runs: study owners and members (not viewers), and admins. */
  async assertCanWork(user: AuthenticatedUser, studyId: string): Promise<void> {
    const role = await this.assertCanView(user, studyId);
    if (user.role === Role.Admin) return;
    if (role === 'viewer') throw forbidden('Viewers of a study cannot start or change runs; ask the study owner for member access.');
  }
}
