// @vitest-environment jsdom
// The venue forms against the API contract: PUT /venues/:id/base and POST /venues answer 400
// `{ error, issues: [{ path, message }] }` with one issue per JSON path inside the base; JSON that
// does not parse is reported in the form and never sent.
import { DEFAULT_CONTROLLER_OUTPUT, controllerOutputSchema } from '../../../shared/schemas/controller-output';
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import type { ReactElement } from 'react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Venue } from '../../../shared/schemas/api';
import {
  MotionBaseError,
  demoHexapodBase,
  demoHexapodInput,
  demoPlanar3Base,
  parseMotionBase,
} from '../../../shared/schemas/motion-base';
import type { VenueDetail } from '../../../shared/schemas/pipeline';
import type { Role } from '../../../shared/schemas/roles';
import { StudioOutlet } from '../../../src/app/routes/studio-layout';
import type { StudioContext } from '../../../src/app/routes/studio-layout';
import { VenuesRoute } from '../../../src/app/routes/studio-pages';
import { VenueSettingsRoute } from '../../../src/app/routes/venue-settings';
import { TracksRoute } from '../../../src/app/routes/tracks';
import { fakeApi, json, renderRoutes } from './harness';
import type { RecordedCall } from './harness';

const STUDIO = 'a3c1e7b2-5d4f-4e8a-9b6c-1d2e3f4a5b6c';
const VENUE = 'e7a5c1f6-9b8d-4c2e-8f0a-5b6c7d8e9f0a';
const NEW_VENUE = 'f8b6d2a7-0c9e-4d3f-9a1b-6c7d8e9f0a1b';

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function context(roles: Role[]): StudioContext {
  return {
    me: {
      user: {
        id: 'c5e3a9d4-7f6b-4a0c-9d8e-3f4a5b6c7d8e',
        email: 'ida.admin@lanternfish.example',
        name: 'Ida Holm',
      },
      memberships: [],
    },
    membership: {
      studioId: STUDIO,
      studioName: 'Lanternfish Studios',
      studioSlug: 'lanternfish',
      roles,
      venueIds: [],
    },
  };
}

function renderInStudio(roles: Role[], path: string, child: { path: string; element: ReactElement }) {
  return renderRoutes(
    [{ path: '/s/:studioId', element: <StudioOutlet context={context(roles)} />, children: [child] }],
    path,
  );
}

/** Answers like the server route: the body's base goes through the shared validator; problems come back as 400 issues. */
function answerBase(call: RecordedCall, ok: (base: unknown) => Response): Response {
  const base = (call.body as { base?: unknown }).base;
  try {
    return ok(parseMotionBase(base));
  } catch (e) {
    if (!(e instanceof MotionBaseError)) throw e;
    return json({ error: `The motion base has ${e.issues.length} problem(s).`, issues: e.issues }, 400);
  }
}

const venueDetail: VenueDetail = {
  id: VENUE,
  name: 'Harbour Lights Dome',
  site: 'Port Meridian pier',
  timeZone: 'Europe/Lisbon',
  controller: DEFAULT_CONTROLLER_OUTPUT,
  base: demoHexapodBase,
  cueingVersion: null,
  budgetVersion: null,
};

/** The issues the server route would answer for `base` (empty when it is valid). */
function issuesOf(base: unknown): readonly { path: string; message: string }[] {
  try {
    parseMotionBase(base);
    return [];
  } catch (e) {
    if (e instanceof MotionBaseError) return e.issues;
    throw e;
  }
}

