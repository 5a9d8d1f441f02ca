import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import request from 'supertest';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { firstLink, waitForMail } from './support/services';
import { users } from '../../server/db/schema';
import { hashPassword } from '../../server/auth/passwords';
import { DEMO_PASSWORD } from '../../shared/demo';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ env: { LOGIN_RATE_LIMIT: '3', LOGIN_RATE_WINDOW_S: '60' }, queue: true });
});
afterAll(async () => t.close());

describe('health', () => {
  it('reports database, storage, mail and queue', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.body).toEqual({ ok: true, database: 'ok', storage: 'ok', mail: 'ok', queue: 'ok' });
  });
});

describe('sign-in', () => {
  it('signs in with the right password and reports memberships', async () => {
    const c = new Client(t.app);
    const res = await c.signIn('rosa.reviewer@lanternfish.example');
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe('rosa.reviewer@lanternfish.example');
    expect(res.body.memberships[0].roles).toEqual(['safety_reviewer']);
    expect((await c.get('/api/auth/me')).status).toBe(200);
  });

  it('sets an httpOnly, SameSite session cookie', async () => {
    const c = new Client(t.app);
    const res = await c.signIn('rosa.reviewer@lanternfish.example');
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/legwork\.sid=/);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
  });

  it('gives a wrong password the same answer as an unknown user', async () => {
    const a = new Client(t.app);
    const wrong = await a.signIn('eli.engineer@lanternfish.example', 'not-the-password');
    const b = new Client(t.app);
    const unknown = await b.signIn('nobody@lanternfish.example', 'not-the-password');
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
  });

  it('refuses writes without the CSRF token', async () => {
    const c = new Client(t.app);
    await c.signIn('ada.admin@lanternfish.example');
    const res = await c.agent
      .post(`/api/studios/${t.seed.studioId}/invitations`)
      .send({ email: 'csrf.victim@example.test', roles: ['producer'] });
    expect(res.status).toBe(403);
    expect(res.body.error).toMatch(/CSRF/);
    const wrongToken = await c.agent.post('/api/auth/logout').set('x-csrf-token', 'forged-token-value');
    expect(wrongToken.status).toBe(403);
    // Still signed in: the refused sign-out did nothing.
    expect((await c.get('/api/auth/me')).status).toBe(200);
  });

  it('rate-limits repeated sign-in attempts for one address', async () => {
    const c = new Client(t.app);
    const statuses: number[] = [];
    for (let i = 0; i < 5; i++)
      statuses.push((await c.signIn('pia.producer@lanternfish.example', 'guess-' + i)).status);
    // LOGIN_RATE_LIMIT is 3 for this file: three answers, then refusals.
    expect(statuses).toEqual([401, 401, 401, 429, 429]);
  });

  it('signs out', async () => {
    const c = new Client(t.app);
    await c.signIn('ada.admin@lanternfish.example');
    expect((await c.send('post', '/api/auth/logout')).status).toBe(204);
    expect((await c.get('/api/auth/me')).status).toBe(401);
  });

  it('records sign-ins in the audit log, which refuses changes', async () => {
    const c = new Client(t.app);
    await c.signIn('ada.admin@lanternfish.example');
    const res = await c.get(`/api/studios/${t.seed.studioId}/audit`).expect(200);
    expect(res.body.events.some((e: { action: string }) => e.action === 'auth.signed_in')).toBe(true);
    await expect(t.tdb.db.execute(sql`update audit_events set action = 'x'`)).rejects.toThrow();
    await expect(t.tdb.db.execute(sql`delete from audit_events`)).rejects.toThrow();
  });
});

describe('password reset by e-mail', () => {
  it('mails a link that sets a new password and ends old sessions', async () => {
    // An address of this run alone: the mail goes out after the answer, so no earlier mail may match.
    const email = `reset.${Date.now()}@lanternfish.example`;
    await t.tdb.db
      .insert(users)
      .values({ email, name: 'Rue Hollis', passwordHash: await hashPassword(DEMO_PASSWORD) });
    const old = new Client(t.app);
    expect((await old.signIn(email)).status).toBe(200);
    const c = new Client(t.app);
    await c.refreshCsrf();
    expect((await c.send('post', '/api/auth/password-reset', { email })).status).toBe(202);
    const mail = await waitForMail(email, /new password/);
    const link = firstLink(mail.text);
    expect(link.pathname).toBe('/reset-password');
    const token = link.searchParams.get('token')!;
    const done = await c.send('post', '/api/auth/password-reset/confirm', {
      token,
      password: 'a-brand-new-password',
    });
    expect(done.status).toBe(204);
    expect((await old.get('/api/auth/me')).status).toBe(401);
    expect((await new Client(t.app).signIn(email, 'a-brand-new-password')).status).toBe(200);
    expect((await new Client(t.app).signIn(email)).status).toBe(401);
    // The link works once.
    const again = await c.send('post', '/api/auth/password-reset/confirm', {
      token,
      password: 'another-new-password',
    });
    expect(again.status).toBe(400);
  });

  it('answers an unknown address the same way and sends nothing', async () => {
    const c = new Client(t.app);
    await c.refreshCsrf();
    const res = await c.send('post', '/api/auth/password-reset', { email: 'ghost@lanternfish.example' });
    expect(res.status).toBe(202);
    await expect(waitForMail('ghost@lanternfish.example', /password/, 500)).rejects.toThrow(/no mail/);
  });
});

