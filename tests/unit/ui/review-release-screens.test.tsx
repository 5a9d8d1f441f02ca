// @vitest-environment jsdom
// The decision panel, the role homes' lists and the release page against the API contract in
// shared/schemas/review.ts, release.ts and homes.ts (every fixture below is parsed with those schemas
// first, so a fixture the server could not send fails here), and against the IANA time zone rules
// for the venue times (Europe/Lisbon is UTC+0 and America/Halifax UTC-4 in December).
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import type { ReactElement } from 'react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Membership } from '../../../shared/schemas/api';
import {
  engineerHomeSchema,
  operatorHomeSchema,
  producerHomeSchema,
  reviewQueueSchema,
} from '../../../shared/schemas/homes';
import type { HomeRun } from '../../../shared/schemas/homes';
import { releaseSchema } from '../../../shared/schemas/release';
import type { Release } from '../../../shared/schemas/release';
import { reviewedRunSchema, runDecisionSchema } from '../../../shared/schemas/review';
import type { RunDecision } from '../../../shared/schemas/review';
import type { Role } from '../../../shared/schemas/roles';
import { CAUTION_TEXT } from '../../../src/components/layout/caution-strip';
import {
  OperatorReleases,
  ProducerAttention,
  ReviewQueueList,
} from '../../../src/features/homes/components/role-lists';
import { ReleaseView } from '../../../src/features/releases/components/release-view';
import { ReleasesList } from '../../../src/features/releases/components/releases-list';
import { DecisionPanel } from '../../../src/features/review/components/decision-panel';
import { MembershipProvider } from '../../../src/lib/membership';
import { FAKE_IDS, FAKE_VENUES, fakeApi, json, renderWithApp } from './harness';

const STUDIO = FAKE_IDS.studio;
const RUN = '3d4e5f6a-7b8c-4d9e-8f0a-2b3c4d5e6f7a';
const TRACK = '1b2c3d4e-5f6a-4b7c-8d9e-0f1a2b3c4d5e';
const RELEASE = '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d';
const NEWER = '0a1b2c3d-4e5f-4a6b-9c7d-8e9f0a1b2c3d';
const PERSON = (name: string) => ({
  id: 'c5e3a9d4-7f6b-4a0c-9d8e-3f4a5b6c7d8e',
  name,
  email: `${name.split(' ')[0]!.toLowerCase()}@lanternfish.example`,
});
const allowed = { allowed: true, reasonRequired: false, why: null };

function decision(overrides: Partial<RunDecision> = {}): RunDecision {
  return runDecisionSchema.parse({
    runId: RUN,
    state: 'awaiting_review',
    hardFindings: 0,
    comfortFindings: 2,
    reviews: [],
    releaseIds: [],
    actions: {
      clear: { allowed: true, reasonRequired: true, why: null },
      hold: { allowed: true, reasonRequired: true, why: null },
      release: { allowed: false, reasonRequired: false, why: 'Only a cleared run can be released.' },
    },
    ...overrides,
  });
}

function release(overrides: Partial<Release> = {}): Release {
  return releaseSchema.parse({
    id: RELEASE,
    runId: RUN,
    trackId: TRACK,
    trackTitle: 'Lantern Reef dive',
    takeNumber: 3,
    venueId: FAKE_IDS.arcade,
    venueName: 'Tidewater Arcade',
    state: 'ready',
    failureReason: null,
    releasedBy: PERSON('Priya Producer'),
    releasedAt: '2026-12-01T14:30:00.000Z',
    builtAt: '2026-12-01T14:30:05.000Z',
    packageName: 'lantern-reef-dive-take3-tidewater-arcade.zip',
    packageSha256: 'a'.repeat(64),
    packageSizeBytes: 2_345_678,
    files: [
      { name: 'legs.csv', sha256: 'b'.repeat(64), size_bytes: 1_200_000 },
      { name: 'report.html', sha256: 'c'.repeat(64), size_bytes: 81_234 },
    ],
    withdrawnAt: null,
    withdrawnBy: null,
    withdrawReason: null,
    supersededAt: null,
    supersededById: null,
    acknowledgements: [],
    problems: [],
    downloads: 2,
    lastDownloadAt: '2026-12-01T15:00:00.000Z',
    ...overrides,
  });
}

