// @vitest-environment jsdom
// Profiles, venue settings, API tokens and the pipeline navigation against the API contract:
// POST /profiles/:id/versions answers 400 `{ error, issues: [{ path, message }] }` naming the field,
// PUT /venues/:id/settings answers 403 with the server's reason, POST /tokens shows its secret once,
// and the navigation follows the product's roles table.
import { DEFAULT_CONTROLLER_OUTPUT } from '../../../shared/schemas/controller-output';
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Me } from '../../../shared/schemas/api';
import { DEFAULT_CUEING_PROFILE } from '../../../shared/schemas/cueing-profile';
import { demoHexapodInput } from '../../../shared/schemas/motion-base';
import type { ApiToken, Profile, VenueDetail } from '../../../shared/schemas/pipeline';
import type { Role } from '../../../shared/schemas/roles';
import { StudioLayout, StudioOutlet } from '../../../src/app/routes/studio-layout';
import type { StudioContext } from '../../../src/app/routes/studio-layout';
import { VenueSettingsRoute } from '../../../src/app/routes/venue-settings';
import { UseRatioBar } from '../../../src/components/charts/run-badges';
import { ProfileEditor } from '../../../src/features/profiles/components/profile-editor';
import { BudgetTable } from '../../../src/features/runs/components/budget-table';
import { TokensPanel } from '../../../src/features/tokens/components/tokens-panel';
import { ProfileVersionSelect } from '../../../src/features/venue-settings/components/profile-version-select';
import { fakeApi, json, renderRoutes, renderWithApp } from './harness';

const STUDIO = 'a3c1e7b2-5d4f-4e8a-9b6c-1d2e3f4a5b6c';
const VENUE = 'e7a5c1f6-9b8d-4c2e-8f0a-5b6c7d8e9f0a';
const PROFILE: Profile = {
  id: '6a7b8c9d-0e1f-4a2b-8c3d-5e6f7a8b9c0d',
  kind: 'cueing',
  name: 'Dome washout',
  versions: [
    {
      id: '7b8c9d0e-1f2a-4b3c-9d4e-6f7a8b9c0d1e',
      version: 1,
      note: 'first',
      used: true,
      createdAt: '2026-11-01T10:00:00.000Z',
      params: DEFAULT_CUEING_PROFILE,
    },
    {
      id: '8c9d0e1f-2a3b-4c4d-8e5f-7a8b9c0d1e2f',
      version: 2,
      note: 'softer heave',
      used: false,
      createdAt: '2026-11-02T10:00:00.000Z',
      params: DEFAULT_CUEING_PROFILE,
    },
  ],
};

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('profile editor', () => {
  it("lists the server's field issues with the line and column of that field in the text", async () => {
    fakeApi({
      [`POST /api/studios/${STUDIO}/profiles/${PROFILE.id}/versions`]: () =>
        json(
          {
            error: 'The profile has problems.',
            issues: [
              {
                path: 'params.tilt.rateLimit_degps',
                message: 'above the rotation threshold this venue allows',
              },
            ],
          },
          400,
        ),
    });
    const text = JSON.stringify(DEFAULT_CUEING_PROFILE, null, 2);
    renderWithApp(
      <ProfileEditor
        studioId={STUDIO}
        kind="cueing"
        profile={PROFILE}
        initialText={text}
        onDone={() => undefined}
      />,
    );
    fireEvent.click(screen.getByRole('button', { name: 'Save as new version' }));
    const list = await screen.findByRole('alert', { name: 'Problems in the parameters' });
    // Independent of the JSON scanner: the line holding the key, counted by a plain text search.
    const lines = text.split('\n');
    const line = lines.findIndex((l) => l.includes('"rateLimit_degps"')) + 1;
    const column = (lines[line - 1] ?? '').indexOf(':') + 3;
    expect(line).toBeGreaterThan(1);
    expect(list).toHaveTextContent(
      `tilt.rateLimit_degps (line ${line}, column ${column}): above the rotation threshold this venue allows`,
    );
  });

  it('checks the parameters with the shared schema first, so a bad field never reaches the server', async () => {
    const { calls } = fakeApi({});
    const bad = JSON.stringify(
      { ...DEFAULT_CUEING_PROFILE, scale: { ...DEFAULT_CUEING_PROFILE.scale, surge: 5 } },
      null,
      2,
    );
    renderWithApp(
      <ProfileEditor
        studioId={STUDIO}
        kind="cueing"
        profile={PROFILE}
        initialText={bad}
        onDone={() => undefined}
      />,
    );
    fireEvent.click(screen.getByRole('button', { name: 'Save as new version' }));
    const list = await screen.findByRole('alert', { name: 'Problems in the parameters' });
    expect(list).toHaveTextContent('scale.surge');
    expect(calls.filter((c) => c.method === 'POST')).toHaveLength(0);
  });

  it('names a JSON syntax error by line and column', async () => {
    fakeApi({});
    renderWithApp(
      <ProfileEditor
        studioId={STUDIO}
        kind="budget"
        initialText={'{\n  "strokeMargin_m": 0.02,\n  oops\n}'}
        onDone={() => undefined}
      />,
    );
    fireEvent.change(screen.getByLabelText('Profile name'), { target: { value: 'Arcade budget' } });
    fireEvent.click(screen.getByRole('button', { name: 'Create profile' }));
    // RFC 8259: a member name must be a quoted string, so the bare word on line 3, column 3 is the error.
    expect(await screen.findByRole('alert', { name: 'Problems in the parameters' })).toHaveTextContent(
      'line 3, column 3',
    );
  });
});

