/** A person's role in the lab (architecture.md, "People and access"). */
export enum Role {
  Admin = 'admin',
  Researcher = 'researcher',
  Collaborator = 'collaborator',
}

export const ROLES = [Role.Admin, Role.Researcher, Role.Collaborator] as const;
