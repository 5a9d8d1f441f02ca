// The studio's list pages: venues for everyone; members, invitations and the audit log for admins.
import { PageHeading, Section } from '../../components/ui/section';
import { ErrorNotice, Loading } from '../../components/ui/status';
import { AuditLog } from '../../features/audit/components/audit-log';
import { InviteForm } from '../../features/members/components/invite-form';
import { InvitationsTable } from '../../features/members/components/invitations-table';
import { MembersTable } from '../../features/members/components/members-table';
import { NewVenueForm } from '../../features/venue-settings/components/new-venue-form';
import { useVenues } from '../../features/venues/api/get-venues';
import { StudioVenues } from '../../features/venues/components/studio-venues';
import { useStudioContext } from './studio-layout';

function AdminOnly({ what }: { what: string }) {
  return <ErrorNotice error={new Error(`Only a studio admin can see ${what}.`)} />;
}

export function VenuesRoute() {
  const { membership } = useStudioContext();
  const scoped = membership.roles.length === 1 && membership.roles[0] === 'venue_operator';
  return (
    <>
      <PageHeading
        title="Venues"
        subtitle={scoped ? 'The venues assigned to you.' : "The studio's venues and their motion bases."}
      />
      <StudioVenues studioId={membership.studioId} />
      {membership.roles.includes('studio_admin') ? (
        <Section title="New venue">
          <NewVenueForm studioId={membership.studioId} />
        </Section>
      ) : null}
    </>
  );
}

export function MembersRoute() {
  const { me, membership } = useStudioContext();
  const venues = useVenues(membership.studioId);
  if (!membership.roles.includes('studio_admin')) return <AdminOnly what="the members" />;
  if (venues.isPending) return <Loading what="Loading venues" />;
  if (venues.isError) return <ErrorNotice error={venues.error} retry={() => void venues.refetch()} />;
  const studioId = membership.studioId;
  return (
    <>
      <PageHeading title="Members and invitations" subtitle={membership.studioName} />
      <Section title="Members">
        <MembersTable studioId={studioId} venues={venues.data} currentUserId={me.user.id} />
      </Section>
      <Section title="Invite a member">
        <InviteForm studioId={studioId} venues={venues.data} />
      </Section>
      <Section title="Pending invitations">
        <InvitationsTable studioId={studioId} venues={venues.data} />
      </Section>
    </>
  );
}

export function AuditRoute() {
  const { membership } = useStudioContext();
  if (!membership.roles.includes('studio_admin')) return <AdminOnly what="the audit log" />;
  return (
    <>
      <PageHeading title="Audit log" subtitle={`Who did what in ${membership.studioName}, newest first.`} />
      <AuditLog studioId={membership.studioId} />
    </>
  );
}
