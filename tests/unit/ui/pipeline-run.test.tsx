// @vitest-environment jsdom
// Run page against the API contract of GET /runs/:id (RunDetail with findings JSON, docs/motion-conventions.md
// section 7) and GET /runs/:id/series. uPlot draws on a canvas, which jsdom lacks: it is replaced by a
// recorder here, and the drawing itself is checked in the browser test.
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { unit } from 'mathjs';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { CHECK_SEVERITY } from '../../../shared/schemas/findings';
import type { RunDetail } from '../../../shared/schemas/pipeline';
import type { RunSeries } from '../../../shared/schemas/run-series';
import { bandChartData } from '../../../src/components/charts/band-chart';
import type { RunSpectra } from '../../../src/features/runs/api/get-run-spectra';
import { spectraLines } from '../../../src/features/runs/components/run-spectra';
import { RunView } from '../../../src/features/runs/components/run-view';
import { fakeApi, json, renderWithApp } from './harness';
import { MembershipProvider } from '../../../src/lib/membership';
import type { Membership } from '../../../shared/schemas/api';
import type { Role } from '../../../shared/schemas/roles';

const member = (roles: Role[]): Membership => ({
  studioId: 'a3c1e7b2-5d4f-4e8a-9b6c-1d2e3f4a5b6c',
  studioName: 'Lanternfish Studios',
  studioSlug: 'lanternfish',
  roles,
  venueIds: [],
});

const plots = vi.hoisted(
  () =>
    [] as {
      title: string | undefined;
      series: number;
      data: ArrayLike<number>[];
      /** Every x window the chart was asked to show, in order; `destroyed` once it is gone. */
      x: { min: number; max: number }[];
      destroyed: boolean;
    }[],
);

vi.mock('uplot', () => ({
  default: class {
    width: number;
    entry: (typeof plots)[number];
    constructor(opts: { width: number; series: unknown[] }, data: ArrayLike<number>[], el: HTMLElement) {
      this.width = opts.width;
      this.entry = { title: el.dataset.chart, series: opts.series.length, data, x: [], destroyed: false };
      plots.push(this.entry);
    }
    setScale(key: string, range: { min: number; max: number }) {
      if (key === 'x') this.entry.x.push(range);
    }
    setSize() {}
    redraw() {}
    destroy() {
      this.entry.destroyed = true;
    }
  },
}));

const STUDIO = 'a3c1e7b2-5d4f-4e8a-9b6c-1d2e3f4a5b6c';
const RUN = '3d4e5f6a-7b8c-4d9e-8f0a-2b3c4d5e6f7a';
const TRACK = '1b2c3d4e-5f6a-4b7c-8d9e-0f1a2b3c4d5e';

function makeRun(overrides: Partial<RunDetail> = {}): RunDetail {
  return {
    id: RUN,
    trackId: TRACK,
    takeId: '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f',
    takeNumber: 2,
    venueId: 'e7a5c1f6-9b8d-4c2e-8f0a-5b6c7d8e9f0a',
    venueName: 'Harbour Lights Dome',
    state: 'held_by_budget',
    progress: 100,
    failureReason: null,
    lastError: null,
    attempts: 1,
    stalled: false,
    silent_s: null,
    worstRatio: 1.014,
    worstCheck: 'stroke leg3',
    findingCount: 2,
    createdAt: '2026-12-01T10:00:00.000Z',
    finishedAt: '2026-12-01T10:00:09.000Z',
    trackTitle: 'Lantern Reef dive',
    take: {
      id: '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f',
      trackId: TRACK,
      number: 2,
      kind: 'vehicle',
      layout: 'vehicle',
      fileName: 'reef-dive.csv',
      sizeBytes: 120_000,
      sha256: 'b'.repeat(64),
      samples: 2001,
      duration_s: 20,
      uploadedVia: 'browser',
      filmSync: null,
      createdAt: '2026-12-01T09:59:00.000Z',
    },
    cueingVersion: { id: '4e5f6a7b-8c9d-4e0f-9a1b-3c4d5e6f7a8b', name: 'Dome washout', version: 3 },
    budgetVersion: { id: '5f6a7b8c-9d0e-4f1a-8b2c-4d5e6f7a8b9c', name: 'DEMO budget', version: 1 },
    // The findings example of docs/motion-conventions.md section 7, plus a comfort finding and two uses.
    result: {
      within: false,
      findings: [
        {
          check: 'stroke',
          severity: 'hard',
          subject: 'leg3',
          start_s: 12.31,
          end_s: 12.9,
          value: 2.312,
          limit: 2.28,
          ratio: 1.014,
        },
        {
          check: 'jerk',
          severity: 'comfort',
          subject: 'seat2',
          start_s: 3.5,
          end_s: 3.7,
          value: 26,
          limit: 25,
          ratio: 1.04,
        },
      ],
      uses: [
        { check: 'wrms', subject: 'z', ratio: 0.41 },
        { check: 'stroke', subject: 'leg3', ratio: 1.014, value: 0.3853, limit: 0.38 },
        { check: 'jerk', subject: 'seat2', ratio: 1.04 },
        { check: 'legSpeed', subject: 'leg1', ratio: 0.86 },
      ],
      notes: ['The Wk band above 50 Hz was left out at 100 Hz.'],
    },
    budgetIsDemo: true,
    files: [{ name: 'findings.json', sha256: 'c'.repeat(64), size_bytes: 812 }],
    params: {},
    filmSync: null,
    ...overrides,
  };
}

