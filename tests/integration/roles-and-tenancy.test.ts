// Every role against every studio route, from the outside: allowed, refused (403), and another
// studio's things answering 404. The expected table is written out here by hand from each role's
// work (README.md, "Roles"), not read from shared/permissions.ts.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { DEMO_USERS } from '../../shared/demo';
import type { Role } from '../../shared/schemas/roles';
import { EXAMPLE_BUDGET } from '../factories/budget';
import { demoHexapodBase, demoPlanar3Base } from '../../shared/schemas/motion-base';

let t: TestApp;
const clients = new Map<string, Client>();
beforeAll(async () => {
  t = await startTestApp({ env: { LOGIN_RATE_LIMIT: '1000' } });
  for (const u of DEMO_USERS) {
    const c = new Client(t.app);
    expect((await c.signIn(u.email)).status).toBe(200);
    clients.set(u.email, c);
  }
});
afterAll(async () => t.close());

interface RouteCase {
  name: string;
  method: 'get' | 'post' | 'patch' | 'delete' | 'put';
  path: (ids: { studio: string; member: string; invitation: string; venue: string }) => string;
  body?: (ids: { venue: string }) => object;
  allowed: Role[];
  /** Status of a successful call. */
  ok: number;
  /** Needs a fresh member and invitation to act on. */
  targets?: boolean;
}

