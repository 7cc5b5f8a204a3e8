import { createBrowserRouter, Outlet, RouterProvider } from 'react-router-dom';
import { FullPageSpinner } from '@/components/full-page-spinner';
import { paths } from '@/config/paths';
import { RouteError } from './routes/route-error';

// Every page is its own lazily loaded module (see ./routes); each exports
// `Component` and, where it reads data, a `loader` that warms the query cache.
const router = createBrowserRouter([
  {
    element: <Outlet />,
    errorElement: <RouteError />,
    hydrateFallbackElement: <FullPageSpinner />,
    children: [
      { path: paths.signIn.path, lazy: () => import('./routes/sign-in') },
      { path: paths.invitationAccept.path, lazy: () => import('./routes/invitation-accept') },
      { path: paths.resetPassword.path, lazy: () => import('./routes/reset-password') },
      {
        // Signed-in area: checks the session and draws the shell around the pages.
        lazy: () => import('./routes/app-shell'),
        children: [
          {
            // Errors inside a page keep the shell, so navigation still works.
            errorElement: <RouteError />,
            children: [
              { index: true, lazy: () => import('./routes/overview') },
              { path: paths.studies.path, lazy: () => import('./routes/studies') },
              { path: paths.study.path, lazy: () => import('./routes/study') },
              { path: paths.newSweep.path, lazy: () => import('./routes/new-sweep') },
              { path: paths.sweep.path, lazy: () => import('./routes/sweep') },
              { path: paths.run.path, lazy: () => import('./routes/run') },
              { path: paths.lab.path, lazy: () => import('./routes/lab') },
              { path: paths.labQuotas.path, lazy: () => import('./routes/lab-quotas') },
              { path: paths.labWorkers.path, lazy: () => import('./routes/lab-workers') },
              { path: paths.labUsage.path, lazy: () => import('./routes/lab-usage') },
              { path: paths.labAudit.path, lazy: () => import('./routes/lab-audit') },
              { path: paths.labOutbox.path, lazy: () => import('./routes/outbox') },
              { path: paths.candidates.path, lazy: () => import('./routes/candidates') },
              { path: paths.candidate.path, lazy: () => import('./routes/candidate') },
              { path: paths.account.path, lazy: () => import('./routes/account') },
              { path: '*', lazy: () => import('./routes/not-found') },
            ],
          },
        ],
      },
    ],
  },
]);

export function AppRouter() {
  return <RouterProvider router={router} />;
}
