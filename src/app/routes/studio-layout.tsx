import {
  Link,
  Navigate,
  Outlet,
  useLocation,
  useNavigate,
  useOutletContext,
  useParams,
} from 'react-router-dom';
import type { Me, Membership } from '../../../shared/schemas/api';
import { AppShell } from '../../components/layout/app-shell';
import type { NavItem } from '../../components/layout/app-shell';
import { PublicLayout } from '../../components/layout/public-layout';
import { Button } from '../../components/ui/button';
import { ErrorNotice, Loading } from '../../components/ui/status';
import { useMe } from '../../features/auth/api/get-me';
import { useLogout } from '../../features/auth/api/logout';
import { StudioSwitcher } from '../../features/studios/components/studio-switcher';
import { firstStudio } from '../../lib/landing';
import { MembershipProvider } from '../../lib/membership';
import { allows } from '../../../shared/permissions';
import { appPaths } from '../../../shared/app-paths';

export interface StudioContext {
  me: Me;
  membership: Membership;
}

/** The signed-in user and their membership of the studio in the address, for pages inside a studio. */
export function useStudioContext(): StudioContext {
  return useOutletContext<StudioContext>();
}

/** Renders a studio's page with its context: the outlet context and the membership behind `useCan`. */
export function StudioOutlet({ context }: { context: StudioContext }) {
  return (
    <MembershipProvider membership={context.membership}>
      <Outlet context={context} />
    </MembershipProvider>
  );
}

function navFor(membership: Membership): NavItem[] {
  const base = `/s/${membership.studioId}`;
  const items: NavItem[] = [
    { to: base, label: 'Home', end: true },
    { to: `${base}/venues`, label: 'Venues' },
  ];
  // Each page is listed for the members whose roles may read it (the shared permission table).
  const can = (permission: Parameters<typeof allows>[1]) => allows(membership.roles, permission);
  if (can('tracks.read')) items.push({ to: `${base}/tracks`, label: 'Tracks' });
  // Every role reads releases; the server answers an operator with their venues' releases only.
  if (can('releases.read')) items.push({ to: `${base}/releases`, label: 'Releases' });
  if (can('profiles.read')) items.push({ to: `${base}/profiles`, label: 'Profiles' });
  if (can('members.manage')) items.push({ to: `${base}/members`, label: 'Members' });
  if (can('audit.read')) items.push({ to: `${base}/audit`, label: 'Audit log' });
  if (can('tokens.manage')) items.push({ to: `${base}/tokens`, label: 'API tokens' });
  return items;
}

function Account({ me, onDark = true }: { me: Me; onDark?: boolean }) {
  const logout = useLogout();
  const navigate = useNavigate();
  return (
    <div className="flex items-center gap-3 text-sm">
      <span className={onDark ? 'text-ink-100' : 'text-ink-800'} title={me.user.email}>
        {me.user.name}
      </span>
      <Link
        to={appPaths.account()}
        className={`rounded border px-2 py-0.5 text-xs font-medium ${
          onDark
            ? 'border-ink-600 text-ink-100 hover:bg-ink-800'
            : 'border-ink-200 text-ink-800 hover:bg-ink-100'
        }`}
      >
        Account
      </Link>
      {logout.error ? <span className="text-xs text-signal-400">{logout.error.message}</span> : null}
      <Button
        size="sm"
        variant={onDark ? 'onDark' : 'secondary'}
        busy={logout.isPending}
        onClick={() =>
          logout.mutate(undefined, { onSuccess: () => void navigate('/sign-in', { replace: true }) })
        }
      >
        Sign out
      </Button>
    </div>
  );
}

/** Guards every studio page: a session is required, and the studio must be one of the user's. */
export function StudioLayout() {
  const { studioId = '' } = useParams();
  const location = useLocation();
  const navigate = useNavigate();
  const me = useMe();

  if (me.isPending) return <Loading what="Checking your session" />;
  if (me.isError) {
    return (
      <PublicLayout title="Legwork is not answering">
        <ErrorNotice error={me.error} retry={() => void me.refetch()} />
      </PublicLayout>
    );
  }
  if (me.data === null) {
    const next = encodeURIComponent(location.pathname + location.search);
    return <Navigate to={`/sign-in?next=${next}`} replace />;
  }

  const membership = me.data.memberships.find((m) => m.studioId === studioId);
  const switcher = (
    <StudioSwitcher
      memberships={me.data.memberships}
      currentStudioId={membership ? studioId : ''}
      onSwitch={(id) => void navigate(`/s/${id}`)}
    />
  );

  if (!membership) {
    return (
      <AppShell switcher={switcher} account={<Account me={me.data} />} nav={[]}>
        <ErrorNotice
          error={
            new Error('You are not a member of this studio, or it does not exist. Choose a studio above.')
          }
        />
      </AppShell>
    );
  }

  const context: StudioContext = { me: me.data, membership };
  return (
    <AppShell switcher={switcher} account={<Account me={me.data} />} nav={navFor(membership)}>
      <StudioOutlet context={context} />
    </AppShell>
  );
}

/** `/`: sends a signed-in user to their first studio, anyone else to sign-in. */
export function RootRedirect() {
  const me = useMe();
  if (me.isPending) return <Loading what="Checking your session" />;
  if (me.isError) {
    return (
      <PublicLayout title="Legwork is not answering">
        <ErrorNotice error={me.error} retry={() => void me.refetch()} />
      </PublicLayout>
    );
  }
  if (me.data === null) return <Navigate to="/sign-in" replace />;
  const first = firstStudio(me.data);
  if (!first) {
    return (
      <PublicLayout title="No studio yet">
        <p className="text-sm text-ink-600">
          You are signed in as {me.data.user.email} but belong to no studio. Ask a studio admin for an
          invitation.
        </p>
        <Account me={me.data} onDark={false} />
      </PublicLayout>
    );
  }
  return <Navigate to={`/s/${first.studioId}`} replace />;
}
