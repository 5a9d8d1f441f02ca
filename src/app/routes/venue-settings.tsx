// `/s/:studioId/venues/:venueId`: the venue's motion base and the profile versions its runs use.
import { useParams } from 'react-router-dom';
import type { VenueDetail } from '../../../shared/schemas/pipeline';
import { PageHeading, Section } from '../../components/ui/section';
import { ErrorNotice, Loading } from '../../components/ui/status';
import { useCan } from '../../lib/membership';
import { useVenue } from '../../lib/queries/venues';
import { BaseForm } from '../../features/venue-settings/components/base-form';
import { BaseSummary } from '../../features/venue-settings/components/base-summary';
import { ControllerForm, describeController } from '../../features/venue-settings/components/controller-form';
import { ProfileVersionSelect } from '../../features/venue-settings/components/profile-version-select';
import { previewJoints } from '../../features/runs/utils/preview-geometry';
import { useStudioContext } from './studio-layout';

/** The version new runs use, for members who may see it but not choose it. */
function CurrentVersion({ version }: { version: VenueDetail['cueingVersion'] }) {
  return (
    <p className="text-sm text-ink-800">
      In use for new runs:{' '}
      {version ? (
        <span className="font-medium">
          {version.name} v{version.version}
        </span>
      ) : (
        <span className="text-signal-600">none set</span>
      )}
    </p>
  );
}

/** The venue settings page: motion base summary (and editor for engineers and admins) and the profile versions new runs use. */
export function VenueSettingsRoute() {
  const { membership } = useStudioContext();
  const { venueId = '' } = useParams();
  const studioId = membership.studioId;
  const venue = useVenue(studioId, venueId);
  const canConfigure = useCan('venues.configure');
  const canChooseCueing = useCan('profiles.cueing.write');
  const canChooseBudget = useCan('profiles.budget.write');
  if (venue.isPending) return <Loading what="Loading the venue" />;
  if (venue.isError) return <ErrorNotice error={venue.error} retry={() => void venue.refetch()} />;
  const detail = venue.data;
  return (
    <>
      <PageHeading title={detail.name} subtitle={`${detail.site} · ${detail.timeZone}`} />
      <Section title="Motion base">
        <div className="flex flex-col gap-4">
          <BaseSummary base={detail.base} />
          {canConfigure ? <BaseForm studioId={studioId} venue={detail} placeJoints={previewJoints} /> : null}
        </div>
      </Section>
      <Section title="Controller output">
        {canConfigure ? (
          <ControllerForm studioId={studioId} venue={detail} />
        ) : (
          <p className="text-sm text-ink-800">{describeController(detail.controller)}</p>
        )}
      </Section>
      <Section title="Cueing profile">
        {canChooseCueing ? (
          <ProfileVersionSelect studioId={studioId} venue={detail} kind="cueing" />
        ) : (
          <CurrentVersion version={detail.cueingVersion} />
        )}
      </Section>
      <Section title="Budget profile">
        {canChooseBudget ? (
          <ProfileVersionSelect studioId={studioId} venue={detail} kind="budget" />
        ) : (
          <CurrentVersion version={detail.budgetVersion} />
        )}
      </Section>
    </>
  );
}
