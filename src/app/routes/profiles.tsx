// `/s/:studioId/profiles`: cueing profiles (motion engineers) and budget profiles (safety reviewers), versioned.
import { Link } from 'react-router-dom';
import { RoleGate } from '../../components/ui/role-gate';
import { PageHeading, Section } from '../../components/ui/section';
import { ProfilesList } from '../../features/profiles/components/profiles-list';
import { useVenues } from '../../lib/queries/venues';
import { useCan } from '../../lib/membership';
import { useStudioContext } from './studio-layout';

function VenueLinks({ studioId }: { studioId: string }) {
  const venues = useVenues(studioId);
  if (!venues.data || venues.data.length === 0) return null;
  return (
    <p className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
      <span className="text-ink-600">Choose the versions a venue uses on its settings page:</span>
      {venues.data.map((venue) => (
        <Link key={venue.id} to={`/s/${studioId}/venues/${venue.id}`} className="text-tealdeep-600 underline">
          {venue.name}
        </Link>
      ))}
    </p>
  );
}

/** The profiles page: cueing and budget profiles with their versions, editable by the role that owns each kind. */
export function ProfilesRoute() {
  return (
    <RoleGate permission="profiles.read" what="Profiles">
      <ProfilesPage />
    </RoleGate>
  );
}

function ProfilesPage() {
  const { membership } = useStudioContext();
  const studioId = membership.studioId;
  const canWriteCueing = useCan('profiles.cueing.write');
  const canWriteBudget = useCan('profiles.budget.write');
  return (
    <>
      <PageHeading
        title="Profiles"
        subtitle="Versioned cueing and budget parameters. A version a run used never changes; editing makes a new version."
      />
      <VenueLinks studioId={studioId} />
      <Section title="Cueing profiles (classical washout)">
        <ProfilesList studioId={studioId} kind="cueing" canWrite={canWriteCueing} />
      </Section>
      <Section title="Budget profiles (motion-safety budget)">
        <ProfilesList studioId={studioId} kind="budget" canWrite={canWriteBudget} />
      </Section>
    </>
  );
}
