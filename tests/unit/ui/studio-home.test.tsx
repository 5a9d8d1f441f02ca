// @vitest-environment jsdom
// Role home screens against the product's roles table (who sees what) and the API contract's
// GET /api/studios/:id/overview and /venues answers.
import '@testing-library/jest-dom/vitest';
import { cleanup, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Me, Venue } from '../../../shared/schemas/api';
import { operatorHomeSchema, producerHomeSchema } from '../../../shared/schemas/homes';
import type { OperatorHome, ProducerHome } from '../../../shared/schemas/homes';
import { releaseSchema } from '../../../shared/schemas/release';
import type { Release } from '../../../shared/schemas/release';
import { ROLES } from '../../../shared/schemas/roles';
import type { Role } from '../../../shared/schemas/roles';
import { StudioHomeRoute } from '../../../src/app/routes/studio-home';
import { StudioLayout } from '../../../src/app/routes/studio-layout';
import { fakeApi, json, renderRoutes } from './harness';

const STUDIO = 'a3c1e7b2-5d4f-4e8a-9b6c-1d2e3f4a5b6c';
const VENUES: Venue[] = [
  {
    id: 'e7a5c1f6-9b8d-4c2e-8f0a-5b6c7d8e9f0a',
    name: 'Harbour Lights Dome',
    site: 'Port Meridian pier',
    timeZone: 'Europe/Lisbon',
    baseKind: 'hexapod',
    controllerRate_hz: 100,
    seatCount: 4,
  },
  {
    id: 'f8b6d2a7-0c9e-4d3f-9a1b-6c7d8e9f0a1b',
    name: 'Tidewater Arcade',
    site: 'Saltmarsh boardwalk',
    timeZone: 'America/Halifax',
    baseKind: 'planar3',
    controllerRate_hz: 250,
    seatCount: 2,
  },
];
const COUNTS = { venues: 2, members: 5, tracks: 7, awaitingReview: 3, held: 1, released: 4 };

function meWith(roles: Role[], venueIds: string[] = []): Me {
  return {
    user: {
      id: 'c5e3a9d4-7f6b-4a0c-9d8e-3f4a5b6c7d8e',
      email: 'someone@lanternfish.example',
      name: 'Someone',
    },
    memberships: [
      { studioId: STUDIO, studioName: 'Lanternfish Studios', studioSlug: 'lanternfish', roles, venueIds },
    ],
  };
}

const EMPTY_PRODUCER: ProducerHome = {
  held: [],
  clearedNotReleased: [],
  problems: [],
  releasesInProgress: [],
};
const EMPTY_OPERATOR: OperatorHome = { new: [], installed: [], withdrawn: [] };

/** A ready release of the dome, parsed by the API contract's schema (shared/schemas/release.ts). */
function domeRelease(overrides: Partial<Release> = {}): Release {
  return releaseSchema.parse({
    id: '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f',
    runId: '3d4e5f6a-7b8c-4d9e-8f0a-2b3c4d5e6f7a',
    trackId: '1b2c3d4e-5f6a-4b7c-8d9e-0f1a2b3c4d5e',
    trackTitle: 'Lantern Reef dive',
    takeNumber: 2,
    venueId: VENUES[0]!.id,
    venueName: 'Harbour Lights Dome',
    state: 'ready',
    failureReason: null,
    releasedBy: {
      id: 'c5e3a9d4-7f6b-4a0c-9d8e-3f4a5b6c7d8e',
      name: 'Pia Okafor',
      email: 'pia@lanternfish.example',
    },
    releasedAt: '2026-12-01T14:30:00.000Z',
    builtAt: '2026-12-01T14:30:05.000Z',
    packageName: 'lantern-reef-dive-take2-harbour-lights-dome.zip',
    packageSha256: 'a'.repeat(64),
    packageSizeBytes: 1_234_567,
    files: [],
    withdrawnAt: null,
    withdrawnBy: null,
    withdrawReason: null,
    supersededAt: null,
    supersededById: null,
    acknowledgements: [],
    problems: [],
    downloads: 0,
    lastDownloadAt: null,
    ...overrides,
  });
}

