/** Cache keys of invitations; mutations invalidate by prefix. */
export const invitationKeys = {
  all: ['invitations'] as const,
  study: (studyId: string) => [...invitationKeys.all, 'study', studyId] as const,
  preview: (token: string) => [...invitationKeys.all, 'preview', token] as const,
};
