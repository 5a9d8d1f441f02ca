import { Link, isRouteErrorResponse, useRouteError } from 'react-router-dom';
import { PublicLayout } from '../../components/layout/public-layout';
import { ErrorNotice } from '../../components/ui/status';

/** Shown when a screen fails to render: the reason, and a way back. */
export function RouteErrorScreen() {
  const error = useRouteError();
  const shown = isRouteErrorResponse(error) ? new Error(`${error.status} ${error.statusText}`) : error;
  return (
    <PublicLayout title="This screen failed">
      <ErrorNotice error={shown} />
      <Link to="/" className="text-sm text-tealdeep-600 underline">
        Back to your studio
      </Link>
    </PublicLayout>
  );
}