function homeRun(overrides: Partial<HomeRun> = {}): HomeRun {
  return {
    id: RUN,
    trackId: TRACK,
    trackTitle: 'Lantern Reef dive',
    takeNumber: 3,
    venueId: FAKE_IDS.dome,
    venueName: 'Harbour Lights Dome',
    state: 'held_by_budget',
    hardFindings: 1,
    comfortFindings: 0,
    worstRatio: 1.08,
    worstCheck: 'stroke leg4',
    finishedAt: '2026-12-01T10:00:00.000Z',
    lastReview: null,
    ...overrides,
  };
}

function inStudio(roles: Role[], element: ReactElement) {
  const membership: Membership = {
    studioId: STUDIO,
    studioName: 'Lanternfish Studios',
    studioSlug: 'lanternfish',
    roles,
    venueIds: roles.includes('venue_operator') ? [FAKE_IDS.arcade] : [],
  };
  return renderWithApp(<MembershipProvider membership={membership}>{element}</MembershipProvider>);
}

const base = `/api/studios/${STUDIO}`;

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('decision panel', () => {
  it('shows the verdict, the counts and every review with the venue time and budget version', async () => {
    fakeApi({
      [`GET ${base}/venues`]: () => json(FAKE_VENUES),
      [`GET ${base}/runs/${RUN}/decision`]: () =>
        json(
          decision({
            state: 'held',
            reviews: [
              {
                id: '5e6f7a8b-9c0d-4e1f-8a2b-3c4d5e6f7a8b',
                runId: RUN,
                decision: 'hold',
                reason: 'Heave bump at 41 s too sharp for seat 3.',
                reviewer: PERSON('Rosa Reviewer'),
                budgetVersion: { id: 'b1', name: 'Dome budget', version: 4 },
                fromState: 'awaiting_review',
                toState: 'held',
                createdAt: '2026-12-01T10:00:00.000Z',
              },
            ],
          }),
        ),
    });
    renderWithApp(<DecisionPanel studioId={STUDIO} runId={RUN} venueId={FAKE_IDS.dome} />);
    const panel = await screen.findByTestId('decision-panel');
    expect(await within(panel).findByText('Rosa Reviewer')).toBeInTheDocument();
    expect(within(panel).getByTestId('verdict')).toHaveTextContent(
      '2 comfort findings and no hard-limit finding',
    );
    expect(within(panel).getByText('Comfort findings').parentElement).toHaveTextContent('2');
    const row = within(panel).getByText('Rosa Reviewer').closest('tr')!;
    expect(row).toHaveTextContent('Held');
    expect(row).toHaveTextContent('Heave bump at 41 s too sharp for seat 3.');
    expect(row).toHaveTextContent('Dome budget, version 4');
    // Lisbon keeps UTC+0 in December (IANA tz database).
    await waitFor(() => expect(row).toHaveTextContent('01 Dec 2026, 10:00 Europe/Lisbon'));
    // The release is refused with the server's plain words; no id on screen.
    expect(within(panel).getByRole('button', { name: 'Release to the venue' })).toBeDisabled();
    expect(within(panel).getByText('Only a cleared run can be released.')).toBeInTheDocument();
    expect(panel).not.toHaveTextContent(RUN);
  });

  it('asks for a reason before holding, sends it, and asks for the decision again', async () => {
    let state = 'awaiting_review';
    const api = fakeApi({
      [`GET ${base}/venues`]: () => json(FAKE_VENUES),
      [`GET ${base}/runs/${RUN}/decision`]: () => json(decision({ state })),
      [`POST ${base}/runs/${RUN}/review`]: () => {
        state = 'held';
        return json({ error: 'stop here' }, 500);
      },
    });
    renderWithApp(<DecisionPanel studioId={STUDIO} runId={RUN} />);
    const hold = await screen.findByRole('button', { name: 'Hold' });
    fireEvent.click(hold);
    expect(await screen.findByText(/Say why the run is held/)).toBeInTheDocument();
    expect(api.calls.some((c) => c.method === 'POST')).toBe(false);
    fireEvent.change(screen.getByLabelText(/Reason/), {
      target: { value: '  Sway too strong at the drop. ' },
    });
    fireEvent.click(hold);
    await waitFor(() => expect(api.calls.some((c) => c.path.endsWith('/review'))).toBe(true));
    const post = api.calls.find((c) => c.path.endsWith('/review'))!;
    expect(post.body).toEqual({ decision: 'hold', reason: 'Sway too strong at the drop.' });
    expect(post.headers['x-csrf-token']).toMatch(/^token-/);
    // The server's failure is shown as it said it.
    expect(await screen.findByRole('alert')).toHaveTextContent('stop here');
  });

  it('refetches the decision after a review went through, and offers the release', async () => {
    let state = 'awaiting_review';
    let decisionGets = 0;
    const reviewedRun = reviewedRunSchema.parse({
      id: RUN,
      trackId: TRACK,
      takeId: '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f',
      takeNumber: 3,
      venueId: FAKE_IDS.dome,
      venueName: 'Harbour Lights Dome',
      state: 'cleared',
      progress: 100,
      failureReason: null,
      lastError: null,
      attempts: 1,
      stalled: false,
      silent_s: null,
      worstRatio: 0.7,
      worstCheck: 'stroke leg3',
      findingCount: 0,
      createdAt: '2026-12-01T10:00:00.000Z',
      finishedAt: '2026-12-01T10:00:09.000Z',
      trackTitle: 'Lantern Reef dive',
      take: {
        id: '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f',
        trackId: TRACK,
        number: 3,
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
      cueingVersion: null,
      budgetVersion: { id: 'b1', name: 'Dome budget', version: 4 },
      result: null,
      budgetIsDemo: false,
      files: [],
      params: {},
      filmSync: null,
      reviews: [],
    });
    const api = fakeApi({
      [`GET ${base}/venues`]: () => json(FAKE_VENUES),
      [`GET ${base}/runs/${RUN}/decision`]: () => {
        decisionGets += 1;
        const cleared = state === 'cleared';
        return json(
          decision({
            state,
            comfortFindings: 0,
            actions: {
              clear: cleared
                ? { allowed: false, reasonRequired: false, why: 'The run is already cleared.' }
                : allowed,
              hold: allowed,
              release: cleared ? allowed : { allowed: false, reasonRequired: false, why: 'Not cleared yet.' },
            },
          }),
        );
      },
      [`POST ${base}/runs/${RUN}/review`]: () => {
        state = 'cleared';
        return json(reviewedRun);
      },
      [`POST ${base}/runs/${RUN}/release`]: () => json({ id: RELEASE, state: 'building' }, 201),
    });
    renderWithApp(<DecisionPanel studioId={STUDIO} runId={RUN} />);
    fireEvent.click(await screen.findByRole('button', { name: 'Clear for release' }));
    expect(await screen.findByText('The run is cleared.')).toBeInTheDocument();
    await waitFor(() => expect(screen.getByRole('button', { name: 'Release to the venue' })).toBeEnabled());
    expect(decisionGets).toBe(2);
    expect(screen.getByText('The run is already cleared.')).toBeInTheDocument();
    // A run with no findings may be cleared without a reason: the body carries an empty one.
    expect(api.calls.find((c) => c.path.endsWith('/review'))!.body).toEqual({
      decision: 'clear',
      reason: '',
    });

    fireEvent.click(screen.getByRole('button', { name: 'Release to the venue' }));
    const link = await screen.findByRole('link', { name: 'Open the release' });
    expect(link).toHaveAttribute('href', `/s/${STUDIO}/releases/${RELEASE}`);
    await waitFor(() => expect(decisionGets).toBe(3));
  });

  it('shows a malformed answer as an error and claims nothing', async () => {
    fakeApi({
      [`GET ${base}/venues`]: () => json(FAKE_VENUES),
      [`GET ${base}/runs/${RUN}/decision`]: () =>
        json(decision({ comfortFindings: 0, actions: { clear: allowed, hold: allowed, release: allowed } })),
      [`POST ${base}/runs/${RUN}/review`]: () => json({ not: 'a run' }),
    });
    renderWithApp(<DecisionPanel studioId={STUDIO} runId={RUN} />);
    fireEvent.click(await screen.findByRole('button', { name: 'Clear for release' }));
    expect(await screen.findByRole('alert')).toHaveTextContent('was not understood');
    expect(screen.queryByText('The run is cleared.')).toBeNull();
  });

  it('refuses to offer a clear for a run with a hard finding, saying why', async () => {
    fakeApi({
      [`GET ${base}/venues`]: () => json(FAKE_VENUES),
      [`GET ${base}/runs/${RUN}/decision`]: () =>
        json(
          decision({
            state: 'held_by_budget',
            hardFindings: 1,
            actions: {
              clear: {
                allowed: false,
                reasonRequired: false,
                why: 'A run with a hard-limit finding cannot be cleared; cue it again.',
              },
              hold: { allowed: true, reasonRequired: true, why: null },
              release: { allowed: false, reasonRequired: false, why: 'Only a cleared run can be released.' },
            },
          }),
        ),
    });
    renderWithApp(<DecisionPanel studioId={STUDIO} runId={RUN} />);
    expect(await screen.findByRole('button', { name: 'Clear for release' })).toBeDisabled();
    expect(
      screen.getByText('A run with a hard-limit finding cannot be cleared; cue it again.'),
    ).toBeInTheDocument();
    expect(screen.getByTestId('verdict')).toHaveTextContent('Cannot be cleared: 1 hard-limit finding');
  });
});

describe('role homes', () => {
  it("lists the reviewer's queue in the server's order, worst first, each row opening the run page", async () => {
    const second = '4e5f6a7b-8c9d-4e0f-9a1b-3c4d5e6f7a8c';
    fakeApi({
      [`GET ${base}/venues`]: () => json(FAKE_VENUES),
      [`GET ${base}/home/review`]: () =>
        json(
          reviewQueueSchema.parse({
            runs: [
              homeRun(),
              homeRun({
                id: second,
                state: 'awaiting_review',
                hardFindings: 0,
                comfortFindings: 1,
                worstRatio: 0.93,
                worstCheck: 'jerk seat2',
                trackTitle: 'Harbour loop',
              }),
            ],
          }),
        ),
    });
    inStudio(['safety_reviewer'], <ReviewQueueList studioId={STUDIO} />);
    const table = await screen.findByRole('table', { name: 'Review queue' });
    const links = within(table).getAllByRole('link');
    expect(links.map((l) => l.textContent)).toEqual(['Lantern Reef dive, take 3', 'Harbour loop, take 3']);
    expect(links[0]).toHaveAttribute('href', `/s/${STUDIO}/runs/${RUN}`);
    const first = links[0]!.closest('tr')!;
    expect(first).toHaveTextContent('Held by budget');
    expect(first).toHaveTextContent('Leg stroke, Leg 4');
    expect(first).not.toHaveTextContent('stroke leg4');
  });

  it('gives the producer a Release button on cleared runs and lists problems with their release', async () => {
    const api = fakeApi({
      [`GET ${base}/venues`]: () => json(FAKE_VENUES),
      [`GET ${base}/home/producer`]: () =>
        json(
          producerHomeSchema.parse({
            held: [homeRun()],
            clearedNotReleased: [homeRun({ state: 'cleared', hardFindings: 0, worstRatio: 0.6 })],
            problems: [
              {
                problem: {
                  id: '6f7a8b9c-0d1e-4f2a-9b3c-4d5e6f7a8b9c',
                  by: PERSON('Omar Operator'),
                  text: 'Leg 2 faults at the drop.',
                  at: '2026-12-01T18:00:00.000Z',
                },
                release: release(),
              },
            ],
            releasesInProgress: [
              release({ id: NEWER, state: 'failed', failureReason: 'Storage did not answer.' }),
            ],
          }),
        ),
      [`POST ${base}/runs/${RUN}/release`]: () => json({ id: NEWER, state: 'building' }, 201),
    });
    inStudio(['producer'], <ProducerAttention studioId={STUDIO} />);
    const problems = await screen.findByRole('table', { name: 'Problems reported by venues' });
    const row = within(problems).getByText('Leg 2 faults at the drop.').closest('tr')!;
    // America/Halifax is UTC-4 in December (IANA tz database): 18:00 UTC is 14:00 there.
    expect(row).toHaveTextContent('Omar Operator, 01 Dec 2026, 14:00 America/Halifax');
    expect(screen.getByRole('table', { name: 'Packages building or failed' })).toHaveTextContent(
      'Storage did not answer.',
    );
    expect(screen.getByRole('table', { name: 'Held runs' })).toHaveTextContent('Held by budget');
    fireEvent.click(
      screen.getByRole('button', { name: 'Release Lantern Reef dive, take 3, to Harbour Lights Dome' }),
    );
    expect(await screen.findByRole('link', { name: 'Building: open the release' })).toHaveAttribute(
      'href',
      `/s/${STUDIO}/releases/${NEWER}`,
    );
    expect(
      api.calls.filter((c) => c.method === 'POST' && c.path === `${base}/runs/${RUN}/release`),
    ).toHaveLength(1);
  });

  it('gives the venue operator download, installed and report-a-problem, and a problem needs words', async () => {
    let acknowledged = false;
    const api = fakeApi({
      [`GET ${base}/venues`]: () => json(FAKE_VENUES),
      [`GET ${base}/home/operator`]: () =>
        json(
          operatorHomeSchema.parse({
            new: acknowledged ? [] : [release()],
            installed: acknowledged
              ? [
                  release({
                    acknowledgements: [
                      { by: PERSON('Omar Operator'), note: '', at: '2026-12-01T19:00:00.000Z' },
                    ],
                  }),
                ]
              : [],
            withdrawn: [
              release({
                id: NEWER,
                state: 'withdrawn',
                withdrawReason: 'Wrong film cut.',
                withdrawnAt: '2026-12-01T16:00:00.000Z',
                withdrawnBy: PERSON('Priya Producer'),
              }),
            ],
          }),
        ),
      [`POST ${base}/releases/${RELEASE}/acknowledge`]: () => {
        acknowledged = true;
        return json({ ok: true });
      },
      [`POST ${base}/releases/${RELEASE}/problems`]: () => json({ ok: true }, 201),
    });
    inStudio(['venue_operator'], <OperatorReleases studioId={STUDIO} />);
    const fresh = await screen.findByRole('table', { name: 'New releases' });
    expect(within(fresh).getByRole('link', { name: 'Download package' })).toHaveAttribute(
      'href',
      `${base}/releases/${RELEASE}/package`,
    );
    const withdrawn = screen.getByRole('table', { name: 'Withdrawn releases' });
    expect(within(withdrawn).queryByRole('link', { name: 'Download package' })).toBeNull();
    expect(withdrawn).toHaveTextContent('Wrong film cut.');

    fireEvent.click(within(fresh).getByRole('button', { name: 'Report a problem' }));
    fireEvent.click(within(fresh).getByRole('button', { name: 'Send the report' }));
    expect(await within(fresh).findByText(/Describe the problem/)).toBeInTheDocument();
    expect(api.calls.some((c) => c.path.endsWith('/problems'))).toBe(false);
    fireEvent.change(within(fresh).getByLabelText('What is wrong with this package?'), {
      target: { value: 'Seat 2 rattles at 41 s.' },
    });
    fireEvent.click(within(fresh).getByRole('button', { name: 'Send the report' }));
    await waitFor(() =>
      expect(api.calls.find((c) => c.path.endsWith('/problems'))?.body).toEqual({
        text: 'Seat 2 rattles at 41 s.',
      }),
    );

    fireEvent.click(screen.getByRole('button', { name: 'Mark as installed' }));
    const installed = await screen.findByRole('table', { name: 'Installed releases' });
    expect(installed).toHaveTextContent('Lantern Reef dive, take 3');
    expect(api.calls.find((c) => c.path.endsWith('/acknowledge'))?.body).toEqual({ note: '' });
  });

  it('parses the engineer home contract', () => {
    expect(engineerHomeSchema.parse({ held: [homeRun()] }).held).toHaveLength(1);
  });
});

describe('release page', () => {
  it('shows the package and file hashes, sizes, downloads, the caution and the verify command', async () => {
    fakeApi({
      [`GET ${base}/venues`]: () => json(FAKE_VENUES),
      [`GET ${base}/releases/${RELEASE}`]: () => json(release()),
    });
    const writeText = vi.fn(() => Promise.resolve());
    vi.stubGlobal('navigator', { ...navigator, clipboard: { writeText } });
    inStudio(['venue_operator'], <ReleaseView studioId={STUDIO} releaseId={RELEASE} />);
    const summary = await screen.findByTestId('release-summary');
    expect(within(summary).getByTestId('package-sha256')).toHaveTextContent('a'.repeat(64));
    // 2 345 678 B is 2.3 MB (SI prefixes, BIPM SI Brochure 9th ed., table 7).
    expect(summary).toHaveTextContent('(2.3 MB)');
    await waitFor(() =>
      expect(summary).toHaveTextContent('01 Dec 2026, 10:30 America/Halifax by Priya Producer'),
    );
    expect(within(summary).getByTestId('release-caution')).toHaveTextContent(CAUTION_TEXT);
    expect(within(summary).getByRole('link', { name: 'Download package' })).toHaveAttribute(
      'href',
      `${base}/releases/${RELEASE}/package`,
    );
    // Operators do not read runs: no link to the run page.
    expect(within(summary).queryByRole('link', { name: 'Open the cue run' })).toBeNull();
    fireEvent.click(within(summary).getByRole('button', { name: 'Copy the package SHA-256' }));
    await waitFor(() => expect(writeText).toHaveBeenCalledWith('a'.repeat(64)));
    const files = screen.getByRole('table', { name: 'Files in the package' });
    expect(within(files).getByText('legs.csv').closest('tr')).toHaveTextContent(`1.2 MB${'b'.repeat(64)}`);
    expect(
      screen.getByText(/legwork verify --sha256 [0-9a-f]{64} lantern-reef-dive-take3-tidewater-arcade\.zip/),
    ).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Withdraw this release' })).toBeNull();
  });

  for (const outcome of ['ready', 'failed'] as const) {
    it(`asks again while the package is building and stops once it is ${outcome}`, async () => {
      let asked = 0;
      const building = release({ state: 'building', builtAt: null, packageSha256: null, files: [] });
      const done =
        outcome === 'ready'
          ? release()
          : release({
              state: 'failed',
              failureReason: 'Storage did not answer.',
              packageSha256: null,
              files: [],
            });
      const api = fakeApi({
        [`GET ${base}/venues`]: () => json(FAKE_VENUES),
        // The first answer says building, every later one the outcome (both parsed by releaseSchema).
        [`GET ${base}/releases/${RELEASE}`]: () => json(asked++ === 0 ? building : done),
      });
      inStudio(['producer'], <ReleaseView studioId={STUDIO} releaseId={RELEASE} />);
      expect(
        await screen.findByText('The package is being built; this page updates when it is ready.'),
      ).toBeInTheDocument();
      expect(screen.queryByRole('link', { name: 'Download package' })).toBeNull();
      if (outcome === 'ready') {
        expect(await screen.findByTestId('package-sha256', {}, { timeout: 6000 })).toHaveTextContent(
          'a'.repeat(64),
        );
        expect(screen.getByRole('link', { name: 'Download package' })).toBeInTheDocument();
      } else {
        expect(
          await screen.findByText(
            /The package could not be built: Storage did not answer\./,
            {},
            { timeout: 6000 },
          ),
        ).toBeInTheDocument();
        expect(screen.queryByRole('link', { name: 'Download package' })).toBeNull();
      }
      expect(
        screen.queryByText('The package is being built; this page updates when it is ready.'),
      ).toBeNull();
      // Settled: no further request in the next poll interval.
      const detailCalls = () => api.calls.filter((c) => c.path === `${base}/releases/${RELEASE}`).length;
      const settled = detailCalls();
      await new Promise((resolve) => setTimeout(resolve, 2500));
      expect(detailCalls()).toBe(settled);
    }, 15_000);
  }

  it('banners a withdrawn release, offers no download, and lets a producer withdraw only with a reason', async () => {
    let current = release();
    const api = fakeApi({
      [`GET ${base}/venues`]: () => json(FAKE_VENUES),
      [`GET ${base}/releases/${RELEASE}`]: () => json(current),
      [`POST ${base}/releases/${RELEASE}/withdraw`]: (call) => {
        current = release({
          state: 'withdrawn',
          withdrawnAt: '2026-12-01T20:00:00.000Z',
          withdrawnBy: PERSON('Priya Producer'),
          withdrawReason: (call.body as { reason: string }).reason,
        });
        return json(current);
      },
    });
    inStudio(['producer'], <ReleaseView studioId={STUDIO} releaseId={RELEASE} />);
    fireEvent.click(await screen.findByRole('button', { name: 'Withdraw this release' }));
    fireEvent.click(screen.getByRole('button', { name: 'Withdraw' }));
    expect(await screen.findByText(/Say why the release is withdrawn/)).toBeInTheDocument();
    expect(api.calls.some((c) => c.path.endsWith('/withdraw'))).toBe(false);
    fireEvent.change(screen.getByLabelText('Why is it withdrawn?'), { target: { value: 'Wrong film cut.' } });
    fireEvent.click(screen.getByRole('button', { name: 'Withdraw' }));
    const banner = await screen.findByText('Withdrawn: do not load this package.');
    expect(banner.parentElement).toHaveTextContent(
      'Priya Producer withdrew it on 01 Dec 2026, 16:00 America/Halifax: Wrong film cut.',
    );
    expect(screen.queryByRole('link', { name: 'Download package' })).toBeNull();
    expect(screen.getByRole('link', { name: 'Open the cue run' })).toHaveAttribute(
      'href',
      `/s/${STUDIO}/runs/${RUN}`,
    );
  });

  it('banners a superseded release with a link to the newer one', async () => {
    fakeApi({
      [`GET ${base}/venues`]: () => json(FAKE_VENUES),
      [`GET ${base}/releases/${RELEASE}`]: () =>
        json(
          release({ state: 'superseded', supersededAt: '2026-12-02T09:00:00.000Z', supersededById: NEWER }),
        ),
    });
    inStudio(['safety_reviewer'], <ReleaseView studioId={STUDIO} releaseId={RELEASE} />);
    expect(await screen.findByText(/Superseded: a newer release/)).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Open the newer release' })).toHaveAttribute(
      'href',
      `/s/${STUDIO}/releases/${NEWER}`,
    );
  });
});

