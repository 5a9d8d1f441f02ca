// The releases of the studio (an operator's server answer holds only their venues'), filtered by
// venue and state, each row opening its release page.
import { Link, useSearchParams } from 'react-router-dom';
import { z } from 'zod';
import { appPaths } from '../../../../shared/app-paths';
import { RELEASE_STATES, RELEASE_STATE_LABELS, releaseStateSchema } from '../../../../shared/schemas/release';
import { ReleaseStateBadge } from '../../../components/releases/release-badge';
import { Empty, ErrorNotice, Loading } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatVenueTime } from '../../../lib/format';
import { useReleases } from '../../../lib/queries/releases';
import { useVenues } from '../../../lib/queries/venues';

export function ReleasesList({ studioId }: { studioId: string }) {
  const [params, setParams] = useSearchParams();
  const venues = useVenues(studioId);
  // A venue id from the address is sent as it is; the server answers 400 for a malformed one and
  // limits an operator to their venues.
  const venueParse = z.string().uuid().safeParse(params.get('venue'));
  const venueId = venueParse.success ? venueParse.data : undefined;
  const stateParse = releaseStateSchema.safeParse(params.get('state'));
  const state = stateParse.success ? stateParse.data : undefined;
  const releases = useReleases(studioId, { venueId, state });
  const zoneOf = (id: string) => venues.data?.find((v) => v.id === id)?.timeZone;

  const setFilter = (key: 'venue' | 'state', value: string) => {
    const next = new URLSearchParams(params);
    if (value) next.set(key, value);
    else next.delete(key);
    setParams(next, { replace: true });
  };

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap gap-3" role="group" aria-label="Filters">
        <label className="flex flex-col gap-1 text-xs font-medium text-ink-600">
          Venue
          <select
            className="rounded border border-ink-200 bg-white px-2 py-1.5 text-sm text-ink-900"
            value={venueId ?? ''}
            onChange={(event) => setFilter('venue', event.target.value)}
          >
            <option value="">Every venue</option>
            {(venues.data ?? []).map((venue) => (
              <option key={venue.id} value={venue.id}>
                {venue.name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-xs font-medium text-ink-600">
          State
          <select
            className="rounded border border-ink-200 bg-white px-2 py-1.5 text-sm text-ink-900"
            value={state ?? ''}
            onChange={(event) => setFilter('state', event.target.value)}
          >
            <option value="">Every state</option>
            {RELEASE_STATES.map((s) => (
              <option key={s} value={s}>
                {RELEASE_STATE_LABELS[s]}
              </option>
            ))}
          </select>
        </label>
      </div>
      {releases.isPending ? <Loading what="Loading the releases" /> : null}
      {releases.isError ? <ErrorNotice error={releases.error} retry={() => void releases.refetch()} /> : null}
      {releases.data && releases.data.length === 0 ? <Empty>No releases match.</Empty> : null}
      {releases.data && releases.data.length > 0 ? (
        <Table caption="Releases">
          <thead>
            <tr>
              <Th>Track</Th>
              <Th>Venue</Th>
              <Th>State</Th>
              <Th>Released</Th>
              <Th>Downloads</Th>
              <Th>Installed</Th>
              <Th>Problems</Th>
            </tr>
          </thead>
          <tbody>
            {releases.data.map((release) => (
              <tr key={release.id}>
                <Td>
                  <Link className="text-tealdeep-600 underline" to={appPaths.release(studioId, release.id)}>
                    {release.trackTitle}, take {release.takeNumber}
                  </Link>
                </Td>
                <Td>{release.venueName}</Td>
                <Td>
                  <ReleaseStateBadge state={release.state} />
                </Td>
                <Td className="whitespace-nowrap">
                  {formatVenueTime(release.releasedAt, zoneOf(release.venueId))}
                  {release.releasedBy ? (
                    <span className="block text-xs text-ink-600">by {release.releasedBy.name}</span>
                  ) : null}
                </Td>
                <Td className="font-mono">{release.downloads}</Td>
                <Td>{release.acknowledgements.length > 0 ? 'Yes' : 'Not yet'}</Td>
                <Td className="font-mono">{release.problems.length}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      ) : null}
    </div>
  );
}
