/**
 * Every route of the app, in one place. Components link with `getHref()` and the
 * router registers `path`; later issues add studies, sweeps, runs, candidates, quotas.
 */
export const paths = {
  overview: {
    path: '/',
    getHref: () => '/',
  },
  lab: {
    path: '/lab',
    getHref: () => '/lab',
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
