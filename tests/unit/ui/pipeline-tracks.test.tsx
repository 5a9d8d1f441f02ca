// @vitest-environment jsdom
// Tracks table against the API contract of GET /api/studios/:id/tracks: paging, sorting and filters
// are the server's, so every change in the table must reach the query string, and the pager text
// comes from the server's `total`, `page` and `pageSize`.
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { useState } from 'react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { TrackPage, TrackSummary } from '../../../shared/schemas/pipeline';
import { TRACKS_PAGE_SIZE, tracksParamsFrom } from '../../../src/app/routes/tracks';
import type { TracksParams } from '../../../src/features/tracks/api/get-tracks';
import { TracksTable, pageRange } from '../../../src/features/tracks/components/tracks-table';
import { fakeApi, json, renderWithApp, FAKE_IDS, FAKE_VENUES } from './harness';
import type { RecordedCall } from './harness';

const STUDIO = FAKE_IDS.studio;
const DOME = FAKE_IDS.dome;
const ARCADE = FAKE_IDS.arcade;
const VENUES = FAKE_VENUES;
const TOTAL = 73;

function track(n: number): TrackSummary {
  return {
    id: `0a1b2c3d-4e5f-4a6b-8c7d-${String(n).padStart(12, '0')}`,
    title: `Lantern Run ${n}`,
    film: 'The Lantern Reef (fictional)',
    takes: 2,
    createdAt: '2026-11-01T10:00:00.000Z',
    updatedAt: '2026-11-20T10:00:00.000Z',
    venues: [
      { venueId: DOME, venueName: 'Harbour Lights Dome', state: 'held_by_budget', worstRatio: 1.12 },
      { venueId: ARCADE, venueName: 'Tidewater Arcade', state: 'awaiting_review', worstRatio: 0.64 },
    ],
  };
}

/** A server that pages a list of 73 tracks the way the API contract says. */
function tracksServer(call: RecordedCall) {
  const query = new URLSearchParams(call.search);
  const page = Number(query.get('page'));
  const pageSize = Number(query.get('pageSize'));
  const items: TrackSummary[] = [];
  for (let i = (page - 1) * pageSize + 1; i <= Math.min(page * pageSize, TOTAL); i++) items.push(track(i));
  const answer: TrackPage = { items, total: TOTAL, page, pageSize };
  return json(answer);
}

function Harness() {
  const [params, setParams] = useState<TracksParams>({
    page: 1,
    pageSize: 20,
    sort: 'updatedAt',
    dir: 'desc',
  });
  return <TracksTable studioId={STUDIO} params={params} onChange={setParams} />;
}

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function trackCalls(calls: RecordedCall[]): URLSearchParams[] {
  // WHATWG URLSearchParams reads the query the way the server's parser will.
  return calls
    .filter((c) => c.path === `/api/studios/${STUDIO}/tracks`)
    .map((c) => new URLSearchParams(c.search));
}