const ALL: Role[] = ['producer', 'motion_engineer', 'safety_reviewer', 'venue_operator', 'studio_admin'];
/** Everyone who works on tracks at the studio; a venue operator sees releases for their venues only. */
const DESK: Role[] = ['producer', 'motion_engineer', 'safety_reviewer', 'studio_admin'];
// A valid budget (the example budget of the test factories), for the create-profile route.
const MATRIX_BUDGET = EXAMPLE_BUDGET;
const ROUTES: RouteCase[] = [
  {
    name: 'overview',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/overview`,
    allowed: ALL,
    ok: 200,
  },
  { name: 'venues', method: 'get', path: (i) => `/api/studios/${i.studio}/venues`, allowed: ALL, ok: 200 },
  {
    name: 'members list',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/members`,
    allowed: ['studio_admin'],
    ok: 200,
  },
  {
    name: 'invitations list',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/invitations`,
    allowed: ['studio_admin'],
    ok: 200,
  },
  {
    name: 'invite',
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/invitations`,
    body: () => ({
      email: `someone.${Math.random().toString(36).slice(2)}@example.test`,
      roles: ['producer'],
    }),
    allowed: ['studio_admin'],
    ok: 201,
  },
  {
    name: 'revoke invitation',
    method: 'delete',
    path: (i) => `/api/studios/${i.studio}/invitations/${i.invitation}`,
    allowed: ['studio_admin'],
    ok: 204,
    targets: true,
  },
  {
    name: 'change roles',
    method: 'patch',
    path: (i) => `/api/studios/${i.studio}/members/${i.member}`,
    body: () => ({ roles: ['producer', 'motion_engineer'] }),
    allowed: ['studio_admin'],
    ok: 200,
    targets: true,
  },
  {
    name: 'audit log',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/audit`,
    allowed: ['studio_admin', 'safety_reviewer'],
    ok: 200,
  },
  {
    name: 'audit log as CSV',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/audit.csv?kind=membership`,
    allowed: ['studio_admin', 'safety_reviewer'],
    ok: 200,
  },
  {
    name: 'tracks list',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/tracks`,
    allowed: DESK,
    ok: 200,
  },
  {
    name: 'create track',
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/tracks`,
    body: () => ({ title: 'Matrix Test Track' }),
    allowed: ['producer'],
    ok: 201,
  },
  {
    name: 'profiles list',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/profiles`,
    allowed: DESK,
    ok: 200,
  },
  {
    name: 'create cueing profile',
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/profiles`,
    body: () => ({ kind: 'cueing', name: 'Matrix washout', params: { version: 1, name: 'Matrix washout' } }),
    allowed: ['motion_engineer'],
    ok: 201,
  },
  {
    name: 'create budget profile',
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/profiles`,
    body: () => ({ kind: 'budget', name: 'Matrix budget', params: MATRIX_BUDGET }),
    allowed: ['safety_reviewer'],
    ok: 201,
  },
  {
    name: 'venue detail',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/venues/${i.venue}`,
    allowed: ALL,
    ok: 200,
  },
  {
    name: 'choose the venue budget version',
    method: 'put',
    path: (i) => `/api/studios/${i.studio}/venues/${i.venue}/settings`,
    body: () => ({ budgetVersionId: t.seed.budgetVersionId, reason: 'Demo budget for this venue.' }),
    allowed: ['safety_reviewer'],
    ok: 200,
  },
  {
    name: 'choose the venue cueing version',
    method: 'put',
    path: (i) => `/api/studios/${i.studio}/venues/${i.venue}/settings`,
    body: () => ({ cueingVersionId: t.seed.cueingVersionId, reason: 'Demo washout for this venue.' }),
    allowed: ['motion_engineer'],
    ok: 200,
  },
  {
    name: 'create a venue',
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/venues`,
    body: () => ({ name: 'Matrix Pier', site: 'Test', timeZone: 'UTC', base: demoPlanar3Base }),
    allowed: ['studio_admin'],
    ok: 201,
  },
  {
    name: "edit a venue's motion base",
    method: 'put',
    path: (i) => `/api/studios/${i.studio}/venues/${i.venue}/base`,
    body: () => ({ base: demoHexapodBase }),
    allowed: ['motion_engineer', 'studio_admin'],
    ok: 200,
  },
  {
    name: "edit a venue's controller settings",
    method: 'put',
    path: (i) => `/api/studios/${i.studio}/venues/${i.venue}/controller`,
    body: () => ({ ramp: { duration_s: 3, profile: 'quintic' } }),
    allowed: ['motion_engineer', 'studio_admin'],
    ok: 200,
  },
  {
    name: 'API tokens list',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/tokens`,
    allowed: ['studio_admin'],
    ok: 200,
  },
  {
    name: 'create API token',
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/tokens`,
    body: () => ({ name: 'matrix' }),
    allowed: ['studio_admin'],
    ok: 201,
  },
  {
    name: 'review queue',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/home/review`,
    allowed: ['safety_reviewer'],
    ok: 200,
  },
  {
    name: 'engineer home',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/home/engineer`,
    allowed: ['motion_engineer'],
    ok: 200,
  },
  // No such run: a role that may act is told the run is not found (404) only after the role check.
  {
    name: 'run decision',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/runs/00000000-0000-4000-8000-000000000000/decision`,
    allowed: DESK,
    ok: 404,
  },
  {
    name: 'review a run',
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/runs/00000000-0000-4000-8000-000000000000/review`,
    body: () => ({ decision: 'hold', reason: 'matrix' }),
    allowed: ['safety_reviewer'],
    ok: 404,
  },
  {
    name: "nudge a run's film offset",
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/runs/00000000-0000-4000-8000-000000000000/film-offset`,
    body: () => ({ offset_frames: 2 }),
    allowed: ['producer'],
    ok: 404,
  },
  {
    name: 'ask again for a run',
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/runs/00000000-0000-4000-8000-000000000000/requeue`,
    allowed: ['producer', 'motion_engineer'],
    ok: 404,
  },
  {
    name: "set a take's proxy video",
    method: 'put',
    path: (i) => `/api/studios/${i.studio}/takes/00000000-0000-4000-8000-000000000000/proxy-video`,
    // A JSON body is not a video: a role that may upload is told so (415), after the role check.
    body: () => ({ not: 'a video' }),
    allowed: ['producer'],
    ok: 415,
  },
  {
    name: "download a take's file",
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/takes/00000000-0000-4000-8000-000000000000/file`,
    allowed: DESK,
    ok: 404,
  },
  {
    name: "watch a take's proxy video",
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/takes/00000000-0000-4000-8000-000000000000/proxy-video`,
    allowed: DESK,
    ok: 404,
  },
  {
    name: "remove a take's proxy video",
    method: 'delete',
    path: (i) => `/api/studios/${i.studio}/takes/00000000-0000-4000-8000-000000000000/proxy-video`,
    allowed: ['producer'],
    ok: 404,
  },
  {
    name: 'release a run',
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/runs/00000000-0000-4000-8000-000000000000/release`,
    allowed: ['producer'],
    ok: 404,
  },
  {
    name: 'producer home',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/home/producer`,
    allowed: ['producer'],
    ok: 200,
  },
  {
    name: 'operator home',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/home/operator`,
    allowed: ['venue_operator'],
    ok: 200,
  },
  {
    name: 'releases',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/releases`,
    allowed: ALL,
    ok: 200,
  },
  {
    name: 'release detail',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/releases/00000000-0000-4000-8000-000000000000`,
    allowed: ALL,
    ok: 404,
  },
  {
    name: 'release package',
    method: 'get',
    path: (i) => `/api/studios/${i.studio}/releases/00000000-0000-4000-8000-000000000000/package`,
    allowed: ALL,
    ok: 404,
  },
  {
    name: 'withdraw a release',
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/releases/00000000-0000-4000-8000-000000000000/withdraw`,
    body: () => ({ reason: 'matrix' }),
    allowed: ['producer'],
    ok: 404,
  },
  {
    name: 'acknowledge a release',
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/releases/00000000-0000-4000-8000-000000000000/acknowledge`,
    body: () => ({}),
    allowed: ['venue_operator'],
    ok: 404,
  },
  {
    name: 'report a problem',
    method: 'post',
    path: (i) => `/api/studios/${i.studio}/releases/00000000-0000-4000-8000-000000000000/problems`,
    body: () => ({ text: 'matrix' }),
    allowed: ['venue_operator'],
    ok: 404,
  },
  {
    name: 'remove member',
    method: 'delete',
    path: (i) => `/api/studios/${i.studio}/members/${i.member}`,
    allowed: ['studio_admin'],
    ok: 204,
    targets: true,
  },
];

