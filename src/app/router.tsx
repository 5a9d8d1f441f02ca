import type { QueryClient } from '@tanstack/react-query';
import { createBrowserRouter } from 'react-router-dom';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { getMeQueryOptions } from '../features/auth/api/get-me';
import { getStudioOverviewQueryOptions } from '../features/studios/api/get-studio-overview';
import { getVenuesQueryOptions } from '../lib/queries/venues';
import { getReleaseQueryOptions } from '../lib/queries/releases';
import { getRunQueryOptions } from '../features/runs/api/get-run';
import { getTrackQueryOptions } from '../features/tracks/api/get-track';
import { Loading } from '../components/ui/status';
import { allows } from '../../shared/permissions';
import type { Permission } from '../../shared/permissions';
import { AccountRoute } from './routes/account';
import { MailboxRoute } from './routes/mailbox';
import {
  AcceptInvitationRoute,
  ForgotPasswordRoute,
  NotFoundRoute,
  ResetPasswordRoute,
  SignInRoute,
} from './routes/public-routes';
import { RouteErrorScreen } from './routes/route-error';
import { StudioHomeRoute } from './routes/studio-home';
import { RootRedirect, StudioLayout } from './routes/studio-layout';
import { AuditRoute, MembersRoute, VenuesRoute } from './routes/studio-pages';
import { ProfilesRoute } from './routes/profiles';
import { ReleaseRoute, ReleasesRoute } from './routes/releases';
import { RunRoute } from './routes/run';
import { CompareRoute } from './routes/compare';
import { TokensRoute } from './routes/tokens';
import { TrackRoute } from './routes/track';
import { TracksRoute } from './routes/tracks';
import { VenueSettingsRoute } from './routes/venue-settings';

/** The app's routes; loaders only start fetches and never throw, so pages own their loading and error states. */
export function createAppRouter(queryClient: QueryClient) {
  // Waits for the session (so a signed-out visit makes one request, not one per list), then starts
  // the page's own fetch for a studio the user belongs to; failures are left to the page, which
  // shows them with a retry.
  // A page the member's roles do not cover fetches nothing (the page says whose work it is).
  const prefetchInStudio =
    (permission: Permission, prefetch: (studioId: string) => Promise<void>) =>
    async ({ params }: LoaderFunctionArgs) => {
      const me = await queryClient.ensureQueryData(getMeQueryOptions()).catch(() => null);
      const studioId = params.studioId;
      const membership = me?.memberships.find((m) => m.studioId === studioId);
      if (studioId && membership && allows(membership.roles, permission)) void prefetch(studioId);
      return null;
    };
  const studioLoader = prefetchInStudio('studio.read', (id) =>
    queryClient.prefetchQuery(getStudioOverviewQueryOptions(id)),
  );
  const venuesLoader = prefetchInStudio('venues.read', (id) =>
    queryClient.prefetchQuery(getVenuesQueryOptions(id)),
  );
  // The track page also offers the venues to cue for, so both are asked for at once.
  const trackLoader = (args: LoaderFunctionArgs) =>
    prefetchInStudio('tracks.read', (id) =>
      Promise.all([
        queryClient.prefetchQuery(getTrackQueryOptions(id, args.params.trackId ?? '')),
        queryClient.prefetchQuery(getVenuesQueryOptions(id)),
      ]).then(() => undefined),
    )(args);
  const runLoader = (args: LoaderFunctionArgs) =>
    prefetchInStudio('runs.read', (id) =>
      queryClient.prefetchQuery(getRunQueryOptions(id, args.params.runId ?? '')),
    )(args);

  const releaseLoader = (args: LoaderFunctionArgs) =>
    prefetchInStudio('releases.read', (id) =>
      queryClient.prefetchQuery(getReleaseQueryOptions(id, args.params.releaseId ?? '')),
    )(args);

  return createBrowserRouter([
    {
      errorElement: <RouteErrorScreen />,
      hydrateFallbackElement: <Loading what="Starting Legwork" />,
      children: [
        { path: '/', element: <RootRedirect /> },
        { path: '/sign-in', element: <SignInRoute /> },
        { path: '/forgot-password', element: <ForgotPasswordRoute /> },
        { path: '/reset-password', element: <ResetPasswordRoute /> },
        { path: '/invitations/:token', element: <AcceptInvitationRoute /> },
        { path: '/mailbox', element: <MailboxRoute /> },
        { path: '/account', element: <AccountRoute /> },
        {
          path: '/s/:studioId',
          element: <StudioLayout />,
          loader: studioLoader,
          children: [
            { index: true, element: <StudioHomeRoute /> },
            { path: 'venues', element: <VenuesRoute />, loader: venuesLoader },
            { path: 'members', element: <MembersRoute />, loader: venuesLoader },
            { path: 'audit', element: <AuditRoute /> },
            { path: 'tracks', element: <TracksRoute />, loader: venuesLoader },
            { path: 'tracks/:trackId', element: <TrackRoute />, loader: trackLoader },
            { path: 'tracks/:trackId/compare', element: <CompareRoute /> },
            { path: 'runs/:runId', element: <RunRoute />, loader: runLoader },
            { path: 'releases', element: <ReleasesRoute />, loader: venuesLoader },
            { path: 'releases/:releaseId', element: <ReleaseRoute />, loader: releaseLoader },
            { path: 'venues/:venueId', element: <VenueSettingsRoute /> },
            { path: 'profiles', element: <ProfilesRoute /> },
            { path: 'tokens', element: <TokensRoute /> },
          ],
        },
        { path: '*', element: <NotFoundRoute /> },
      ],
    },
  ]);
}