describe('motion base form', () => {
  it('opens the demo dome as its parametric layout, shows problems beside their fields and the workspace', async () => {
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/venues/${VENUE}`]: () => json(venueDetail),
      [`GET /api/studios/${STUDIO}/profiles`]: () => json([]),
      [`PUT /api/studios/${STUDIO}/venues/${VENUE}/base`]: (call) =>
        answerBase(call, (base) => json({ ...venueDetail, base })),
    });
    renderInStudio(['motion_engineer'], `/s/${STUDIO}/venues/${VENUE}`, {
      path: 'venues/:venueId',
      element: <VenueSettingsRoute />,
    });
    const form = await screen.findByRole('form', { name: 'Motion base of Harbour Lights Dome' });
    // The stored joints are recognised as the demo layout (shared/schemas/motion-base.ts demoHexapodInput).
    expect(within(form).getByLabelText('Base joint circle radius (m)')).toHaveValue('1.5');
    expect(within(form).getByLabelText('Platform pair half angle (deg)')).toHaveValue('10');
    // Heave up by hand: sqrt(2.3^2 - r^2) - 1.6 with r^2 = 1.5^2 + 1^2 - 3 cos 40 deg: 0.483 m.
    const heave = await within(form).findByText('0.483 m');
    expect(heave.closest('tr')).toHaveAttribute('data-axis', 'heave');

    // A negative shortest leg: the shared parser's problem stands under that field, nothing is sent.
    const min = within(form).getByLabelText('Shortest leg (m)');
    fireEvent.change(min, { target: { value: '-1' } });
    const expected = issuesOf({ ...demoHexapodInput, leg: { ...demoHexapodInput.leg, min_m: -1 } }).find(
      (i) => i.path === 'leg.min_m',
    )!;
    await waitFor(() => expect(min).toHaveAccessibleDescription(expected.message));
    expect(within(form).getByText('Shown once the base has no problems.')).toBeInTheDocument();
    fireEvent.change(min, { target: { value: 'abc' } });
    await waitFor(() => expect(min).toHaveAccessibleDescription('"abc" is not a number'));
    fireEvent.click(within(form).getByRole('button', { name: 'Save' }));
    expect(await within(form).findByRole('alert')).toHaveTextContent('nothing was sent');
    expect(calls.filter((c) => c.method === 'PUT')).toHaveLength(0);

    // Fixed, saved: the parametric layout is sent, the server keeps joints, the form reads them back.
    fireEvent.change(min, { target: { value: '1.5' } });
    await within(form).findByText('0.483 m');
    fireEvent.click(within(form).getByRole('button', { name: 'Save' }));
    expect(await within(form).findByText('Motion base saved.')).toBeInTheDocument();
    const put = calls.find((c) => c.method === 'PUT')!;
    expect(put.headers['x-csrf-token']).toMatch(/^token-/);
    expect(parseMotionBase((put.body as { base: unknown }).base)).toEqual({
      ...demoHexapodBase,
      baseJoints_m: expect.any(Array),
      platformJoints_m: expect.any(Array),
    });
    expect((put.body as { base: Record<string, unknown> }).base.baseRadius_m).toBe(1.5);
  });

  it('shows a problem the server finds beside its field', async () => {
    fakeApi({
      [`GET /api/studios/${STUDIO}/venues/${VENUE}`]: () => json(venueDetail),
      [`GET /api/studios/${STUDIO}/profiles`]: () => json([]),
      [`PUT /api/studios/${STUDIO}/venues/${VENUE}/base`]: () =>
        json(
          {
            error: 'The motion base has 1 problem(s): seats_m[1]: a seat the server refuses',
            issues: [{ path: 'seats_m[1]', message: 'a seat the server refuses' }],
          },
          400,
        ),
    });
    renderInStudio(['motion_engineer'], `/s/${STUDIO}/venues/${VENUE}`, {
      path: 'venues/:venueId',
      element: <VenueSettingsRoute />,
    });
    const form = await screen.findByRole('form', { name: 'Motion base of Harbour Lights Dome' });
    fireEvent.click(within(form).getByRole('button', { name: 'Save' }));
    const row = await waitFor(() => {
      const r = form.querySelector('tr[data-path="seats_m[1]"]');
      expect(r).toHaveTextContent('a seat the server refuses');
      return r!;
    });
    expect(within(row as HTMLElement).getByLabelText('Seat 2 x (m)')).toHaveAttribute('aria-invalid', 'true');
  });

  it('imports JSON into the form, naming a syntax error without changing the form', async () => {
    fakeApi({
      [`GET /api/studios/${STUDIO}/venues/${VENUE}`]: () => json(venueDetail),
      [`GET /api/studios/${STUDIO}/profiles`]: () => json([]),
    });
    renderInStudio(['motion_engineer'], `/s/${STUDIO}/venues/${VENUE}`, {
      path: 'venues/:venueId',
      element: <VenueSettingsRoute />,
    });
    const form = await screen.findByRole('form', { name: 'Motion base of Harbour Lights Dome' });
    const textarea = within(form).getByRole('textbox', { name: 'Motion base (JSON)' });
    // Prefilled with the stored base, pretty-printed with two spaces (JSON.stringify, ECMA-262).
    expect(textarea).toHaveValue(JSON.stringify(demoHexapodBase, null, 2));
    fireEvent.change(textarea, { target: { value: '{"kind": "planar3",\n  "leg": }' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Load the JSON into the form' }));
    expect(within(form).getByRole('list', { name: 'Problems in Motion base (JSON)' })).toHaveTextContent(
      'line 2',
    );
    expect(within(form).getByLabelText('Base joint circle radius (m)')).toHaveValue('1.5');
    fireEvent.change(textarea, { target: { value: JSON.stringify(demoPlanar3Base) } });
    fireEvent.click(within(form).getByRole('button', { name: 'Load the JSON into the form' }));
    expect(within(form).getByRole('combobox', { name: 'Kind and joints given as' })).toHaveValue('planar3');
    expect(within(form).getByLabelText('Base joint 2 x (m)')).toHaveValue('-1.7320508075688772');
    // The workspace follows once typing settles: the stage's own three axes.
    await waitFor(() => expect(within(form).queryByText('Heave (z)')).not.toBeInTheDocument());
    expect(
      Array.from(within(form).getByTestId('base-workspace').querySelectorAll('tr[data-axis]'), (r) =>
        r.getAttribute('data-axis'),
      ),
    ).toEqual(['surge', 'sway', 'yaw']);
  });

  it('shows the base read-only to a producer', async () => {
    fakeApi({
      [`GET /api/studios/${STUDIO}/venues/${VENUE}`]: () => json(venueDetail),
      [`GET /api/studios/${STUDIO}/profiles`]: () => json([]),
    });
    renderInStudio(['producer'], `/s/${STUDIO}/venues/${VENUE}`, {
      path: 'venues/:venueId',
      element: <VenueSettingsRoute />,
    });
    // Roles: only motion engineers and studio admins configure a venue (shared/permissions.ts).
    expect(await screen.findByRole('table', { name: /^Joints/ })).toBeInTheDocument();
    expect(screen.queryByRole('textbox', { name: 'Motion base (JSON)' })).not.toBeInTheDocument();
  });
});

describe('new venue form', () => {
  const listed: Venue = {
    id: VENUE,
    name: 'Harbour Lights Dome',
    site: 'Port Meridian pier',
    timeZone: 'Europe/Lisbon',
    baseKind: 'hexapod',
    controllerRate_hz: 100,
    seatCount: 4,
  };

  function setup() {
    let venues: Venue[] = [listed];
    const api = fakeApi({
      [`GET /api/studios/${STUDIO}/venues`]: () => json(venues),
      [`POST /api/studios/${STUDIO}/venues`]: (call) =>
        answerBase(call, (base) => {
          const body = call.body as { name: string; site: string; timeZone: string };
          const created: VenueDetail = {
            ...body,
            id: NEW_VENUE,
            base,
            controller: DEFAULT_CONTROLLER_OUTPUT,
            cueingVersion: null,
            budgetVersion: null,
          };
          venues = [
            ...venues,
            { ...body, id: NEW_VENUE, baseKind: 'planar3', controllerRate_hz: 100, seatCount: 2 },
          ];
          return json(created, 201);
        }),
    });
    renderInStudio(['studio_admin'], `/s/${STUDIO}/venues`, { path: 'venues', element: <VenuesRoute /> });
    return api;
  }

  it('posts the parsed JSON of the chosen example and refreshes the venues list', async () => {
    const { calls } = setup();
    await screen.findByRole('link', { name: 'Harbour Lights Dome' });
    const form = screen.getByRole('form', { name: 'New venue' });
    fireEvent.change(within(form).getByLabelText('Name'), { target: { value: 'Tidewater Arcade' } });
    fireEvent.change(within(form).getByLabelText('Site'), { target: { value: 'Old ferry shed' } });
    fireEvent.change(within(form).getByLabelText('Time zone'), { target: { value: 'Europe/Oslo' } });
    fireEvent.change(within(form).getByRole('combobox', { name: 'Start from an example' }), {
      target: { value: 'planar3' },
    });
    const textarea = within(form).getByRole('textbox', { name: 'Motion base (JSON)' });
    expect(textarea).toHaveValue(JSON.stringify(demoPlanar3Base, null, 2));
    fireEvent.click(within(form).getByRole('button', { name: 'Create' }));

    expect(await within(form).findByText('Venue Tidewater Arcade created.')).toBeInTheDocument();
    // The next step is the base form on the venue's own page.
    expect(
      within(form).getByRole('link', { name: "Fit Tidewater Arcade's motion base in the form on its page" }),
    ).toHaveAttribute('href', expect.stringMatching(new RegExp(`^/s/${STUDIO}/venues/[^/]+$`)));
    const post = calls.find((c) => c.method === 'POST')!;
    // The body is what JSON.parse makes of the text: the demo planar base after a JSON round trip.
    expect(post.body).toEqual({
      name: 'Tidewater Arcade',
      site: 'Old ferry shed',
      timeZone: 'Europe/Oslo',
      base: JSON.parse(JSON.stringify(demoPlanar3Base)) as unknown,
    });
    expect(await screen.findByRole('link', { name: 'Tidewater Arcade' })).toBeInTheDocument();
    expect(calls.filter((c) => c.method === 'GET' && c.path.endsWith('/venues'))).toHaveLength(2);
  });

  it('shows a JSON syntax error from JSON.parse in the form without calling the server', async () => {
    const { calls } = setup();
    await screen.findByRole('link', { name: 'Harbour Lights Dome' });
    const form = screen.getByRole('form', { name: 'New venue' });
    fireEvent.change(within(form).getByLabelText('Name'), { target: { value: 'Tidewater Arcade' } });
    // A trailing comma on line 3 (RFC 8259 allows none).
    const broken = '{\n  "kind": "planar3",\n  "controllerRate_hz": 100,\n}';
    fireEvent.change(within(form).getByRole('textbox', { name: 'Motion base (JSON)' }), {
      target: { value: broken },
    });
    fireEvent.click(within(form).getByRole('button', { name: 'Create' }));

    let parseMessage = '';
    try {
      JSON.parse(broken);
    } catch (e) {
      parseMessage = (e as Error).message;
    }
    expect(parseMessage).not.toBe('');
    const list = await within(form).findByRole('list', { name: 'Problems in Motion base (JSON)' });
    expect(list).toHaveTextContent(parseMessage);
    // The closing brace on line 4, column 1 is where a value was expected after the comma.
    expect(list).toHaveTextContent('line 4, column 1');
    await waitFor(() => expect(calls.filter((c) => c.method !== 'GET')).toHaveLength(0));
    expect(calls.some((c) => c.path === '/api/auth/csrf')).toBe(false);
  });

  it('is offered to studio admins only', async () => {
    fakeApi({ [`GET /api/studios/${STUDIO}/venues`]: () => json([listed]) });
    renderInStudio(['motion_engineer'], `/s/${STUDIO}/venues`, { path: 'venues', element: <VenuesRoute /> });
    await screen.findByRole('link', { name: 'Harbour Lights Dome' });
    // Roles table: creating a venue is a studio admin's job.
    expect(screen.queryByRole('form', { name: 'New venue' })).not.toBeInTheDocument();
  });
});

describe('what a venue operator sees', () => {
  it('shows the venue and its versions without asking for what the role may not read', async () => {
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/venues/${VENUE}`]: () =>
        json({ ...venueDetail, budgetVersion: { id: NEW_VENUE, name: 'Dome budget', version: 3 } }),
    });
    renderInStudio(['venue_operator'], `/s/${STUDIO}/venues/${VENUE}`, {
      path: 'venues/:venueId',
      element: <VenueSettingsRoute />,
    });
    expect(await screen.findByRole('table', { name: /^Joints/ })).toBeInTheDocument();
    expect(screen.getByText('Dome budget v3')).toBeInTheDocument();
    // No red box and no "Try again": the profiles list (not an operator's to read) is never asked for.
    expect(screen.queryByRole('alert')).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Try again' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Save' })).not.toBeInTheDocument();
    expect(calls.some((c) => c.path.endsWith('/profiles'))).toBe(false);
  });

  it('answers a deep link to the tracks with a quiet note instead of an error', async () => {
    const { calls } = fakeApi({});
    renderInStudio(['venue_operator'], `/s/${STUDIO}/tracks`, { path: 'tracks', element: <TracksRoute /> });
    expect(await screen.findByRole('note')).toHaveTextContent(
      'Tracks belong to the work of: Producer, Motion engineer, Safety reviewer or Studio admin.',
    );
    expect(screen.queryByRole('alert')).not.toBeInTheDocument();
    expect(calls.filter((c) => c.path.includes('/tracks'))).toEqual([]);
  });
});

