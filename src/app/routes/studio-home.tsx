import { Link } from 'react-router-dom';
import { ROLES } from '../../../shared/schemas/roles';
import type { Role } from '../../../shared/schemas/roles';
import { PageHeading, Section, Stat } from '../../components/ui/section';
import { ErrorNotice, Loading } from '../../components/ui/status';
import {
  EngineerHeldList,
  OperatorReleases,
  ProducerAttention,
  ReviewQueueList,
} from '../../features/homes/components/role-lists';
import { PendingInvitationsCount } from '../../features/members/components/invitations-table';
import { useStudioOverview } from '../../features/studios/api/get-studio-overview';
import type { StudioOverview } from '../../features/studios/api/get-studio-overview';
import { StudioVenues } from '../../features/venues/components/studio-venues';
import { useStudioContext } from './studio-layout';

type Counts = StudioOverview['counts'];

function ProducerDesk({ studioId, counts }: { studioId: string; counts: Counts }) {
  return (
    <Section title="Producer desk" testId="home-producer">
      <h3 className="text-sm font-medium text-ink-800">Tracks in production</h3>
      <div className="flex flex-wrap gap-3">
        <Stat label="Tracks" value={counts.tracks} />
        <Stat label="Runs awaiting review" value={counts.awaitingReview} />
        <Stat label="Runs held" value={counts.held} tone="hold" />
        <Stat label="Released to venues" value={counts.released} />
      </div>
      <p className="text-xs text-ink-600">
        <Link className="text-tealdeep-600 underline" to={`/s/${studioId}/tracks`}>
          Open the tracks table
        </Link>{' '}
        to upload takes and cue them for venues.
      </p>
      <ProducerAttention studioId={studioId} />
      <p className="text-xs text-ink-600">
        A release sends the package to its venue only; the venue&apos;s operators load it after their own
        checks.{' '}
        <Link className="text-tealdeep-600 underline" to={`/s/${studioId}/releases`}>
          Every release
        </Link>
      </p>
    </Section>
  );
}

function MotionEngineering({ studioId }: { studioId: string }) {
  return (
    <Section title="Motion engineering" testId="home-motion_engineer">
      <EngineerHeldList studioId={studioId} />
      <h3 className="text-sm font-medium text-ink-800">Venues and their motion bases</h3>
      <StudioVenues studioId={studioId} caption="Venues and their motion bases" />
      <p className="text-xs text-ink-600">
        <Link className="text-tealdeep-600 underline" to={`/s/${studioId}/profiles`}>
          Cueing profiles
        </Link>{' '}
        are versioned; open a venue to choose the version it runs with.
      </p>
    </Section>
  );
}

function SafetyReview({ studioId, counts }: { studioId: string; counts: Counts }) {
  return (
    <Section title="Safety review" testId="home-safety_reviewer">
      <h3 className="text-sm font-medium text-ink-800">Review queue</h3>
      <ReviewQueueList studioId={studioId} />
      <div className="flex flex-wrap gap-3">
        <Stat label="Awaiting review" value={counts.awaitingReview} />
        <Stat label="Held" value={counts.held} tone="hold" />
      </div>
      <p className="text-xs text-ink-600">Nothing reaches a venue until a safety reviewer clears it.</p>
    </Section>
  );
}

function VenueOperations({ studioId, venueIds }: { studioId: string; venueIds: string[] }) {
  return (
    <Section title="Venue operations" testId="home-venue_operator">
      <p
        role="note"
        className="rounded border border-signal-400 bg-white px-3 py-2 text-xs text-ink-800"
        data-testid="operator-caution"
      >
        Load a package on the motion base only after your venue&apos;s own checks: compare its SHA-256 with
        the release page, run <code className="font-mono">legwork verify</code> on it and follow the ride
        maker&apos;s procedures. Legwork supports the ride maker, the applicable codes and a qualified
        person&apos;s sign-off; it never replaces them.
      </p>
      <OperatorReleases studioId={studioId} />
      <h3 className="text-sm font-medium text-ink-800">Your venues</h3>
      <StudioVenues
        studioId={studioId}
        onlyIds={venueIds}
        caption="Your venues"
        empty="No venues are assigned to you yet; ask a studio admin."
      />
      <p className="text-xs text-ink-600">
        <Link className="text-tealdeep-600 underline" to={`/s/${studioId}/releases`}>
          Every release of your venues
        </Link>
      </p>
    </Section>
  );
}

function StudioAdministration({ studioId, counts }: { studioId: string; counts: Counts }) {
  return (
    <Section title="Studio administration" testId="home-studio_admin">
      <div className="flex flex-wrap gap-3">
        <Stat label="Members" value={counts.members} />
        <PendingInvitationsCount studioId={studioId} />
        <Stat label="Venues" value={counts.venues} />
      </div>
      <p className="flex gap-4 text-sm">
        <Link to={`/s/${studioId}/members`} className="text-tealdeep-600 underline">
          Members and invitations
        </Link>
        <Link to={`/s/${studioId}/audit`} className="text-tealdeep-600 underline">
          Audit log
        </Link>
      </p>
    </Section>
  );
}

/** `/s/:studioId`: one section per role the member holds, in the fixed order of the roles. */
export function StudioHomeRoute() {
  const { membership } = useStudioContext();
  const overview = useStudioOverview(membership.studioId);
  const roles: Role[] = ROLES.filter((role) => membership.roles.includes(role));

  if (overview.isPending) return <Loading what="Loading the studio" />;
  if (overview.isError) return <ErrorNotice error={overview.error} retry={() => void overview.refetch()} />;
  const { counts } = overview.data;
  const studioId = membership.studioId;

  return (
    <>
      <PageHeading title={overview.data.studio.name} subtitle="Home" />
      {roles.map((role) => {
        switch (role) {
          case 'producer':
            return <ProducerDesk key={role} studioId={studioId} counts={counts} />;
          case 'motion_engineer':
            return <MotionEngineering key={role} studioId={studioId} />;
          case 'safety_reviewer':
            return <SafetyReview key={role} studioId={studioId} counts={counts} />;
          case 'venue_operator':
            return <VenueOperations key={role} studioId={studioId} venueIds={membership.venueIds} />;
          case 'studio_admin':
            return <StudioAdministration key={role} studioId={studioId} counts={counts} />;
        }
      })}
    </>
  );
}
