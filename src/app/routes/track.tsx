// `/s/:studioId/tracks/:trackId`: takes, the upload form and the runs per venue, refreshed every second while a run is active.
import { Link, useParams } from 'react-router-dom';
import { RoleGate } from '../../components/ui/role-gate';
import { PageHeading, Section } from '../../components/ui/section';
import { ErrorNotice, Loading } from '../../components/ui/status';
import { useTrack } from '../../features/tracks/api/get-track';
import { TakesTable } from '../../features/tracks/components/takes-table';
import { TrackRuns } from '../../features/tracks/components/track-runs';
import { UploadTakeForm } from '../../features/tracks/components/upload-take-form';
import { formatDateTime } from '../../lib/format';
import { useCan } from '../../lib/membership';
import { useStudioContext } from './studio-layout';

/** The track page: uploads for producers, cue requests for producers and motion engineers. */
export function TrackRoute() {
  return (
    <RoleGate permission="tracks.read" what="Tracks">
      <TrackPage />
    </RoleGate>
  );
}

function TrackPage() {
  const { membership } = useStudioContext();
  const { trackId = '' } = useParams();
  const studioId = membership.studioId;
  const track = useTrack(studioId, trackId);
  const canUpload = useCan('takes.upload');
  const canCue = useCan('runs.request');

  if (track.isPending) return <Loading what="Loading the track" />;
  if (!track.data) return <ErrorNotice error={track.error} retry={() => void track.refetch()} />;
  const detail = track.data;
  return (
    <>
      <p className="text-xs">
        <Link to={`/s/${studioId}/tracks`} className="text-tealdeep-600 underline">
          Tracks
        </Link>
      </p>
      <PageHeading
        title={detail.title}
        subtitle={`${detail.film ? `${detail.film} · ` : ''}created ${formatDateTime(detail.createdAt)}`}
      />
      {track.isError ? <ErrorNotice error={track.error} /> : null}
      <Section title="Takes">
        <TakesTable studioId={studioId} takes={detail.takes} canCue={canCue} />
        {canUpload ? <UploadTakeForm studioId={studioId} trackId={detail.id} /> : null}
      </Section>
      <Section title="Cue runs per venue">
        <TrackRuns studioId={studioId} runs={detail.runs} />
      </Section>
    </>
  );
}
