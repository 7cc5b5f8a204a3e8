import type { Role } from '@kiln/shared';
import { roleLabel } from '@/lib/roles';

/** A person's role as a word in a quiet outline. */
export function RoleTag({ role }: { role: Role }) {
  return (
    <span className={`role-tag role-tag--${role}`} data-role={role}>
      {roleLabel[role]}
    </span>
  );
}