describe('releases list', () => {
  it('filters by venue and state through the query the server reads, in people words', async () => {
    const api = fakeApi({
      [`GET ${base}/venues`]: () => json(FAKE_VENUES),
      [`GET ${base}/releases`]: (call) =>
        json(new URLSearchParams(call.search).get('state') === 'withdrawn' ? [] : [release()]),
    });
    const view = inStudio(['producer'], <ReleasesList studioId={STUDIO} />);
    const table = await screen.findByRole('table', { name: 'Releases' });
    const row = within(table).getByRole('link', { name: 'Lantern Reef dive, take 3' }).closest('tr')!;
    expect(row).toHaveTextContent('Tidewater Arcade');
    expect(row).toHaveTextContent('Ready');
    expect(row).toHaveTextContent('01 Dec 2026, 10:30 America/Halifax');
    expect(row).not.toHaveTextContent(RELEASE);

    fireEvent.change(screen.getByRole('combobox', { name: 'Venue' }), { target: { value: FAKE_IDS.arcade } });
    fireEvent.change(screen.getByRole('combobox', { name: 'State' }), { target: { value: 'withdrawn' } });
    expect(await screen.findByText('No releases match.')).toBeInTheDocument();
    const last = api.calls.filter((c) => c.path === `${base}/releases`).at(-1)!;
    expect(Object.fromEntries(new URLSearchParams(last.search))).toEqual({
      venueId: FAKE_IDS.arcade,
      state: 'withdrawn',
    });
    expect(view.router.state.location.search).toBe(`?venue=${FAKE_IDS.arcade}&state=withdrawn`);
    const states = within(screen.getByRole('combobox', { name: 'State' }))
      .getAllByRole('option')
      .map((o) => o.textContent);
    expect(states).toEqual([
      'Every state',
      'Building package',
      'Ready',
      'Build failed',
      'Superseded',
      'Withdrawn',
    ]);
  });
});