describe('invitations by e-mail', () => {
  it('invites a new person who follows the link, makes an account and lands in the studio', async () => {
    const admin = new Client(t.app);
    await admin.signIn('ada.admin@lanternfish.example');
    const email = 'new.engineer@example.test';
    const inv = await admin.send('post', `/api/studios/${t.seed.studioId}/invitations`, {
      email,
      roles: ['venue_operator'],
      venueIds: [t.seed.venueIds.arcade],
    });
    expect(inv.status).toBe(201);
    const mail = await waitForMail(email, /invites you to Lanternfish Studios/);
    const token = firstLink(mail.text).pathname.split('/').pop()!;
    const c = new Client(t.app);
    const info = await c.get(`/api/invitations/${token}`).expect(200);
    expect(info.body).toMatchObject({ studioName: 'Lanternfish Studios', email, existingUser: false });
    await c.refreshCsrf();
    const missing = await c.send('post', `/api/invitations/${token}/accept`, {});
    expect(missing.status).toBe(400);
    const acc = await c.send('post', `/api/invitations/${token}/accept`, {
      name: 'Noor Haddad',
      password: 'long-enough-pass',
    });
    expect(acc.status).toBe(200);
    expect(acc.body.memberships[0]).toMatchObject({
      studioId: t.seed.studioId,
      roles: ['venue_operator'],
      venueIds: [t.seed.venueIds.arcade],
    });
    // Used once only.
    expect((await c.get(`/api/invitations/${token}`)).status).toBe(410);
    const log = await admin.get(`/api/studios/${t.seed.studioId}/audit`).expect(200);
    const actions = log.body.events.map((e: { action: string }) => e.action);
    expect(actions).toContain('invitation.sent');
    expect(actions).toContain('invitation.accepted');
  });

  it('accepts one invitation once when three people send it at the same moment: one 200, the rest 410, no 500', async () => {
    const admin = new Client(t.app);
    await admin.signIn('ada.admin@lanternfish.example');
    const email = 'parallel.accept@example.test';
    const inv = await admin.send('post', `/api/studios/${t.seed.studioId}/invitations`, {
      email,
      roles: ['producer'],
    });
    expect(inv.status).toBe(201);
    const mail = await waitForMail(email, /invites you to Lanternfish Studios/);
    const token = firstLink(mail.text).pathname.split('/').pop()!;
    const clients = [new Client(t.app), new Client(t.app), new Client(t.app)];
    for (const c of clients) await c.refreshCsrf();
    const answers = await Promise.all(
      clients.map((c) =>
        c.send('post', `/api/invitations/${token}/accept`, {
          name: 'Ines Parallel',
          password: 'long-enough-pass',
        }),
      ),
    );
    expect(answers.map((a) => a.status).sort()).toEqual([200, 410, 410]);
    for (const a of answers.filter((x) => x.status === 410)) expect(a.body.error).toMatch(/already accepted/);
    const rows = await t.tdb.db.execute(
      sql`select count(*)::int as n from users u join memberships m on m.user_id = u.id where u.email = ${email}`,
    );
    expect(rows.rows[0]).toEqual({ n: 1 });
  });

  it('refuses an invitation form with bad fields and says which', async () => {
    const admin = new Client(t.app);
    await admin.signIn('ada.admin@lanternfish.example');
    const res = await admin.send('post', `/api/studios/${t.seed.studioId}/invitations`, {
      email: 'not-an-email',
      roles: [],
    });
    expect(res.status).toBe(400);
    const paths = res.body.issues.map((i: { path: string }) => i.path).sort();
    expect(paths).toEqual(['email', 'roles']);
  });

  it('records role changes and removals in the audit log', async () => {
    const admin = new Client(t.app);
    await admin.signIn('ada.admin@lanternfish.example');
    const rosa = t.seed.userIds['rosa.reviewer@lanternfish.example']!;
    const ch = await admin.send('patch', `/api/studios/${t.seed.studioId}/members/${rosa}`, {
      roles: ['safety_reviewer', 'motion_engineer'],
    });
    expect(ch.status).toBe(200);
    expect(ch.body.roles).toEqual(['safety_reviewer', 'motion_engineer']);
    const log = await admin.get(`/api/studios/${t.seed.studioId}/audit?limit=5`).expect(200);
    const ev = log.body.events.find((e: { action: string }) => e.action === 'member.roles_changed');
    expect(ev.detail).toMatchObject({
      from: ['safety_reviewer'],
      to: ['safety_reviewer', 'motion_engineer'],
    });
  });
});
