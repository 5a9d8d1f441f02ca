// `/s/:studioId/venues/:venueId`: the venue's motion base and the profile versions its runs use.
import { useParams } from 'react-router-dom';
import { PageHeading, Section } from '../../components/ui/section';
import { ErrorNotice, Loading } from '../../components/ui/status';
import { useVenueDetail } from '../../features/venue-settings/api/get-venue-detail';
import { BaseForm } from '../../features/venue-settings/components/base-form';
import { BaseSummary } from '../../features/venue-settings/components/base-summary';
import { ProfileVersionSelect } from '../../features/venue-settings/components/profile-version-select';
import { useStudioContext } from './studio-layout';

/** The venue settings page: motion base summary (and editor for engineers and admins) and the profile versions new runs use. */
export function VenueSettingsRoute() {
  const { membership } = useStudioContext();
  const { venueId = '' } = useParams();
  const studioId = membership.studioId;
  const venue = useVenueDetail(studioId, venueId);
  if (venue.isPending) return <Loading what="Loading the venue" />;
  if (venue.isError) return <ErrorNotice error={venue.error} retry={() => void venue.refetch()} />;
  const detail = venue.data;
  // Mirrors the server's `venues.configure` permission; the server still decides.
  const canConfigure = membership.roles.some((role) => role === 'motion_engineer' || role === 'studio_admin');
  return (
    <>
      <PageHeading title={detail.name} subtitle={`${detail.site} · ${detail.timeZone}`} />
      <Section title="Motion base">
        <div className="flex flex-col gap-4">
          <BaseSummary base={detail.base} />
          {canConfigure ? <BaseForm studioId={studioId} venue={detail} /> : null}
        </div>
      </Section>
      <Section title="Cueing profile">
        <ProfileVersionSelect studioId={studioId} venue={detail} kind="cueing" />
      </Section>
      <Section title="Budget profile">
        <ProfileVersionSelect studioId={studioId} venue={detail} kind="budget" />
      </Section>
    </>
  );
}