function renderHome(me: Me, homes: { producer?: ProducerHome; operator?: OperatorHome } = {}) {
  const api = fakeApi({
    'GET /api/auth/me': () => json(me),
    [`GET /api/studios/${STUDIO}/overview`]: () =>
      json({
        studio: { id: STUDIO, name: 'Lanternfish Studios', slug: 'lanternfish' },
        roles: [],
        counts: COUNTS,
      }),
    [`GET /api/studios/${STUDIO}/venues`]: () => json(VENUES),
    [`GET /api/studios/${STUDIO}/invitations`]: () => json([]),
    // The role homes' lists (shared/schemas/homes.ts), empty unless a test gives them: their rows and
    // actions are checked in review-release-screens.test.tsx.
    [`GET /api/studios/${STUDIO}/home/review`]: () => json({ runs: [] }),
    [`GET /api/studios/${STUDIO}/home/engineer`]: () => json({ held: [] }),
    [`GET /api/studios/${STUDIO}/home/producer`]: () =>
      json(producerHomeSchema.parse(homes.producer ?? EMPTY_PRODUCER)),
    [`GET /api/studios/${STUDIO}/home/operator`]: () =>
      json(operatorHomeSchema.parse(homes.operator ?? EMPTY_OPERATOR)),
  });
  renderRoutes(
    [
      {
        path: '/s/:studioId',
        element: <StudioLayout />,
        children: [{ index: true, element: <StudioHomeRoute /> }],
      },
    ],
    `/s/${STUDIO}`,
  );
  return api;
}

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const HEADINGS: Record<Role, string> = {
  producer: 'Producer desk',
  motion_engineer: 'Motion engineering',
  safety_reviewer: 'Safety review',
  venue_operator: 'Venue operations',
  studio_admin: 'Studio administration',
};

