import { useState } from 'react';
import type { FormEvent } from 'react';
import { Link } from 'react-router-dom';
import { RUN_STATE_LABELS } from '../../../../shared/schemas/pipeline';
import type { RunStateName, TrackSummary } from '../../../../shared/schemas/pipeline';
import { RunStateBadge, UseRatioBar } from '../../../components/charts/run-badges';
import { Button } from '../../../components/ui/button';
import { Empty, ErrorNotice, Loading } from '../../../components/ui/status';
import { Table, Td, Th } from '../../../components/ui/table';
import { formatDateTime } from '../../../lib/format';
import { useTracks } from '../api/get-tracks';
import type { TrackSort, TracksParams } from '../api/get-tracks';
import { useVenues } from '../../../lib/queries/venues';

const STATE_NAMES = Object.keys(RUN_STATE_LABELS) as RunStateName[];

/** "41–60 of 73": the rows shown and the total, for the pager. */
export function pageRange(page: number, pageSize: number, total: number): string {
  if (total === 0) return '0 of 0';
  const first = (page - 1) * pageSize + 1;
  const last = Math.min(page * pageSize, total);
  return `${first}–${last} of ${total}`;
}

function SortHeader({
  label,
  column,
  params,
  onChange,
  className = '',
}: {
  label: string;
  column: TrackSort;
  params: TracksParams;
  onChange: (next: TracksParams) => void;
  className?: string;
}) {
  const active = params.sort === column;
  const next = active && params.dir === 'asc' ? 'desc' : active ? 'asc' : column === 'title' ? 'asc' : 'desc';
  return (
    <Th
      className={className}
      aria-sort={active ? (params.dir === 'asc' ? 'ascending' : 'descending') : 'none'}
    >
      <button
        type="button"
        onClick={() => onChange({ ...params, sort: column, dir: next, page: 1 })}
        className="inline-flex items-center gap-1 hover:text-ink-900"
        title={`Sort by ${label.toLowerCase()}`}
      >
        {label}
        <span aria-hidden="true" className={active ? 'text-tealdeep-600' : 'text-ink-200'}>
          {active && params.dir === 'asc' ? '▲' : '▼'}
        </span>
      </button>
    </Th>
  );
}

function VenueStates({ venues }: { venues: TrackSummary['venues'] }) {
  if (venues.length === 0) return <span className="text-xs text-ink-400">not cued yet</span>;
  return (
    <ul className="flex flex-col gap-1">
      {venues.map((venue) => (
        <li key={venue.venueId} className="flex flex-wrap items-center gap-2">
          <span className="min-w-32 text-xs text-ink-800">{venue.venueName}</span>
          <RunStateBadge state={venue.state} />
          <UseRatioBar ratio={venue.worstRatio} label={`worst use at ${venue.venueName}`} />
        </li>
      ))}
    </ul>
  );
}

function Filters({
  studioId,
  params,
  onChange,
}: {
  studioId: string;
  params: TracksParams;
  onChange: (next: TracksParams) => void;
}) {
  const venues = useVenues(studioId);
  const [text, setText] = useState(params.q ?? '');
  const search = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    onChange({ ...params, q: text.trim() || undefined, page: 1 });
  };
  const selectClass = 'rounded border border-ink-200 bg-white px-2 py-1.5 text-sm text-ink-900';
  return (
    <form
      role="search"
      aria-label="Filter tracks"
      onSubmit={search}
      className="flex flex-wrap items-end gap-3"
    >
      <label className="flex flex-col gap-1 text-xs font-medium text-ink-600">
        Run state
        <select
          className={selectClass}
          value={params.state ?? ''}
          onChange={(event) =>
            onChange({
              ...params,
              state: (event.target.value || undefined) as RunStateName | undefined,
              page: 1,
            })
          }
        >
          <option value="">Any state</option>
          {STATE_NAMES.map((state) => (
            <option key={state} value={state}>
              {RUN_STATE_LABELS[state]}
            </option>
          ))}
        </select>
      </label>
      <label className="flex flex-col gap-1 text-xs font-medium text-ink-600">
        Venue
        <select
          className={selectClass}
          value={params.venueId ?? ''}
          onChange={(event) => onChange({ ...params, venueId: event.target.value || undefined, page: 1 })}
        >
          <option value="">Any venue</option>
          {(venues.data ?? []).map((venue) => (
            <option key={venue.id} value={venue.id}>
              {venue.name}
            </option>
          ))}
        </select>
      </label>
      <label className="flex flex-col gap-1 text-xs font-medium text-ink-600">
        Title or film contains
        <input
          type="search"
          value={text}
          onChange={(event) => setText(event.target.value)}
          className="w-56 rounded border border-ink-200 bg-white px-2 py-1.5 text-sm text-ink-900"
        />
      </label>
      <Button type="submit">Search</Button>
      {venues.isError ? (
        <span className="text-xs text-stop-700">Venues could not be loaded for the filter.</span>
      ) : null}
    </form>
  );
}

/** The studio's tracks with server-side sorting, filters and paging; each row shows the latest run per venue. */
export function TracksTable({
  studioId,
  params,
  onChange,
}: {
  studioId: string;
  params: TracksParams;
  onChange: (next: TracksParams) => void;
}) {
  const tracks = useTracks(studioId, params);
  const data = tracks.data;
  const lastPage = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;

  return (
    <div className="flex flex-col gap-3">
      <Filters key={params.q ?? ''} studioId={studioId} params={params} onChange={onChange} />
      {tracks.isPending ? <Loading what="Loading tracks" /> : null}
      {tracks.isError ? <ErrorNotice error={tracks.error} retry={() => void tracks.refetch()} /> : null}
      {data && data.items.length === 0 ? (
        <Empty>
          {params.q || params.state || params.venueId ? 'No track matches these filters.' : 'No tracks yet.'}
        </Empty>
      ) : null}
      {data && data.items.length > 0 ? (
        <Table caption="Tracks">
          <thead>
            <tr>
              <SortHeader label="Title" column="title" params={params} onChange={onChange} />
              <Th>Film</Th>
              <Th className="text-right">Takes</Th>
              <Th>Latest run per venue</Th>
              <SortHeader label="Updated" column="updatedAt" params={params} onChange={onChange} />
            </tr>
          </thead>
          <tbody aria-busy={tracks.isFetching || undefined}>
            {data.items.map((track) => (
              <tr key={track.id}>
                <Td className="font-medium">
                  <Link to={`/s/${studioId}/tracks/${track.id}`} className="text-tealdeep-600 underline">
                    {track.title}
                  </Link>
                </Td>
                <Td className="text-ink-600">{track.film || '—'}</Td>
                <Td className="text-right font-mono">{track.takes}</Td>
                <Td>
                  <VenueStates venues={track.venues} />
                </Td>
                <Td className="text-xs whitespace-nowrap text-ink-600">{formatDateTime(track.updatedAt)}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      ) : null}
      {data ? (
        <nav aria-label="Pages of tracks" className="flex items-center gap-3">
          <Button
            size="sm"
            disabled={params.page <= 1}
            onClick={() => onChange({ ...params, page: params.page - 1 })}
          >
            Previous
          </Button>
          <span className="font-mono text-xs text-ink-600">
            {pageRange(data.page, data.pageSize, data.total)}
          </span>
          <Button
            size="sm"
            disabled={params.page >= lastPage}
            onClick={() => onChange({ ...params, page: params.page + 1 })}
          >
            Next
          </Button>
        </nav>
      ) : null}
    </div>
  );
}