describe('tracks table', () => {
  it('asks the server for the first page, newest first, and shows the range it answered', async () => {
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/tracks`]: tracksServer,
      [`GET /api/studios/${STUDIO}/venues`]: () => json(VENUES),
    });
    renderWithApp(<Harness />);
    expect(await screen.findByText('1–20 of 73')).toBeInTheDocument();
    const first = trackCalls(calls)[0]!;
    expect(Object.fromEntries(first)).toEqual({ page: '1', pageSize: '20', sort: 'updatedAt', dir: 'desc' });
  });

  it('sends sort, direction, page, state and venue filters and the search text to the server', async () => {
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/tracks`]: tracksServer,
      [`GET /api/studios/${STUDIO}/venues`]: () => json(VENUES),
    });
    renderWithApp(<Harness />);
    await screen.findByText('1–20 of 73');

    fireEvent.click(screen.getByRole('button', { name: 'Next' }));
    expect(await screen.findByText('21–40 of 73')).toBeInTheDocument();
    expect(trackCalls(calls).at(-1)!.get('page')).toBe('2');

    // Sorting starts again from the first page; a title sort starts A to Z.
    fireEvent.click(screen.getByRole('button', { name: /Title/ }));
    await waitFor(() => expect(trackCalls(calls).at(-1)!.get('sort')).toBe('title'));
    expect(trackCalls(calls).at(-1)!.get('dir')).toBe('asc');
    expect(trackCalls(calls).at(-1)!.get('page')).toBe('1');
    expect(screen.getByRole('columnheader', { name: /Title/ })).toHaveAttribute('aria-sort', 'ascending');
    fireEvent.click(screen.getByRole('button', { name: /Title/ }));
    await waitFor(() => expect(trackCalls(calls).at(-1)!.get('dir')).toBe('desc'));

    fireEvent.change(screen.getByRole('combobox', { name: 'Run state' }), {
      target: { value: 'held_by_budget' },
    });
    await waitFor(() => expect(trackCalls(calls).at(-1)!.get('state')).toBe('held_by_budget'));
    await screen.findByRole('option', { name: 'Tidewater Arcade' });
    fireEvent.change(screen.getByRole('combobox', { name: 'Venue' }), { target: { value: ARCADE } });
    await waitFor(() => expect(trackCalls(calls).at(-1)!.get('venueId')).toBe(ARCADE));

    fireEvent.change(screen.getByRole('searchbox', { name: 'Title or film contains' }), {
      target: { value: ' reef ' },
    });
    fireEvent.click(screen.getByRole('button', { name: 'Search' }));
    await waitFor(() => expect(trackCalls(calls).at(-1)!.get('q')).toBe('reef'));
    const last = Object.fromEntries(trackCalls(calls).at(-1)!);
    expect(last).toEqual({
      page: '1',
      pageSize: '20',
      sort: 'title',
      dir: 'desc',
      state: 'held_by_budget',
      venueId: ARCADE,
      q: 'reef',
    });
  });

  it('shows the latest state per venue with the worst use ratio as a bar', async () => {
    fakeApi({
      [`GET /api/studios/${STUDIO}/tracks`]: tracksServer,
      [`GET /api/studios/${STUDIO}/venues`]: () => json(VENUES),
    });
    renderWithApp(<Harness />);
    const table = await screen.findByRole('table', { name: 'Tracks' });
    const row = within(table).getByRole('link', { name: 'Lantern Run 1' }).closest('tr')!;
    expect(within(row).getByText('Held by budget')).toBeInTheDocument();
    expect(within(row).getByText('Awaiting review')).toBeInTheDocument();
    const meters = within(row).getAllByRole('meter');
    expect(meters.map((m) => m.getAttribute('aria-valuenow'))).toEqual(['1.12', '0.64']);
    // docs/motion-conventions.md section 6: a run is within budget while every ratio is below 1, so 1.12 reads as over.
    expect(within(row).getByText('1.12')).toHaveClass('text-stop-700');
    expect(within(row).getByText('0.64')).toHaveClass('text-ink-800');
  });
});

describe('page range text', () => {
  it('counts rows from 1 and stops at the total', () => {
    // Plain arithmetic: page 3 of 20 rows holds rows 41 to 60; the last page of 73 ends at 73.
    expect(pageRange(3, 20, 73)).toBe('41–60 of 73');
    expect(pageRange(4, 20, 73)).toBe('61–73 of 73');
    expect(pageRange(1, 20, 0)).toBe('0 of 0');
  });
});

describe('tracks address', () => {
  it('reads sort, filters and page from the address and falls back to the defaults for anything unreadable', () => {
    expect(
      tracksParamsFrom(new URLSearchParams(`page=3&sort=title&dir=asc&state=held&venue=${DOME}&q=reef`)),
    ).toEqual({
      page: 3,
      pageSize: TRACKS_PAGE_SIZE,
      sort: 'title',
      dir: 'asc',
      state: 'held',
      venueId: DOME,
      q: 'reef',
    });
    // The API contract's defaults: page 1, newest update first, no filters.
    expect(tracksParamsFrom(new URLSearchParams('page=-2&sort=size&dir=up&state=lost'))).toEqual({
      page: 1,
      pageSize: TRACKS_PAGE_SIZE,
      sort: 'updatedAt',
      dir: 'desc',
      state: undefined,
      venueId: undefined,
      q: undefined,
    });
  });
});