describe('studio home', () => {
  for (const role of ROLES) {
    it(`gives a ${role} their own section and no other`, async () => {
      renderHome(meWith([role], [VENUES[0]!.id]));
      const section = await screen.findByTestId(`home-${role}`);
      expect(within(section).getByRole('heading', { level: 2 })).toHaveTextContent(HEADINGS[role]);
      for (const other of ROLES.filter((r) => r !== role))
        expect(screen.queryByTestId(`home-${other}`)).toBeNull();
    });
  }

  it('shows one section per role, in the order of the roles, to a member with several', async () => {
    renderHome(meWith(['studio_admin', 'producer']));
    await screen.findByTestId('home-studio_admin');
    const headings = screen.getAllByRole('heading', { level: 2 }).map((h) => h.textContent);
    expect(headings).toEqual(['Producer desk', 'Studio administration']);
  });

  it('shows a venue operator only the venues in their scope, even when the server sends more', async () => {
    renderHome(meWith(['venue_operator'], [VENUES[0]!.id]));
    const section = await screen.findByTestId('home-venue_operator');
    const table = await within(section).findByRole('table', { name: 'Your venues' });
    expect(within(table).getByText('Harbour Lights Dome')).toBeInTheDocument();
    expect(within(table).queryByText('Tidewater Arcade')).toBeNull();
  });

  it("builds the venue operator's home from /home/operator, with the caution to check before loading", async () => {
    const installed = domeRelease({
      id: '4e5f6a7b-8c9d-4e0f-8a1b-2c3d4e5f6a7b',
      takeNumber: 1,
      acknowledgements: [
        {
          by: {
            id: 'd6f4b0e5-8a7c-4b1d-8e9f-4a5b6c7d8e9f',
            name: 'Otto Brenner',
            email: 'otto@lanternfish.example',
          },
          note: 'Loaded after the morning checks.',
          at: '2026-12-01T16:00:00.000Z',
        },
      ],
    });
    const api = renderHome(meWith(['venue_operator'], [VENUES[0]!.id]), {
      operator: { new: [domeRelease()], installed: [installed], withdrawn: [] },
    });
    const section = await screen.findByTestId('home-venue_operator');
    const fresh = await within(section).findByRole('table', { name: 'New releases' });
    expect(within(fresh).getByRole('link', { name: 'Lantern Reef dive, take 2' })).toHaveAttribute(
      'href',
      `/s/${STUDIO}/releases/2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f`,
    );
    expect(within(fresh).getByRole('link', { name: 'Download package' })).toHaveAttribute(
      'href',
      `/api/studios/${STUDIO}/releases/2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f/package`,
    );
    expect(within(fresh).getByRole('button', { name: 'Mark as installed' })).toBeInTheDocument();
    const done = within(section).getByRole('table', { name: 'Installed releases' });
    expect(done).toHaveTextContent('Lantern Reef dive, take 1');
    expect(done).toHaveTextContent('Installed at the venue.');
    expect(within(section).getByText('No release of your venues was withdrawn.')).toBeInTheDocument();
    const caution = within(section).getByTestId('operator-caution');
    expect(caution).toHaveTextContent("only after your venue's own checks");
    expect(caution).toHaveTextContent('never replaces them');
    expect(api.calls.some((c) => c.path === `/api/studios/${STUDIO}/home/operator`)).toBe(true);
    // The producer's list is not the operator's to ask for (the role table gives home.producer to producers only).
    expect(api.calls.some((c) => c.path.endsWith('/home/producer'))).toBe(false);
  });

  it("builds the producer's home from /home/producer: cleared runs with a Release action", async () => {
    const api = renderHome(meWith(['producer']), {
      producer: {
        held: [],
        clearedNotReleased: [
          {
            id: '3d4e5f6a-7b8c-4d9e-8f0a-2b3c4d5e6f7a',
            trackId: '1b2c3d4e-5f6a-4b7c-8d9e-0f1a2b3c4d5e',
            trackTitle: 'Lantern Reef dive',
            takeNumber: 2,
            venueId: VENUES[0]!.id,
            venueName: 'Harbour Lights Dome',
            state: 'cleared',
            hardFindings: 0,
            comfortFindings: 0,
            worstRatio: 0.62,
            worstCheck: 'stroke leg3',
            finishedAt: '2026-12-01T12:00:00.000Z',
            lastReview: null,
          },
        ],
        problems: [],
        releasesInProgress: [domeRelease({ state: 'building', builtAt: null, packageSha256: null })],
      },
    });
    const section = await screen.findByTestId('home-producer');
    const cleared = await within(section).findByRole('table', { name: 'Cleared runs not yet released' });
    expect(
      within(cleared).getByRole('button', {
        name: 'Release Lantern Reef dive, take 2, to Harbour Lights Dome',
      }),
    ).toBeEnabled();
    expect(within(section).getByRole('table', { name: 'Packages building or failed' })).toHaveTextContent(
      'Lantern Reef dive, take 2',
    );
    expect(within(section).getByText('No problems reported.')).toBeInTheDocument();
    expect(within(section).getByText('No held runs.')).toBeInTheDocument();
    expect(api.calls.some((c) => c.path.endsWith('/home/operator'))).toBe(false);
  });

  it("lists every venue's motion base for a motion engineer: kind, controller rate and seats", async () => {
    renderHome(meWith(['motion_engineer']));
    const section = await screen.findByTestId('home-motion_engineer');
    const table = await within(section).findByRole('table');
    const arcade = within(table).getByText('Tidewater Arcade').closest('tr')!;
    expect(arcade).toHaveTextContent('Planar stage (3 legs)');
    expect(arcade).toHaveTextContent('250 Hz');
    expect(arcade.lastElementChild).toHaveTextContent('2');
  });

  it('shows the review queue counts to a safety reviewer', async () => {
    renderHome(meWith(['safety_reviewer']));
    const section = await screen.findByTestId('home-safety_reviewer');
    expect(within(section).getByText('Awaiting review').parentElement).toHaveTextContent('3');
    expect(within(section).getByText('Held').parentElement).toHaveTextContent('1');
    expect(await within(section).findByText('Nothing waits for review.')).toBeInTheDocument();
  });

  it('shows a member with several roles the work list of each, and no error', async () => {
    renderHome(meWith(['motion_engineer', 'safety_reviewer']));
    expect(await screen.findByText('Nothing waits for review.')).toBeInTheDocument();
    expect(await screen.findByText('No held runs.')).toBeInTheDocument();
    expect(screen.queryByRole('alert')).toBeNull();
  });
});
