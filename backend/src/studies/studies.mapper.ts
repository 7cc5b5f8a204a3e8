import type { Selectable } from 'kysely';
import type { StudiesTable } from '@kiln/shared/db';
import type { Study, StudyMember, StudyRole } from '@kiln/shared';

export function toStudy(row: Selectable<StudiesTable>, myRole: StudyRole | null, members: StudyMember[]): Study {
  return {
    id: row.id,
    name: row.name,
    description: row.description,
    ownerId: row.owner_id,
    createdAt: row.created_at.toISOString(),
    myRole,
    members,
  };
}
