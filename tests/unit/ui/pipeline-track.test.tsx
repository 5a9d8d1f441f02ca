// @vitest-environment jsdom
// Track page against the API contract: GET /tracks/:id lists takes and runs, the page asks again every
// second while a run is queued or cueing, and POST /takes/:id/runs takes `{ venueIds }` and answers
// 400 with the reason when a venue cannot run the take.
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Me } from '../../../shared/schemas/api';
import type { RunSummary, TrackDetail } from '../../../shared/schemas/pipeline';
import type { Role } from '../../../shared/schemas/roles';
import { TrackRoute } from '../../../src/app/routes/track';
import { StudioOutlet } from '../../../src/app/routes/studio-layout';
import type { StudioContext } from '../../../src/app/routes/studio-layout';
import { fakeApi, json, renderRoutes, FAKE_IDS, FAKE_VENUES } from './harness';

const STUDIO = FAKE_IDS.studio;
const TRACK = '1b2c3d4e-5f6a-4b7c-8d9e-0f1a2b3c4d5e';
const TAKE = '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f';
const DOME = FAKE_IDS.dome;
const ARCADE = FAKE_IDS.arcade;
const VENUES = FAKE_VENUES;

function run(overrides: Partial<RunSummary>): RunSummary {
  return {
    id: '3d4e5f6a-7b8c-4d9e-8f0a-2b3c4d5e6f7a',
    trackId: TRACK,
    takeId: TAKE,
    takeNumber: 1,
    venueId: DOME,
    venueName: 'Harbour Lights Dome',
    state: 'cueing',
    progress: 40,
    failureReason: null,
    lastError: null,
    attempts: 1,
    stalled: false,
    silent_s: null,
    worstRatio: null,
    worstCheck: null,
    findingCount: null,
    createdAt: '2026-12-01T10:00:00.000Z',
    finishedAt: null,
    ...overrides,
  };
}

function track(runs: RunSummary[]): TrackDetail {
  return {
    id: TRACK,
    title: 'Lantern Reef dive',
    film: 'The Lantern Reef (fictional)',
    createdAt: '2026-12-01T09:00:00.000Z',
    takes: [
      {
        id: TAKE,
        trackId: TRACK,
        number: 1,
        kind: 'vehicle',
        layout: 'vehicle',
        fileName: 'reef-dive.csv',
        sizeBytes: 60_300,
        sha256: '10b9f55b2047'.padEnd(64, '0'),
        samples: 2001,
        duration_s: 20,
        uploadedVia: 'token',
        filmSync: null,
        createdAt: '2026-12-01T09:30:00.000Z',
      },
    ],
    runs,
  };
}

