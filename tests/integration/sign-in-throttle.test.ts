// Password guessing from outside over HTTP: every route that checks a password shares the limits
// per account (the address as compared: trimmed, lower case), per client and overall, and
// X-Forwarded-For counts only when TRUST_PROXY names a proxy. Limits per OWASP's Authentication
// Cheat Sheet ("Protect Against Automated Attacks": throttle per account and per source), common
// practice for the exact figures.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { firstLink, waitForMail } from './support/services';
import { users } from '../../server/db/schema';
import { hashPassword } from '../../server/auth/passwords';
import { DEMO_PASSWORD } from '../../shared/demo';

const PIA = 'pia.producer@lanternfish.example';

describe('per account', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp({ env: { LOGIN_RATE_LIMIT: '3', LOGIN_RATE_LIMIT_PER_CLIENT: '100' } });
  });
  afterAll(async () => t.close());

  it('counts spaced and capitalised spellings of one address together', async () => {
    const c = new Client(t.app);
    const spellings = [`  ${PIA}`, PIA.toUpperCase(), `${PIA}\t`];
    const statuses = [];
    for (const s of spellings) statuses.push((await c.signIn(s, 'a-wrong-guess')).status);
    expect(statuses).toEqual([401, 401, 401]);
    // The right password is refused too while the account is locked, however it is spelt.
    const plain = await c.signIn(PIA);
    expect(plain.status).toBe(429);
    expect(plain.body.error).toMatch(/for this account/);
    expect((await c.signIn(`  ${PIA.toUpperCase()} `)).status).toBe(429);
    // Another account from the same client is not locked.
    expect((await new Client(t.app).signIn('rosa.reviewer@lanternfish.example')).status).toBe(200);
  });

  it('limits password guesses through accepting an invitation as an existing user', async () => {
    const email = 'vic.visitor@elsewhere.example';
    await t.tdb.db
      .insert(users)
      .values({ email, name: 'Vic Marsh', passwordHash: await hashPassword(DEMO_PASSWORD) });
    const admin = new Client(t.app);
    expect((await admin.signIn('ada.admin@lanternfish.example')).status).toBe(200);
    const inv = await admin.send('post', `/api/studios/${t.seed.studioId}/invitations`, {
      email,
      roles: ['producer'],
    });
    expect(inv.status).toBe(201);
    const mail = await waitForMail(email, /invites you to/);
    const token = firstLink(mail.text).pathname.split('/').pop()!;
    const c = new Client(t.app);
    await c.refreshCsrf();
    const statuses = [];
    for (let i = 0; i < 3; i++)
      statuses.push(
        (await c.send('post', `/api/invitations/${token}/accept`, { password: `a-wrong-password-${i}` }))
          .status,
      );
    expect(statuses).toEqual([401, 401, 401]);
    const right = await c.send('post', `/api/invitations/${token}/accept`, { password: DEMO_PASSWORD });
    expect(right.status).toBe(429);
    // The invitation path and sign-in share one count per account.
    expect((await new Client(t.app).signIn(email)).status).toBe(429);
  });
});

describe('per client, with no proxy configured', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp({ env: { LOGIN_RATE_LIMIT: '100', LOGIN_RATE_LIMIT_PER_CLIENT: '4' } });
  });
  afterAll(async () => t.close());

  it('ignores X-Forwarded-For and refuses a client that tries many accounts', async () => {
    const statuses = [];
    for (let i = 0; i < 6; i++) {
      const c = new Client(t.app);
      await c.refreshCsrf();
      const res = await c
        .raw('post', '/api/auth/login')
        .set('x-forwarded-for', `203.0.113.${i + 1}`)
        .send({ email: `nobody${i}@lanternfish.example`, password: 'a-wrong-guess' });
      statuses.push(res.status);
      if (res.status === 429) expect(res.body.error).toMatch(/from this address/);
    }
    expect(statuses).toEqual([401, 401, 401, 401, 429, 429]);
  });
});

