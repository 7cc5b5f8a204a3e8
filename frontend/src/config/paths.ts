/**
 * Every route of the app, in one place. Components link with `getHref()` and the
 * router registers `path`; later issues add candidates and quotas.
 */
export const paths = {
  overview: {
    path: '/',
    getHref: () => '/',
  },
  studies: {
    path: '/studies',
    getHref: () => '/studies',
  },
  study: {
    path: '/studies/:studyId',
    getHref: (studyId: string) => `/studies/${studyId}`,
  },
  newSweep: {
    path: '/studies/:studyId/sweeps/new',
    getHref: (studyId: string) => `/studies/${studyId}/sweeps/new`,
  },
  sweep: {
    path: '/sweeps/:sweepId',
    getHref: (sweepId: string) => `/sweeps/${sweepId}`,
  },
  run: {
    path: '/runs/:runId',
    getHref: (runId: string) => `/runs/${runId}`,
  },
  lab: {
    path: '/lab',
    getHref: () => '/lab',
  },
  // The lab admin's pages (People is /lab itself).
  labQuotas: {
    path: '/lab/quotas',
    getHref: () => '/lab/quotas',
  },
  labWorkers: {
    path: '/lab/workers',
    getHref: () => '/lab/workers',
  },
  labUsage: {
    path: '/lab/usage',
    getHref: () => '/lab/usage',
  },
  labAudit: {
    path: '/lab/audit',
    getHref: () => '/lab/audit',
  },
  candidates: {
    path: '/candidates',
    getHref: () => '/candidates',
  },
  candidate: {
    path: '/candidates/:candidateId',
    getHref: (candidateId: string) => `/candidates/${candidateId}`,
  },
  account: {
    path: '/account',
    getHref: () => '/account',
  },
  labOutbox: {
    path: '/lab/outbox',
    getHref: () => '/lab/outbox',
  },
  // Public pages reached from e-mailed links.
  invitationAccept: {
    path: '/invitations/accept',
    getHref: (token?: string) => (token ? `/invitations/accept?token=${encodeURIComponent(token)}` : '/invitations/accept'),
  },
  resetPassword: {
    path: '/reset-password',
    getHref: (token?: string) => (token ? `/reset-password?token=${encodeURIComponent(token)}` : '/reset-password'),
  },
  signIn: {
    path: '/sign-in',
    /** `redirectTo` is where to go after signing in (an in-app path). */
    getHref: (redirectTo?: string) =>
      redirectTo && redirectTo !== '/'
        ? `/sign-in?redirectTo=${encodeURIComponent(redirectTo)}`
        : '/sign-in',
  },
} as const;

/** Accepts only in-app paths, so a crafted `?redirectTo=` cannot send anyone off-site. */
export function safeRedirectTarget(value: string | null): string {
  if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/sign-in')) {
    return paths.overview.getHref();
  }
  return value;
}