describe('venue profile versions', () => {
  const venue: VenueDetail = {
    id: VENUE,
    name: 'Harbour Lights Dome',
    site: 'Port Meridian pier',
    timeZone: 'Europe/Lisbon',
    controller: DEFAULT_CONTROLLER_OUTPUT,
    base: {},
    cueingVersion: { id: PROFILE.versions[0]!.id, name: PROFILE.name, version: 1 },
    budgetVersion: null,
  };

  it("sends only the chosen kind's version with PUT and shows a 403 reason as the server wrote it", async () => {
    const reason = 'Only a motion engineer may change the cueing profile of a venue.';
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/profiles`]: () => json([PROFILE]),
      [`PUT /api/studios/${STUDIO}/venues/${VENUE}/settings`]: () => json({ error: reason }, 403),
    });
    renderWithApp(<ProfileVersionSelect studioId={STUDIO} venue={venue} kind="cueing" />);
    const select = await screen.findByRole('combobox', { name: 'Cueing profile version for new runs' });
    fireEvent.change(select, { target: { value: PROFILE.versions[1]!.id } });
    fireEvent.click(screen.getByRole('button', { name: 'Save' }));
    // Saving asks for a confirmation naming both versions and for a reason; none given, nothing is sent.
    const confirm = screen.getByRole('group', { name: 'Confirm the cueing profile change' });
    expect(confirm).toHaveTextContent(`from ${PROFILE.name} v1 to ${PROFILE.name} v2?`);
    fireEvent.click(within(confirm).getByRole('button', { name: 'Confirm change' }));
    expect(
      within(confirm).getByRole('textbox', { name: /^Reason for the change/ }),
    ).toHaveAccessibleDescription('Say why the venue changes profile; the audit log keeps the reason.');
    expect(calls.filter((c) => c.method === 'PUT')).toHaveLength(0);
    fireEvent.change(within(confirm).getByRole('textbox', { name: /^Reason for the change/ }), {
      target: { value: ' Gentler washout for the new seats. ' },
    });
    fireEvent.click(within(confirm).getByRole('button', { name: 'Confirm change' }));
    expect(await screen.findByRole('alert')).toHaveTextContent(reason);
    const put = calls.find((c) => c.method === 'PUT')!;
    expect(put.body).toEqual({
      cueingVersionId: PROFILE.versions[1]!.id,
      reason: 'Gentler washout for the new seats.',
    });
    expect(put.headers['x-csrf-token']).toMatch(/^token-/);
    expect(new URLSearchParams(calls.find((c) => c.path.endsWith('/profiles'))!.search).get('kind')).toBe(
      'cueing',
    );
  });
});

describe('venue settings page', () => {
  it('confirms a saved version and shows it as current, with the base summary from the venue', async () => {
    let venue: VenueDetail = {
      id: VENUE,
      name: 'Harbour Lights Dome',
      site: 'Port Meridian pier',
      timeZone: 'Europe/Lisbon',
      controller: DEFAULT_CONTROLLER_OUTPUT,
      base: demoHexapodInput,
      cueingVersion: { id: PROFILE.versions[0]!.id, name: PROFILE.name, version: 1 },
      budgetVersion: null,
    };
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/venues/${VENUE}`]: () => json(venue),
      [`GET /api/studios/${STUDIO}/profiles`]: (call) =>
        json(new URLSearchParams(call.search).get('kind') === 'cueing' ? [PROFILE] : []),
      [`PUT /api/studios/${STUDIO}/venues/${VENUE}/settings`]: () => {
        venue = { ...venue, cueingVersion: { id: PROFILE.versions[1]!.id, name: PROFILE.name, version: 2 } };
        return json(venue);
      },
    });
    const context: StudioContext = {
      me: {
        user: {
          id: 'c5e3a9d4-7f6b-4a0c-9d8e-3f4a5b6c7d8e',
          email: 'eli.engineer@lanternfish.example',
          name: 'Eli Varga',
        },
        memberships: [],
      },
      membership: {
        studioId: STUDIO,
        studioName: 'Lanternfish Studios',
        studioSlug: 'lanternfish',
        roles: ['motion_engineer'],
        venueIds: [],
      },
    };
    renderRoutes(
      [
        {
          path: '/s/:studioId',
          element: <StudioOutlet context={context} />,
          children: [{ path: 'venues/:venueId', element: <VenueSettingsRoute /> }],
        },
      ],
      `/s/${STUDIO}/venues/${VENUE}`,
    );
    // The demo base's own numbers (shared/schemas/motion-base.ts): 100 Hz, stroke 1.5 to 2.3 m, four seats.
    expect(await screen.findByText('1.500–2.300 m')).toBeInTheDocument();
    expect(screen.getByRole('table', { name: /^Joints/ }).querySelectorAll('tbody tr')).toHaveLength(6);
    expect(screen.getByRole('table', { name: /^Seats/ }).querySelectorAll('tbody tr')).toHaveLength(4);

    const form = screen.getByRole('form', { name: 'Cueing profile of Harbour Lights Dome' });
    const select = await within(form).findByRole('combobox');
    fireEvent.change(select, { target: { value: PROFILE.versions[1]!.id } });
    fireEvent.click(within(form).getByRole('button', { name: 'Save' }));
    fireEvent.change(within(form).getByRole('textbox', { name: /^Reason for the change/ }), {
      target: { value: 'New seats.' },
    });
    fireEvent.click(within(form).getByRole('button', { name: 'Confirm change' }));
    expect(await within(form).findByText(/^Saved\./)).toBeInTheDocument();
    expect(within(form).getByText('Dome washout v2')).toBeInTheDocument();
    expect(calls.filter((c) => c.method === 'PUT')).toHaveLength(1);
  });
});