describe('behind a configured proxy', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp({
      env: {
        TRUST_PROXY: 'loopback',
        LOGIN_RATE_LIMIT: '100',
        LOGIN_RATE_LIMIT_PER_CLIENT: '2',
        LOGIN_RATE_LIMIT_GLOBAL: '5',
      },
    });
  });
  afterAll(async () => t.close());

  const attempt = async (from: string, email: string, password = 'a-wrong-guess') => {
    const c = new Client(t.app);
    await c.refreshCsrf();
    return c.raw('post', '/api/auth/login').set('x-forwarded-for', from).send({ email, password });
  };

  it('counts each forwarded client apart, under one ceiling for the server', async () => {
    // Two refusals lock the first forwarded client, not the second.
    expect((await attempt('198.51.100.1', 'a@lanternfish.example')).status).toBe(401);
    expect((await attempt('198.51.100.1', 'b@lanternfish.example')).status).toBe(401);
    const locked = await attempt('198.51.100.1', 'c@lanternfish.example');
    expect(locked.status).toBe(429);
    expect(locked.body.error).toMatch(/from this address/);
    // Three refusals counted so far overall; two more clients bring it to five.
    expect((await attempt('198.51.100.2', 'd@lanternfish.example')).status).toBe(401);
    expect((await attempt('198.51.100.3', 'e@lanternfish.example')).status).toBe(401);
    const ceiling = await attempt('198.51.100.4', PIA, DEMO_PASSWORD);
    expect(ceiling.status).toBe(429);
    expect(ceiling.body.error).toMatch(/on this server/);
  });
});

describe('password reset links', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp({ env: { LOGIN_RATE_LIMIT: '3', LOGIN_RATE_LIMIT_PER_CLIENT: '100' } });
  });
  afterAll(async () => t.close());

  const tokenOf = (mail: { text: string }) => firstLink(mail.text).searchParams.get('token')!;

  it('one link works once under parallel confirms, and a reset voids the older links', async () => {
    // An address of this run alone, so no earlier mail can match.
    const email = `reset.${Date.now()}@elsewhere.example`;
    await t.tdb.db
      .insert(users)
      .values({ email, name: 'Rue Hollis', passwordHash: await hashPassword(DEMO_PASSWORD) });
    const c = new Client(t.app);
    await c.refreshCsrf();
    expect((await c.send('post', '/api/auth/password-reset', { email })).status).toBe(202);
    const older = tokenOf(await waitForMail(email, /new password/));
    expect((await c.send('post', '/api/auth/password-reset', { email })).status).toBe(202);
    let newer = older;
    const deadline = Date.now() + 15_000;
    while (newer === older && Date.now() < deadline)
      newer = tokenOf(await waitForMail(email, /new password/));
    expect(newer).not.toBe(older);
    const confirms = await Promise.all(
      [0, 1, 2, 3].map(() =>
        c.send('post', '/api/auth/password-reset/confirm', { token: newer, password: 'a-fresh-password-1' }),
      ),
    );
    expect(confirms.map((r) => r.status).sort()).toEqual([204, 400, 400, 400]);
    const old = await c.send('post', '/api/auth/password-reset/confirm', {
      token: older,
      password: 'another-password-2',
    });
    expect(old.status).toBe(400);
    expect(old.body.error).toMatch(/not valid any more/);
    expect((await new Client(t.app).signIn(email, 'a-fresh-password-1')).status).toBe(200);
  });

  it('limits reset requests per address, answering unknown addresses the same', async () => {
    const c = new Client(t.app);
    await c.refreshCsrf();
    const statuses = [];
    for (const email of ['  Pia.Producer@lanternfish.example', PIA, PIA, PIA])
      statuses.push((await c.send('post', '/api/auth/password-reset', { email })).status);
    expect(statuses).toEqual([202, 202, 202, 429]);
    const unknown = await c.send('post', '/api/auth/password-reset', { email: 'ghost@lanternfish.example' });
    expect(unknown.status).toBe(202);
    expect(unknown.body).toEqual({ sent: true });
  });
});