const band = (values: number[]) => ({ min: values.map((v) => v - 0.01), max: values.map((v) => v + 0.01) });
const SERIES: RunSeries = {
  rate_hz: 100,
  samples: 2001,
  time_s: [0, 10, 20],
  force: {
    x: { input: band([0, 0.5, 0]), cued: band([0, 0.3, 0]) },
    y: { input: band([0, 0, 0]), cued: band([0, 0, 0]) },
    z: { input: band([9.80665, 9.9, 9.80665]), cued: band([9.80665, 9.85, 9.80665]) },
  },
  pose: {
    x_m: band([0, 0.05, 0]),
    y_m: band([0, 0, 0]),
    z_m: band([0, 0.02, 0]),
    roll_rad: band([0, 0, 0]),
    pitch_rad: band([0, -0.03, 0]),
    yaw_rad: band([0, 0, 0]),
  },
  legs: [1, 2, 3, 4, 5, 6].map(() => band([1.9, 2.0, 1.9])),
  stroke: { min_m: 1.5, max_m: 2.3, margin_m: 0.02, mid_m: 1.9 },
};

beforeEach(() => {
  plots.length = 0;
  // uPlot (even mocked) may be asked about media queries by code around it; jsdom has no matchMedia.
  vi.stubGlobal('matchMedia', (query: string) => ({
    matches: false,
    media: query,
    addEventListener: () => undefined,
    removeEventListener: () => undefined,
  }));
});

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('run page', () => {
  it('lists the budget uses largest first with ratio, bar and severity', async () => {
    fakeApi({
      [`GET /api/studios/${STUDIO}/runs/${RUN}`]: () => json(makeRun()),
      [`GET /api/studios/${STUDIO}/runs/${RUN}/series`]: () => json(SERIES),
    });
    renderWithApp(<RunView studioId={STUDIO} runId={RUN} />);
    const table = await screen.findByRole('table', { name: 'Budget uses, largest first' });
    const rows = within(table).getAllByRole('row').slice(1);
    // People words for the check keys (shared/labels.ts), never the JSON keys themselves.
    expect(rows.map((row) => within(row).getAllByRole('cell')[0]!.textContent)).toEqual([
      'Rider jerk',
      'Leg stroke',
      'Leg speed',
      'Weighted r.m.s. acceleration',
    ]);
    expect(rows.map((row) => within(row).getAllByRole('cell')[1]!.textContent)).toEqual([
      'Seat 2',
      'Leg 3',
      'Leg 1',
      'z axis',
    ]);
    // Tier per check (docs/motion-conventions.md section 7): stroke and leg speed hard, jerk and
    // r.m.s. comfort. Only a use at or over its limit is coloured; 0.86 and 0.41 read in neutral ink.
    const tiers = rows.map((row) => within(row).getAllByRole('cell')[3]!);
    expect(tiers.map((cell) => cell.textContent)).toEqual([
      'Comfort limit',
      'Hard limit',
      'Hard limit',
      'Comfort limit',
    ]);
    expect(
      ['jerk', 'stroke', 'legSpeed', 'wrms'].map((c) => CHECK_SEVERITY[c as keyof typeof CHECK_SEVERITY]),
    ).toEqual(['comfort', 'hard', 'hard', 'comfort']);
    expect(tiers[1]!.firstElementChild).toHaveClass('text-stop-700');
    expect(tiers[2]!.firstElementChild).not.toHaveClass('text-stop-700');
    expect(tiers[2]!.firstElementChild).toHaveClass('text-ink-600');
    expect(tiers[3]!.firstElementChild).toHaveClass('text-ink-600');
    expect(within(rows[1]!).getByRole('meter')).toHaveAttribute('aria-valuenow', '1.014');
    // The worst value against its limit where the use carries them, a dash where it does not.
    expect(within(rows[1]!).getAllByRole('cell')[4]).toHaveTextContent('0.385 of 0.38 m');
    expect(within(rows[0]!).getAllByRole('cell')[4]).toHaveTextContent('—');

    const findings = screen.getByRole('table', { name: 'Findings' });
    const strokeRow = within(findings).getByText('Leg 3').closest('tr')!;
    expect(strokeRow).toHaveTextContent('12.31–12.90');
    expect(strokeRow).toHaveTextContent('2.312 m');
    expect(strokeRow).toHaveTextContent('2.28 m');
    expect(screen.getByText('Over budget')).toBeInTheDocument();
    expect(screen.getByText('Checked against the DEMO budget.')).toBeInTheDocument();
    expect(screen.getByText('The Wk band above 50 Hz was left out at 100 Hz.')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'findings.json' })).toHaveAttribute(
      'href',
      `/api/studios/${STUDIO}/runs/${RUN}/files/findings.json`,
    );
    expect(screen.getByRole('note', { name: 'Run caution' })).toHaveTextContent(
      "a qualified person's sign-off",
    );

    // Three force charts, two pose charts and the legs chart, each band as a min and a max series.
    await waitFor(() => expect(plots.filter((p) => !p.destroyed)).toHaveLength(6));
    const legs = plots.find((p) => p.title === 'Leg lengths inside the stroke band')!;
    expect(legs.series).toBe(1 + 2 * 6);
  });

  it('brings every chart to a finding chosen in the list, reads out its numbers, and shows the whole take again', async () => {
    fakeApi({
      [`GET /api/studios/${STUDIO}/runs/${RUN}`]: () => json(makeRun()),
      [`GET /api/studios/${STUDIO}/runs/${RUN}/series`]: () => json(SERIES),
    });
    renderWithApp(<RunView studioId={STUDIO} runId={RUN} />);
    await waitFor(() => expect(plots.filter((p) => !p.destroyed)).toHaveLength(6));
    const live = () => plots.filter((p) => !p.destroyed);
    // At first every chart shows the whole take: the series' first to last bucket.
    for (const p of live()) expect(p.x.at(-1)).toEqual({ min: 0, max: 20 });
    const findings = screen.getByRole('table', { name: 'Findings' });
    fireEvent.click(within(findings).getByRole('button', { name: /^Show Leg stroke, Leg 3/ }));
    // Stroke on leg 3 from 12.31 s to 12.90 s: 0.59 s long, so 0.5 s of context each side.
    await waitFor(() => {
      for (const p of live()) {
        expect(p.x.at(-1)!.min).toBeCloseTo(11.81, 9);
        expect(p.x.at(-1)!.max).toBeCloseTo(13.4, 9);
      }
    });
    // The window moves on the charts drawn; none is built again for it.
    expect(plots).toHaveLength(6);
    const readout = screen.getByTestId('finding-readout');
    expect(readout).toHaveTextContent('Hard limit');
    expect(within(readout).getByText('2.312 m')).toBeInTheDocument();
    expect(within(readout).getByText('2.28 m')).toBeInTheDocument();
    expect(readout).toHaveTextContent('1.014 ×');
    expect(readout).toHaveTextContent('12.310–12.900 s');
    // The timeline marks the same finding as pressed.
    const marks = within(screen.getByTestId('take-timeline')).getAllByRole('button');
    expect(marks.filter((m) => m.getAttribute('aria-pressed') === 'true')).toHaveLength(1);
    expect(marks.find((m) => m.getAttribute('aria-pressed') === 'true')).toHaveAccessibleName(
      /^Leg stroke, Leg 3, hard limit, 12\.31–12\.90 s/,
    );
    fireEvent.click(screen.getByRole('button', { name: 'Show whole take' }));
    await waitFor(() => {
      for (const p of live()) expect(p.x.at(-1)).toEqual({ min: 0, max: 20 });
    });
    expect(screen.getByTestId('finding-readout')).toHaveTextContent('No finding selected');
  });

  it('shows the failure reason in a red panel and draws no charts for a failed run', async () => {
    const reason = 'reef-dive.csv line 40, column 2 (fx_mps2): not a number: "--"';
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/runs/${RUN}`]: () =>
        json(
          makeRun({
            state: 'failed',
            failureReason: reason,
            result: null,
            worstRatio: null,
            worstCheck: null,
            findingCount: null,
            files: [],
            budgetIsDemo: false,
          }),
        ),
    });
    renderWithApp(
      <MembershipProvider membership={member(['safety_reviewer'])}>
        <RunView studioId={STUDIO} runId={RUN} />
      </MembershipProvider>,
    );
    const panel = await screen.findByRole('alert');
    expect(panel).toHaveTextContent('This run failed.');
    expect(panel).toHaveTextContent(reason);
    // A reviewer may not ask for runs, so is not offered to ask again.
    expect(screen.queryByRole('button', { name: 'Ask for this run again' })).not.toBeInTheDocument();
    expect(screen.queryByRole('table', { name: 'Budget uses, largest first' })).not.toBeInTheDocument();
    expect(screen.queryByText('Checked against the DEMO budget.')).not.toBeInTheDocument();
    expect(calls.some((c) => c.path.endsWith('/series'))).toBe(false);
    expect(plots).toHaveLength(0);
  });

  it('shows a stalled run with how long its worker has been silent, and lets a producer ask again', async () => {
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/runs/${RUN}`]: () =>
        json(
          makeRun({
            state: 'cueing',
            progress: 30,
            stalled: true,
            silent_s: 95,
            result: null,
            worstRatio: null,
            worstCheck: null,
            findingCount: null,
            files: [],
          }),
        ),
      [`POST /api/studios/${STUDIO}/runs/${RUN}/requeue`]: () =>
        json({ ...makeRun({ state: 'queued', progress: 0 }) }, 202),
    });
    renderWithApp(
      <MembershipProvider membership={member(['producer'])}>
        <RunView studioId={STUDIO} runId={RUN} />
      </MembershipProvider>,
    );
    const panel = await screen.findByRole('alert');
    expect(panel).toHaveTextContent('Stalled at 30 %: no word from its worker for 95 s.');
    fireEvent.click(within(panel).getByRole('button', { name: 'Ask for this run again' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST')).toBe(true));
    expect(calls.find((c) => c.method === 'POST')!.path).toBe(`/api/studios/${STUDIO}/runs/${RUN}/requeue`);
  });

  it('shows live progress while cueing and does not ask for the series yet', async () => {
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/runs/${RUN}`]: () =>
        json(
          makeRun({
            state: 'cueing',
            progress: 42,
            result: null,
            worstRatio: null,
            worstCheck: null,
            files: [],
          }),
        ),
    });
    renderWithApp(<RunView studioId={STUDIO} runId={RUN} />);
    expect(await screen.findByRole('progressbar', { name: 'Run progress' })).toHaveAttribute(
      'aria-valuenow',
      '42',
    );
    expect(calls.some((c) => c.path.endsWith('/series'))).toBe(false);
  });
});

function makeSpectra(): RunSpectra {
  const df_hz = 0.1;
  const psd = (peak_hz: number) =>
    Array.from({ length: 501 }, (_, k) => (Math.abs(k * df_hz - peak_hz) < 0.05 ? 2 : 0));
  const axis = (peak_hz: number) => ({
    seat: 'seat1',
    totalPower_mps2sq: 0.2,
    bandPower_mps2sq: 0.2,
    bandShare: 1,
    psd: psd(peak_hz),
  });
  return {
    method: 'Welch',
    unit: '(m/s^2)^2/Hz',
    rate_hz: 100,
    segment_n: 1000,
    segments: 3,
    df_hz,
    band: { low_hz: 0.1, high_hz: 0.5, note: 'The band where motion sickness is most provoked.' },
    axes: { x: axis(0.2), y: axis(0.3), z: axis(1) },
  };
}

describe('spectra', () => {
  it('draws the spectra file as a seventh chart when the run has one', async () => {
    fakeApi({
      [`GET /api/studios/${STUDIO}/runs/${RUN}`]: () =>
        json(makeRun({ files: [{ name: 'spectra.json', sha256: 'd'.repeat(64), size_bytes: 9000 }] })),
      [`GET /api/studios/${STUDIO}/runs/${RUN}/series`]: () => json(SERIES),
      [`GET /api/studios/${STUDIO}/runs/${RUN}/files/spectra.json`]: () => json(makeSpectra()),
    });
    renderWithApp(<RunView studioId={STUDIO} runId={RUN} />);
    expect(await screen.findByText(/Share of power in that band: x 100 %/)).toBeInTheDocument();
    await waitFor(() => expect(plots).toHaveLength(7));
    const spectrum = plots.find((p) => p.title === 'Power spectral density up to 5 Hz')!;
    expect(spectrum.series).toBe(1 + 2 * 3);
  });

  it('puts bin k at k times df_hz up to 5 Hz and keeps every value above 0 for the log axis', () => {
    const { f_hz, bands } = spectraLines(makeSpectra());
    // spectra.json's own note: bin k lies at k * df_hz; 0 to 5 Hz in 0.1 Hz steps is 51 bins.
    expect(f_hz).toHaveLength(51);
    expect(f_hz[50]).toBeCloseTo(5, 12);
    for (const band of bands) {
      expect(Math.min(...band.min)).toBeGreaterThan(0);
      expect(Math.max(...band.min)).toBe(2);
    }
  });
});

describe('chart data for display', () => {
  it('converts pose offsets to mm and deg only for display, as mathjs converts the same units', () => {
    const time_s = [0, 1];
    const metres = { label: 'x', color: '#000000', min: [-0.0125, 0.2], max: [0.0125, 0.25] };
    const radians = { label: 'pitch', color: '#000000', min: [-0.1, 0.3], max: [0.1, 0.35] };
    const mm = bandChartData(time_s, [metres], 1000);
    const deg = bandChartData(time_s, [radians], 180 / Math.PI);
    // mathjs unit conversion is the independent reference for m -> mm and rad -> deg.
    for (let i = 0; i < 2; i++) {
      expect(mm[1]![i]).toBeCloseTo(unit(metres.min[i]!, 'm').toNumber('mm'), 9);
      expect(mm[2]![i]).toBeCloseTo(unit(metres.max[i]!, 'm').toNumber('mm'), 9);
      expect(deg[1]![i]).toBeCloseTo(unit(radians.min[i]!, 'rad').toNumber('deg'), 9);
      expect(deg[2]![i]).toBeCloseTo(unit(radians.max[i]!, 'rad').toNumber('deg'), 9);
    }
    expect(Array.from(mm[0]!)).toEqual(time_s);
  });
});

describe('film sync on the run page', () => {
  const SYNC = { frameRate: '25' as const, startTimecode: '10:00:00:00', offset_frames: 0 };
  const synced = (offset = 0) =>
    makeRun({
      take: { ...makeRun().take, filmSync: SYNC },
      params: { filmOffset_frames: offset },
      filmSync: { ...SYNC, offset_frames: offset },
    });

  it('shows each finding span as timecode beside the seconds', async () => {
    fakeApi({
      [`GET /api/studios/${STUDIO}/runs/${RUN}`]: () => json(synced()),
      [`GET /api/studios/${STUDIO}/runs/${RUN}/series`]: () => json(SERIES),
    });
    renderWithApp(
      <MembershipProvider membership={member(['safety_reviewer'])}>
        <RunView studioId={STUDIO} runId={RUN} />
      </MembershipProvider>,
    );
    const table = await screen.findByRole('table', { name: 'Findings' });
    // 3.5 s at 25 fps is frame 87.5 -> frame 87 on screen = 10:00:03:12; 12.31 s -> frame 307 = 10:00:12:07.
    expect(table).toHaveTextContent('10:00:03:12–10:00:03:17');
    expect(table).toHaveTextContent('10:00:12:07–10:00:12:22');
    expect(screen.getByLabelText('Film sync')).toHaveTextContent('25 fps, starts 10:00:00:00');
    // A reviewer sees the sync but not the nudge.
    expect(screen.queryByRole('button', { name: 'Motion later' })).not.toBeInTheDocument();
    expect(await screen.findByTestId('cursor-readout')).toHaveTextContent('TC 10:00:00:00');
  });

  it('lets a producer nudge the motion later: it asks for the run with the new offset', async () => {
    const NEXT = '9d4e5f6a-7b8c-4d9e-8f0a-2b3c4d5e6f7b';
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/runs/${RUN}`]: () => json(synced(4)),
      [`GET /api/studios/${STUDIO}/runs/${RUN}/series`]: () => json(SERIES),
      // The summary schema keeps only a summary's fields of this detail.
      [`POST /api/studios/${STUDIO}/runs/${RUN}/film-offset`]: () =>
        json({ ...synced(6), id: NEXT, state: 'queued' }, 201),
      [`GET /api/studios/${STUDIO}/runs/${NEXT}`]: () => json({ ...synced(6), id: NEXT }),
    });
    renderWithApp(
      <MembershipProvider membership={member(['producer'])}>
        <RunView studioId={STUDIO} runId={RUN} />
      </MembershipProvider>,
    );
    expect(await screen.findByLabelText('Film sync')).toHaveTextContent('motion +4 frames');
    fireEvent.change(screen.getByLabelText('Nudge by (frames)'), { target: { value: '2' } });
    fireEvent.click(screen.getByRole('button', { name: 'Motion later' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST')).toBe(true));
    const post = calls.find((c) => c.method === 'POST')!;
    expect(post.body).toEqual({ offset_frames: 6 });
  });
});

