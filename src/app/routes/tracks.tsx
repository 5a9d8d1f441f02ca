// `/s/:studioId/tracks`: the tracks table; its sort, filters and page live in the address so a view can be shared.
import { useNavigate, useSearchParams } from 'react-router-dom';
import { runStateSchema } from '../../../shared/schemas/pipeline';
import { RoleGate } from '../../components/ui/role-gate';
import { PageHeading, Section } from '../../components/ui/section';
import type { TrackSort, TracksParams } from '../../features/tracks/api/get-tracks';
import { NewTrackForm } from '../../features/tracks/components/new-track-form';
import { TracksTable } from '../../features/tracks/components/tracks-table';
import { useCan } from '../../lib/membership';
import { useStudioContext } from './studio-layout';

export const TRACKS_PAGE_SIZE = 20;
const SORTS: readonly TrackSort[] = ['updatedAt', 'title', 'createdAt'];

/** Table parameters from the address, with defaults for anything missing or unreadable. */
export function tracksParamsFrom(search: URLSearchParams): TracksParams {
  const page = Number(search.get('page'));
  const sort = search.get('sort') as TrackSort | null;
  const state = runStateSchema.safeParse(search.get('state'));
  return {
    page: Number.isInteger(page) && page >= 1 ? page : 1,
    pageSize: TRACKS_PAGE_SIZE,
    sort: sort && SORTS.includes(sort) ? sort : 'updatedAt',
    dir: search.get('dir') === 'asc' ? 'asc' : 'desc',
    state: state.success ? state.data : undefined,
    venueId: search.get('venue') ?? undefined,
    q: search.get('q') ?? undefined,
  };
}

function toSearch(params: TracksParams): URLSearchParams {
  const search = new URLSearchParams();
  if (params.page > 1) search.set('page', String(params.page));
  if (params.sort !== 'updatedAt') search.set('sort', params.sort);
  if (params.dir !== 'desc') search.set('dir', params.dir);
  if (params.state) search.set('state', params.state);
  if (params.venueId) search.set('venue', params.venueId);
  if (params.q) search.set('q', params.q);
  return search;
}

/** The tracks page: the "New track" form for producers above the table. */
export function TracksRoute() {
  return (
    <RoleGate permission="tracks.read" what="Tracks">
      <TracksPage />
    </RoleGate>
  );
}

function TracksPage() {
  const { membership } = useStudioContext();
  const canCreate = useCan('tracks.write');
  const [search, setSearch] = useSearchParams();
  const navigate = useNavigate();
  const studioId = membership.studioId;
  const params = tracksParamsFrom(search);
  return (
    <>
      <PageHeading
        title="Tracks"
        subtitle="Ride-film motion, its takes and the latest cue run at each venue."
      />
      {canCreate ? (
        <Section title="New track">
          <NewTrackForm
            studioId={studioId}
            onCreated={(track) => void navigate(`/s/${studioId}/tracks/${track.id}`)}
          />
        </Section>
      ) : null}
      <TracksTable studioId={studioId} params={params} onChange={(next) => setSearch(toSearch(next))} />
    </>
  );
}