describe('controller output form', () => {
  /** Answers like the server route: the body through the shared schema, zod issues as path + message. */
  const answerController = (call: RecordedCall) => {
    const r = controllerOutputSchema.safeParse(call.body);
    if (!r.success) {
      return json(
        {
          error: 'The controller settings have problems.',
          issues: r.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })),
        },
        400,
      );
    }
    return json({ ...venueDetail, controller: r.data });
  };

  it('sends the ramp and encoder as numbers, shows a refused field under it, and confirms a save', async () => {
    const { calls } = fakeApi({
      [`GET /api/studios/${STUDIO}/venues/${VENUE}`]: () => json(venueDetail),
      [`GET /api/studios/${STUDIO}/profiles`]: () => json([]),
      [`PUT /api/studios/${STUDIO}/venues/${VENUE}/controller`]: answerController,
    });
    renderInStudio(['motion_engineer'], `/s/${STUDIO}/venues/${VENUE}`, {
      path: 'venues/:venueId',
      element: <VenueSettingsRoute />,
    });
    const form = await screen.findByRole('form', { name: 'Controller output of Harbour Lights Dome' });
    // Prefilled with the defaults: 3 s quintic, no encoder.
    expect(within(form).getByLabelText('Ramp length (s)')).toHaveValue('3');
    fireEvent.click(within(form).getByRole('checkbox'));
    fireEvent.change(within(form).getByLabelText('Counts per mm'), { target: { value: '0' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Save controller settings' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'PUT')).toBe(true));
    const put = calls.find((c) => c.method === 'PUT')!;
    expect(put.body).toEqual({
      ramp: { duration_s: 3, profile: 'quintic' },
      encoder: { countsPerMm: 0, zeroOffset_counts: 0 },
    });
    // zod's message for a number that must be positive, under the field the server named.
    const field = within(form).getByLabelText('Counts per mm');
    await waitFor(() => expect(field).toHaveAttribute('aria-invalid', 'true'));

    fireEvent.change(field, { target: { value: '409.6' } });
    fireEvent.change(within(form).getByLabelText('Ramp length (s)'), { target: { value: '2.5' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Save controller settings' }));
    expect(
      await within(form).findByText('Controller settings saved; new runs use them.'),
    ).toBeInTheDocument();
    expect(calls.filter((c) => c.method === 'PUT').at(-1)!.body).toEqual({
      ramp: { duration_s: 2.5, profile: 'quintic' },
      encoder: { countsPerMm: 409.6, zeroOffset_counts: 0 },
    });
  });

  it('shows the settings as a sentence to a member who cannot change them', async () => {
    fakeApi({
      [`GET /api/studios/${STUDIO}/venues/${VENUE}`]: () =>
        json({
          ...venueDetail,
          controller: { ...DEFAULT_CONTROLLER_OUTPUT, encoder: { countsPerMm: 100, zeroOffset_counts: 5 } },
        }),
      [`GET /api/studios/${STUDIO}/profiles`]: () => json([]),
    });
    renderInStudio(['producer'], `/s/${STUDIO}/venues/${VENUE}`, {
      path: 'venues/:venueId',
      element: <VenueSettingsRoute />,
    });
    expect(
      await screen.findByText(
        'ramps of 3 s from and to neutral (quintic); encoder counts at 100 per mm, zero offset 5.',
      ),
    ).toBeInTheDocument();
    expect(screen.queryByRole('form', { name: /Controller output/ })).toBeNull();
  });
});