describe('touch-up on the run page', () => {
  it('lists the touch-up settings and draws each take column before and after it', async () => {
    const touchup = { offset_s: 0.5, gain: { fx: 0.5 }, smoothing_hz: { wz: 2 }, fadeIn_s: 1, fadeOut_s: 0 };
    const columns = ['fx_mps2', 'wz_radps'].map((name) => ({
      name,
      before: band([0, 1, 0]),
      after: band([0, 0.5, 0]),
    }));
    fakeApi({
      [`GET /api/studios/${STUDIO}/runs/${RUN}`]: () => json(makeRun({ params: { touchup } })),
      [`GET /api/studios/${STUDIO}/runs/${RUN}/series`]: () => json({ ...SERIES, touchup: { columns } }),
    });
    renderWithApp(<RunView studioId={STUDIO} runId={RUN} />);
    const summary = await screen.findByLabelText('Touch-up');
    expect(summary).toHaveTextContent('Offset +0.5 s');
    expect(summary).toHaveTextContent('Gain: fx × 0.5');
    expect(summary).toHaveTextContent('Smoothing (zero-phase low-pass): wz 2 Hz');
    expect(summary).toHaveTextContent('Fade in over 1 s');
    expect(summary).not.toHaveTextContent('Fade out');
    // Six motion charts plus one per touched-up column, each with the two bands (x + 2 x 2 series).
    await waitFor(() => expect(plots).toHaveLength(8));
    const wz = plots.find((p) => p.title === 'Touch-up wz')!;
    expect(wz.series).toBe(5);
    // The yaw rate shows in deg/s: 0.5 rad/s is 28.6479 deg/s (180/pi, as mathjs converts it).
    const shown = (wz.data as Float64Array[])[4]![1]!;
    expect(shown).toBeCloseTo(unit(0.51, 'rad/s').toNumber('deg/s'), 9);
  });
});