describe('API tokens', () => {
  it('shows a new token once with a curl line that pushes a take, and lists it', async () => {
    let tokens: ApiToken[] = [];
    fakeApi({
      [`GET /api/studios/${STUDIO}/tokens`]: () => json(tokens),
      [`POST /api/studios/${STUDIO}/tokens`]: (call) => {
        const made: ApiToken = {
          id: '9d0e1f2a-3b4c-4d5e-9f6a-8b9c0d1e2f3a',
          name: (call.body as { name: string }).name,
          prefix: 'lwk_Q7',
          createdAt: '2026-12-01T10:00:00.000Z',
          lastUsedAt: null,
          revokedAt: null,
        };
        tokens = [made];
        return json({ ...made, token: 'lwk_Q7secret' }, 201);
      },
    });
    renderWithApp(<TokensPanel studioId={STUDIO} />);
    expect(await screen.findByText('No API tokens yet.')).toBeInTheDocument();
    fireEvent.change(screen.getByLabelText('Token name (e.g. the render farm it is for)'), {
      target: { value: 'Render farm east' },
    });
    fireEvent.click(screen.getByRole('button', { name: 'Create token' }));
    expect(await screen.findByLabelText('New API token')).toHaveTextContent('lwk_Q7secret');
    // RFC 6750 section 2.1: a bearer token travels as `Authorization: Bearer <token>`.
    expect(screen.getByText(/curl -H/)).toHaveTextContent(
      `curl -H "Authorization: Bearer lwk_Q7secret" --data-binary @take.csv "${window.location.origin}/api/studios/${STUDIO}/tracks/<trackId>/takes?fileName=take.csv"`,
    );
    const table = await screen.findByRole('table', { name: 'API tokens' });
    expect(within(table).getByText('Render farm east')).toBeInTheDocument();
    expect(within(table).queryByText('lwk_Q7secret')).not.toBeInTheDocument();
  });
});