async function call(
  c: Client,
  r: RouteCase,
  ids: { studio: string; member: string; invitation: string; venue: string },
) {
  const path = r.path(ids);
  return r.method === 'get' ? c.get(path) : c.send(r.method, path, r.body?.(ids));
}

/** A throwaway member and invitation for the write routes, made fresh by the admin each time. */
async function freshTargets(admin: Client, studio: string) {
  const email = `target.${Math.random().toString(36).slice(2)}@example.test`;
  const inv = await admin.send('post', `/api/studios/${studio}/invitations`, { email, roles: ['producer'] });
  expect(inv.status).toBe(201);
  const invitation = (inv.body as { id: string }).id;
  const memberEmail = `member.${Math.random().toString(36).slice(2)}@example.test`;
  const inv2 = await admin.send('post', `/api/studios/${studio}/invitations`, {
    email: memberEmail,
    roles: ['producer'],
  });
  const { waitForMail, firstLink } = await import('./support/services');
  const mail = await waitForMail(memberEmail, /invites you/);
  const token = firstLink(mail.text).pathname.split('/').pop()!;
  const joiner = new Client(t.app);
  await joiner.refreshCsrf();
  const acc = await joiner.send('post', `/api/invitations/${token}/accept`, {
    name: 'Target Person',
    password: 'a-long-password-1',
  });
  expect(acc.status, JSON.stringify(acc.body)).toBe(200);
  expect(inv2.status).toBe(201);
  const member = (acc.body as { user: { id: string } }).user.id;
  return { invitation, member };
}

describe('role by route matrix', () => {
  for (const user of DEMO_USERS) {
    const role = user.roles[0]!;
    describe(`${role}`, () => {
      for (const r of ROUTES) {
        const allowed = r.allowed.includes(role);
        it(`${allowed ? 'may' : 'may not'} ${r.name}`, async () => {
          const admin = clients.get('ada.admin@lanternfish.example')!;
          const targets = r.targets
            ? await freshTargets(admin, t.seed.studioId)
            : {
                invitation: '00000000-0000-4000-8000-000000000000',
                member: '00000000-0000-4000-8000-000000000000',
              };
          const c = clients.get(user.email)!;
          const res = await call(c, r, { studio: t.seed.studioId, venue: t.seed.venueIds.dome, ...targets });
          if (allowed) expect(res.status, JSON.stringify(res.body)).toBe(r.ok);
          else expect(res.status, JSON.stringify(res.body)).toBe(403);
        });
      }
    });
  }

  it('refuses every studio route without a session (401)', async () => {
    const c = new Client(t.app);
    for (const r of ROUTES) {
      const res = await call(c, r, {
        studio: t.seed.studioId,
        member: t.seed.userIds['pia.producer@lanternfish.example']!,
        invitation: t.seed.venueIds.dome,
        venue: t.seed.venueIds.dome,
      });
      expect(res.status, r.name).toBe(401);
    }
  });
});

