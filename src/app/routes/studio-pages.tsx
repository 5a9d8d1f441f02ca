// The studio's list pages: venues for everyone; members, invitations and the audit log for admins.
import { PageHeading, Section } from '../../components/ui/section';
import { RoleGate } from '../../components/ui/role-gate';
import { ErrorNotice, Loading } from '../../components/ui/status';
import { AuditLog } from '../../features/audit/components/audit-log';
import { InviteForm } from '../../features/members/components/invite-form';
import { InvitationsTable } from '../../features/members/components/invitations-table';
import { MembersTable } from '../../features/members/components/members-table';
import { NewVenueForm } from '../../features/venue-settings/components/new-venue-form';
import { useCan, useVenueScope } from '../../lib/membership';
import { useVenues } from '../../lib/queries/venues';
import { StudioVenues } from '../../features/venues/components/studio-venues';
import { useStudioContext } from './studio-layout';

export function VenuesRoute() {
  const { membership } = useStudioContext();
  const scoped = useVenueScope() !== null;
  const canCreate = useCan('venues.create');
  return (
    <>
      <PageHeading
        title="Venues"
        subtitle={scoped ? 'The venues assigned to you.' : "The studio's venues and their motion bases."}
      />
      <StudioVenues studioId={membership.studioId} />
      {canCreate ? (
        <Section title="New venue">
          <NewVenueForm studioId={membership.studioId} />
        </Section>
      ) : null}
    </>
  );
}

export function MembersRoute() {
  return (
    <RoleGate permission="members.manage" what="Members and invitations">
      <MembersPage />
    </RoleGate>
  );
}

function MembersPage() {
  const { me, membership } = useStudioContext();
  const venues = useVenues(membership.studioId);
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
  return (
    <RoleGate permission="audit.read" what="The audit log">
      <PageHeading title="Audit log" subtitle={`Who did what in ${membership.studioName}, newest first.`} />
      <AuditLog studioId={membership.studioId} />
    </RoleGate>
  );
}