describe('pipeline navigation', () => {
  function meWith(roles: Role[]): Me {
    return {
      user: {
        id: 'c5e3a9d4-7f6b-4a0c-9d8e-3f4a5b6c7d8e',
        email: 'someone@lanternfish.example',
        name: 'Someone',
      },
      memberships: [
        {
          studioId: STUDIO,
          studioName: 'Lanternfish Studios',
          studioSlug: 'lanternfish',
          roles,
          venueIds: [],
        },
      ],
    };
  }
  // The roles as the product describes them: producers, engineers, reviewers and admins work with
  // tracks and may read the profiles (engineers own cueing, reviewers budget profiles); admins manage
  // members, the audit log and tokens; operators see venues and their venues' releases only.
  // Every role reads releases ('releases.read'; the server limits an operator to their venues).
  const expected: [Role, string[]][] = [
    ['producer', ['Home', 'Venues', 'Tracks', 'Releases', 'Profiles']],
    ['motion_engineer', ['Home', 'Venues', 'Tracks', 'Releases', 'Profiles']],
    // Safety reviewers read the audit log as well as admins (the role table in shared/permissions.ts).
    ['safety_reviewer', ['Home', 'Venues', 'Tracks', 'Releases', 'Profiles', 'Audit log']],
    ['venue_operator', ['Home', 'Venues', 'Releases']],
    [
      'studio_admin',
      ['Home', 'Venues', 'Tracks', 'Releases', 'Profiles', 'Members', 'Audit log', 'API tokens'],
    ],
  ];
  for (const [role, links] of expected) {
    it(`shows ${role} the pipeline pages of that role`, async () => {
      fakeApi({ 'GET /api/auth/me': () => json(meWith([role])) });
      renderRoutes(
        [
          {
            path: '/s/:studioId',
            element: <StudioLayout />,
            children: [{ index: true, element: <p>inside</p> }],
          },
        ],
        `/s/${STUDIO}`,
      );
      const nav = await screen.findByRole('navigation', { name: 'Studio pages' });
      await waitFor(() =>
        expect(
          within(nav)
            .getAllByRole('link')
            .map((link) => link.textContent),
        ).toEqual(links),
      );
    });
  }
});

describe('budget uses at a glance', () => {
  it('shows the twelve largest uses first and the rest on request', () => {
    const uses = Array.from({ length: 15 }, (_, i) => ({
      check: 'legSpeed' as const,
      subject: `leg${(i % 6) + 1}`,
      ratio: i / 20,
    }));
    renderWithApp(<BudgetTable uses={uses} />);
    return waitFor(() => {
      const table = screen.getByRole('table', { name: 'Budget uses, largest first' });
      expect(within(table).getAllByRole('row')).toHaveLength(1 + 12);
      fireEvent.click(screen.getByRole('button', { name: 'Show all 15 uses' }));
      expect(within(table).getAllByRole('row')).toHaveLength(1 + 15);
    });
  });

  it('never prints a ratio in another band than its colour', () => {
    // docs/motion-conventions.md section 6: within budget while the ratio is below 1; 0.8 is the house warning line.
    renderWithApp(
      <>
        <UseRatioBar ratio={0.7996} label="a" />
        <UseRatioBar ratio={0.996} label="b" />
        <UseRatioBar ratio={1} label="c" />
      </>,
    );
    return waitFor(() => {
      expect(screen.getByText('0.79')).toHaveClass('text-ink-800');
      expect(screen.getByText('0.99')).toHaveClass('text-signal-600');
      expect(screen.getByText('1.00')).toHaveClass('text-stop-700');
      expect(screen.getByRole('meter', { name: 'Use ratio a' })).toHaveAttribute('aria-valuenow', '0.7996');
    });
  });
});
