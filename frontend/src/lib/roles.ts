import { Role } from '@kiln/shared';

export const roleLabel: Record<Role, string> = {
  [Role.Admin]: 'Lab admin',
  [Role.Researcher]: 'Researcher',
  [Role.Collaborator]: 'Collaborator',
};

/** One line per role, from architecture.md's "People and access". */
export const roleAbilities: Record<Role, string> = {
  [Role.Admin]: 'Manage people, quotas and workers; everything a researcher can do.',
  [Role.Researcher]: 'Create studies, launch sweeps, review candidates, invite collaborators.',
  [Role.Collaborator]: 'Work inside the studies you are invited to, within your own quota.',
};

export const isAdmin = (role: Role | undefined) => role === Role.Admin;