function renderTrackPage(roles: Role[]) {
  const context: StudioContext = {
    me: {
      user: {
        id: 'c5e3a9d4-7f6b-4a0c-9d8e-3f4a5b6c7d8e',
        email: 'pia.producer@lanternfish.example',
        name: 'Pia Okafor',
      },
      memberships: [],
    } satisfies Me,
    membership: {
      studioId: STUDIO,
      studioName: 'Lanternfish Studios',
      studioSlug: 'lanternfish',
      roles,
      venueIds: [],
    },
  };
  return renderRoutes(
    [
      {
        path: '/s/:studioId',
        element: <StudioOutlet context={context} />,
        children: [{ path: 'tracks/:trackId', element: <TrackRoute /> }],
      },
    ],
    `/s/${STUDIO}/tracks/${TRACK}`,
  );
}

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('track page', () => {
  it('shows the takes and asks again every second until the running cue run has finished', async () => {
    let asked = 0;
    fakeApi({
      [`GET /api/studios/${STUDIO}/tracks/${TRACK}`]: () => {
        asked += 1;
        return json(
          track([
            asked < 2
              ? run({})
              : run({
                  state: 'awaiting_review',
                  progress: 100,
                  worstRatio: 0.83,
                  worstCheck: 'stroke leg4',
                  findingCount: 0,
                }),
          ]),
        );
      },
      [`GET /api/studios/${STUDIO}/venues`]: () => json(VENUES),
    });
    renderTrackPage(['producer']);
    const takes = await screen.findByRole('table', { name: 'Takes' });
    const row = within(takes).getByText('reef-dive.csv').closest('tr')!;
    expect(row).toHaveTextContent('2,001');
    expect(row).toHaveTextContent('20.0 s');
    expect(row).toHaveTextContent('60.3 kB');
    expect(row).toHaveTextContent('10b9f55b2047');
    expect(row).toHaveTextContent('via API token');
    expect(await screen.findByRole('progressbar', { name: /Progress of run for take 1/ })).toHaveAttribute(
      'aria-valuenow',
      '40',
    );

    const runs = await screen.findByRole('table', { name: 'Runs at Harbour Lights Dome' }, { timeout: 4000 });
    await waitFor(() => expect(within(runs).getByText('Awaiting review')).toBeInTheDocument(), {
      timeout: 4000,
    });
    expect(within(runs).getByText('Leg stroke, Leg 4')).toBeInTheDocument();
    const settled = asked;
    // Nothing runs any more, so the page stops asking.
    await new Promise((resolve) => setTimeout(resolve, 1500));
    expect(asked).toBe(settled);
  });

  it('queues runs for the chosen venues and shows why the server refused one', async () => {
    const reason = 'Tidewater Arcade has no cueing profile yet; a motion engineer must choose one.';
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/tracks/${TRACK}`]: () => json(track([])),
      [`GET /api/studios/${STUDIO}/venues`]: () => json(VENUES),
      [`POST /api/studios/${STUDIO}/takes/${TAKE}/runs`]: () => json({ error: reason }, 400),
    });
    renderTrackPage(['motion_engineer']);
    fireEvent.click(await screen.findByRole('button', { name: 'Cue for venues' }));
    const form = await screen.findByRole('form', { name: 'Cue take 1 for venues' });
    fireEvent.click(within(form).getByRole('checkbox', { name: 'Harbour Lights Dome' }));
    fireEvent.click(within(form).getByRole('checkbox', { name: 'Tidewater Arcade' }));
    fireEvent.click(within(form).getByRole('button', { name: 'Queue cue runs' }));
    expect(await within(form).findByRole('alert')).toHaveTextContent(reason);
    expect(calls.find((c) => c.method === 'POST')?.body).toEqual({ venueIds: [DOME, ARCADE] });
    // A motion engineer queues runs but does not upload takes (producers do).
    expect(screen.queryByRole('form', { name: 'Upload a take' })).not.toBeInTheDocument();
  });

  it('sends the touch-up typed in the cue form with the request, and refuses a bad one before sending', async () => {
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/tracks/${TRACK}`]: () => json(track([])),
      [`GET /api/studios/${STUDIO}/venues`]: () => json(VENUES),
      [`POST /api/studios/${STUDIO}/takes/${TAKE}/runs`]: () => json([], 201),
    });
    renderTrackPage(['producer']);
    fireEvent.click(await screen.findByRole('button', { name: 'Cue for venues' }));
    const form = await screen.findByRole('form', { name: 'Cue take 1 for venues' });
    fireEvent.click(within(form).getByRole('checkbox', { name: 'Harbour Lights Dome' }));
    // A trim out before the trim in is refused by the shared schema, with the field named.
    fireEvent.change(within(form).getByLabelText('Trim in (s)'), { target: { value: '5' } });
    fireEvent.change(within(form).getByLabelText('Trim out (s)'), { target: { value: '2' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Queue cue runs' }));
    expect(
      await within(form).findByText(/trimOut_s: trimOut_s must be later than trimIn_s/),
    ).toBeInTheDocument();
    expect(calls.some((c) => c.method === 'POST')).toBe(false);
    fireEvent.change(within(form).getByLabelText('Trim out (s)'), { target: { value: '20' } });
    fireEvent.change(within(form).getByLabelText('fx gain'), { target: { value: '0.5' } });
    fireEvent.change(within(form).getByLabelText('wz smoothing (Hz)'), { target: { value: '2' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Queue cue runs' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST')).toBe(true));
    expect(calls.find((c) => c.method === 'POST')?.body).toEqual({
      venueIds: [DOME],
      touchup: {
        offset_s: 0,
        trimIn_s: 5,
        trimOut_s: 20,
        gain: { fx: 0.5 },
        smoothing_hz: { wz: 2 },
        fadeIn_s: 0,
        fadeOut_s: 0,
      },
    });
  });
});
