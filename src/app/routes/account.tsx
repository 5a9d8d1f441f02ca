import { Link, Navigate } from 'react-router-dom';
import { PublicLayout } from '../../components/layout/public-layout';
import { Section } from '../../components/ui/section';
import { ErrorNotice, Loading } from '../../components/ui/status';
import { useMe } from '../../features/auth/api/get-me';
import { NotificationSettingsPanel } from '../../features/account/components/notification-settings';
import { appPaths } from '../../../shared/app-paths';
import { ROLE_LABELS } from '../../../shared/schemas/roles';

/** /account: who you are, your studios and roles, and which mail you receive. */
export function AccountRoute() {
  const me = useMe();
  if (me.isPending) return <Loading what="Checking your session" />;
  if (me.isError) {
    return (
      <PublicLayout title="Legwork is not answering">
        <ErrorNotice error={me.error} retry={() => void me.refetch()} />
      </PublicLayout>
    );
  }
  if (me.data === null)
    return <Navigate to={`/sign-in?next=${encodeURIComponent(appPaths.account())}`} replace />;
  const { user, memberships } = me.data;
  return (
    <PublicLayout title="Your account" wide>
      <Section title={user.name}>
        <p className="text-sm text-ink-600">{user.email}</p>
        {memberships.length ? (
          <ul className="flex flex-col gap-1 text-sm">
            {memberships.map((m) => (
              <li key={m.studioId}>
                <Link to={appPaths.home(m.studioId)} className="text-tealdeep-600 underline">
                  {m.studioName}
                </Link>{' '}
                <span className="text-ink-600">{m.roles.map((r) => ROLE_LABELS[r]).join(', ')}</span>
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-sm text-ink-600">You belong to no studio yet.</p>
        )}
      </Section>
      <NotificationSettingsPanel />
    </PublicLayout>
  );
}
