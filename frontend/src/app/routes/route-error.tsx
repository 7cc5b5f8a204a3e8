import { isRouteErrorResponse, useRouteError } from 'react-router-dom';
import { ErrorPanel } from '@/components/error-panel';
import { paths } from '@/config/paths';

/** The router's error boundary: a visible message instead of a blank page. */
export function RouteError() {
  const error = useRouteError();
  const shown = isRouteErrorResponse(error) ? `${error.status} ${error.statusText}` : error;
  // A failed lazy import usually means a new version of Kiln was deployed.
  const chunkFailed =
    error instanceof TypeError &&
    /dynamically imported module|importing a module script failed/i.test(error.message);
  return (
    <ErrorPanel
      error={chunkFailed ? 'Part of the app could not be loaded; Kiln may have been updated. Reload the page.' : shown}
      homeHref={paths.overview.getHref()}
    />
  );
}