describe('tenancy', () => {
  it('answers 404 on every route of a studio the user does not belong to, even for its admin', async () => {
    // The demo admin of Lanternfish is also an admin of Quarry Hill; the producer is only in Lanternfish.
    const c = new Client(t.app);
    await c.signIn('pia.producer@lanternfish.example');
    for (const r of ROUTES) {
      const res = await call(c, r, {
        studio: t.seed.secondStudioId,
        member: t.seed.userIds['ada.admin@lanternfish.example']!,
        invitation: t.seed.venueIds.dome,
        venue: t.seed.venueIds.dome,
      });
      expect(res.status, r.name).toBe(404);
    }
  });

  it("answers 404 for another studio's member and invitation through a studio the admin does run", async () => {
    const admin = new Client(t.app);
    await admin.signIn('ada.admin@lanternfish.example');
    // Quarry Hill's admin makes an invitation there; Lanternfish routes must not reach it.
    const inv = await admin.send('post', `/api/studios/${t.seed.secondStudioId}/invitations`, {
      email: 'cross.check@example.test',
      roles: ['producer'],
    });
    expect(inv.status).toBe(201);
    const id = (inv.body as { id: string }).id;
    expect((await admin.send('delete', `/api/studios/${t.seed.studioId}/invitations/${id}`)).status).toBe(
      404,
    );
    // A Lanternfish member id through the Quarry Hill path: not a member there, so 404.
    const pia = t.seed.userIds['pia.producer@lanternfish.example']!;
    expect(
      (
        await admin.send('patch', `/api/studios/${t.seed.secondStudioId}/members/${pia}`, {
          roles: ['producer'],
        })
      ).status,
    ).toBe(404);
    expect((await admin.send('delete', `/api/studios/${t.seed.secondStudioId}/members/${pia}`)).status).toBe(
      404,
    );
  });

  it('answers 404 for a studio id that is not a uuid or does not exist', async () => {
    const c = new Client(t.app);
    await c.signIn('ada.admin@lanternfish.example');
    expect((await c.get('/api/studios/not-a-uuid/venues')).status).toBe(404);
    expect((await c.get('/api/studios/00000000-0000-4000-8000-000000000000/venues')).status).toBe(404);
  });

  it('shows a venue operator only the venues in their scope', async () => {
    const c = new Client(t.app);
    await c.signIn('otto.operator@lanternfish.example');
    const res = await c.get(`/api/studios/${t.seed.studioId}/venues`).expect(200);
    expect((res.body as { id: string }[]).map((v) => v.id)).toEqual([t.seed.venueIds.dome]);
    const eng = new Client(t.app);
    await eng.signIn('eli.engineer@lanternfish.example');
    const all = await eng.get(`/api/studios/${t.seed.studioId}/venues`).expect(200);
    expect((all.body as { id: string }[]).map((v) => v.id)).toEqual(
      expect.arrayContaining([t.seed.venueIds.dome, t.seed.venueIds.arcade]),
    );
  });

  it("refuses a venue scope naming another studio's venue", async () => {
    const admin = new Client(t.app);
    await admin.signIn('ada.admin@lanternfish.example');
    const otto = t.seed.userIds['otto.operator@lanternfish.example']!;
    const res = await admin.send('patch', `/api/studios/${t.seed.studioId}/members/${otto}`, {
      roles: ['venue_operator'],
      venueIds: ['00000000-0000-4000-8000-000000000001'],
    });
    expect(res.status).toBe(400);
    expect((res.body as { issues: { path: string }[] }).issues[0]!.path).toBe('venueIds');
  });

  it('keeps at least one studio admin', async () => {
    const admin = new Client(t.app);
    await admin.signIn('ada.admin@lanternfish.example');
    const ada = t.seed.userIds['ada.admin@lanternfish.example']!;
    const res = await admin.send('patch', `/api/studios/${t.seed.studioId}/members/${ada}`, {
      roles: ['producer'],
    });
    expect(res.status).toBe(400);
    expect((res.body as { error: string }).error).toMatch(/at least one studio admin/);
  });
});
