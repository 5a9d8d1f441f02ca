// @vitest-environment jsdom
// Role home screens against the product's roles table (who sees what) and the API contract's
// GET /api/studios/:id/overview and /venues answers.
import '@testing-library/jest-dom/vitest';
import { cleanup, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Me, Venue } from '../../../shared/schemas/api';
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

function renderHome(me: Me) {
  fakeApi({
    'GET /api/auth/me': () => json(me),
    [`GET /api/studios/${STUDIO}/overview`]: () =>
      json({
        studio: { id: STUDIO, name: 'Lanternfish Studios', slug: 'lanternfish' },
        roles: [],
        counts: COUNTS,
      }),
    [`GET /api/studios/${STUDIO}/venues`]: () => json(VENUES),
    [`GET /api/studios/${STUDIO}/invitations`]: () => json([]),
    // The role homes' lists (shared/schemas/homes.ts), empty here: their rows are checked in
    // review-release-screens.test.tsx.
    [`GET /api/studios/${STUDIO}/home/review`]: () => json({ runs: [] }),
    [`GET /api/studios/${STUDIO}/home/engineer`]: () => json({ held: [] }),
  });
  return renderRoutes(
    [
      {
        path: '/s/:studioId',
        element: <StudioLayout />,
        children: [{ index: true, element: <StudioHomeRoute /> }],
      },
    ],
    `/s/${STUDIO}`,
  );
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
    expect(within(section).getByText('Released packages').parentElement).toHaveTextContent('4');
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
