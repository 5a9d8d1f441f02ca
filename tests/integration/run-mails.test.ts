// The run mails from the outside: the demo ride's cuts cued by the real worker handler queue "a run
// awaits review" to the safety reviewer, and a run held by the budget with a hard finding "a run is
// held" to the producer and motion engineer; a reviewer's hold over HTTP queues "a run is held" with
// the reason. The mails are sent through the real SMTP capture, read back and their links followed
// over HTTP. Who receives what is the demo scenario's (shared/demo.ts); names and states are read
// from the run API, not from the mail code.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { Client, startTestApp } from './support/app';
import { createApp } from '../../server/app';
import type { TestApp } from './support/app';
import { firstLink, testEnv, waitForMail } from './support/services';
import { createStorage } from '../../server/storage';
import { createMailer } from '../../server/mail';
import { seedDemoTrack } from '../../server/db/seed';
import { cueRuns, mailOutbox } from '../../server/db/schema';
import type { CueRunRow } from '../../server/db/schema';
import { sendDueMail } from '../../server/notifications/sender';
import { runDetailSchema } from '../../shared/schemas/pipeline';

let t: TestApp;
let storage: ReturnType<typeof createStorage>;
let mailer: ReturnType<typeof createMailer>;
let runs: CueRunRow[] = [];
const clients = new Map<string, Client>();
const as = (email: string) => clients.get(email)!;
const base = () => `/api/studios/${t.seed.studioId}`;
const REVIEWER = 'rosa.reviewer@lanternfish.example';
const PRODUCER = 'pia.producer@lanternfish.example';
const ENGINEER = 'eli.engineer@lanternfish.example';
const OPERATOR = 'otto.operator@lanternfish.example';
const ADMIN = 'ada.admin@lanternfish.example';

const hardCount = (r: CueRunRow) => (r.summary?.findings ?? []).filter((f) => f.severity === 'hard').length;
/** A finished run made reviewable again for the next case (as tests/integration/reviews.test.ts does). */
const resetState = (runId: string) =>
  t.tdb.db.update(cueRuns).set({ state: 'awaiting_review' }).where(eq(cueRuns.id, runId));
const outbox = () => t.tdb.db.select().from(mailOutbox);
const send = () =>
  sendDueMail({
    db: t.tdb.db,
    mailer,
    baseUrl: 'http://legwork.test',
    log: () => undefined,
    now: () => new Date(Date.now() + 1000),
    maxAttempts: 10,
    retryDelayS: 30,
  });
const runDetail = async (email: string, runId: string) => {
  const r = await as(email).get(`${base()}/runs/${runId}`);
  expect(r.status, JSON.stringify(r.body)).toBe(200);
  return runDetailSchema.parse(r.body);
};

beforeAll(async () => {
  t = await startTestApp({ queue: true, env: { LOGIN_RATE_LIMIT: '1000' } });
  storage = createStorage(testEnv(t.tdb.url));
  mailer = createMailer(testEnv(t.tdb.url));
  await seedDemoTrack(t.tdb.db, t.tdb.pool, storage, t.boss!, t.seed);
  runs = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.studioId, t.seed.studioId));
  for (const email of [REVIEWER, PRODUCER, ENGINEER]) {
    const c = new Client(t.app);
    await c.signIn(email);
    clients.set(email, c);
  }
}, 180_000);
afterAll(async () => {
  mailer.close();
  storage.close();
  await t.close();
});

describe('when the worker finishes a run', () => {
  it('queues "a run awaits review" to the safety reviewer for each run left for review, and no one else', async () => {
    const forReview = runs.filter((r) => r.state === 'awaiting_review' || r.state === 'held_by_budget');
    expect(forReview.length).toBeGreaterThan(0);
    const rows = (await outbox()).filter((r) => r.kind === 'run_awaiting_review');
    expect(rows.map((r) => r.toEmail).sort()).toEqual(forReview.map(() => REVIEWER));
    expect(rows.map((r) => r.path).sort()).toEqual(
      forReview.map((r) => `/s/${t.seed.studioId}/runs/${r.id}`).sort(),
    );
  });

  it('queues "a run is held" to the producer and the motion engineer for a budget hold with a hard finding only', async () => {
    const hardHeld = runs.filter((r) => r.state === 'held_by_budget' && hardCount(r) > 0);
    // The demo's hot cut runs the dome's legs out of stroke in the drop (a hard limit).
    expect(hardHeld.length).toBeGreaterThan(0);
    const rows = (await outbox()).filter((r) => r.kind === 'run_held');
    expect(rows.map((r) => `${r.path} ${r.toEmail}`).sort()).toEqual(
      hardHeld
        .flatMap((r) => [PRODUCER, ENGINEER].map((e) => `/s/${t.seed.studioId}/runs/${r.id} ${e}`))
        .sort(),
    );
    for (const who of [REVIEWER, OPERATOR, ADMIN]) expect(rows.some((r) => r.toEmail === who)).toBe(false);
  });

  it('sends them with the track, take, venue, state and a link that opens the run', async () => {
    await send();
    const hard = runs.find((r) => r.state === 'held_by_budget' && hardCount(r) > 0)!;
    const detail = await runDetail(PRODUCER, hard.id);
    const mail = await waitForMail(ENGINEER, new RegExp(`take ${detail.take.number} at ${detail.venueName}`));
    expect(mail.subject).toContain(detail.trackTitle);
    expect(mail.text).toContain(`${detail.trackTitle}, take ${detail.take.number} (${detail.take.fileName})`);
    expect(mail.text).toContain(`cued for ${detail.venueName}`);
    expect(mail.text).toContain('State: Held by budget');
    expect(mail.text).toMatch(/cannot be cleared/);
    expect(mail.text).toMatch(/Motion decisions rest with the ride engineer/);
    const link = firstLink(mail.text);
    expect(link.origin).toBe('http://legwork.test');
    expect(link.pathname).toBe(`/s/${t.seed.studioId}/runs/${hard.id}`);
    // Followed: the run behind the link is this one (the API of the page the link opens).
    const runId = link.pathname.split('/').pop()!;
    expect((await runDetail(ENGINEER, runId)).id).toBe(hard.id);

    const review = await waitForMail(
      REVIEWER,
      new RegExp(`take ${detail.take.number} at ${detail.venueName} awaits review`),
    );
    expect(firstLink(review.text).pathname).toBe(`/s/${t.seed.studioId}/runs/${hard.id}`);
    expect(review.text).toMatch(/hard finding/);
  });
});

describe('when a reviewer holds a run', () => {
  it('queues "a run is held" with the reason to the producer and the engineer, skipping one who opted out', async () => {
    const run = runs.find((r) => r.state === 'awaiting_review')!;
    expect(run).toBeDefined();
    await resetState(run.id);
    const off = await as(ENGINEER).send('put', '/api/me/notifications', {
      kinds: [{ kind: 'run_held', enabled: false }],
    });
    expect(off.status).toBe(200);
    await t.tdb.db.delete(mailOutbox);
    const reason = `Launch too sharp for the first row (${randomUUID().slice(0, 8)}).`;
    const held = await as(REVIEWER).send('post', `${base()}/runs/${run.id}/review`, {
      decision: 'hold',
      reason,
    });
    expect(held.status, JSON.stringify(held.body)).toBe(200);
    const rows = await outbox();
    expect(rows.map((r) => `${r.kind} ${r.toEmail}`)).toEqual([`run_held ${PRODUCER}`]);

    await send();
    const detail = await runDetail(PRODUCER, run.id);
    const mail = await waitForMail(
      PRODUCER,
      new RegExp(`take ${detail.take.number} at ${detail.venueName} is held$`),
    );
    expect(mail.text).toContain(`Reason: ${reason}`);
    expect(mail.text).toContain('State: Held');
    expect(mail.text).toContain('Rosa Lindqvist held');
    expect(firstLink(mail.text).pathname).toBe(`/s/${t.seed.studioId}/runs/${run.id}`);
    await as(ENGINEER).send('put', '/api/me/notifications', { kinds: [{ kind: 'run_held', enabled: true }] });
  });

  it('queues nothing for a refused hold (400 without a reason) or for a clear', async () => {
    await t.tdb.db.delete(mailOutbox);
    // The demo ride has a run with no finding (tests/integration/reviews.test.ts checks it).
    const run = runs.find((r) => r.summary !== null && r.summary.findings.length === 0)!;
    expect(run).toBeDefined();
    await resetState(run.id);
    const refused = await as(REVIEWER).send('post', `${base()}/runs/${run.id}/review`, {
      decision: 'hold',
      reason: '',
    });
    expect(refused.status).toBe(400);
    expect(await outbox()).toHaveLength(0);
    const cleared = await as(REVIEWER).send('post', `${base()}/runs/${run.id}/review`, {
      decision: 'clear',
      reason: '',
    });
    expect(cleared.status, JSON.stringify(cleared.body)).toBe(200);
    expect(await outbox()).toHaveLength(0);
  });
});

describe('mail down', () => {
  it('a hold and an invitation succeed when the app cannot reach SMTP', async () => {
    // The same database behind an app whose SMTP relay is a closed port.
    const env = testEnv(t.tdb.url, {
      SMTP_PORT: String(testEnv(t.tdb.url).SMTP_PORT + 6),
      LOGIN_RATE_LIMIT: '1000',
    });
    const down = createMailer(env);
    await expect(down.check()).rejects.toThrow();
    const other = createApp({
      env,
      db: t.tdb.db,
      pool: t.tdb.pool,
      storage,
      mailer: down,
      boss: t.boss,
      log: () => undefined,
    });
    try {
      const c = new Client(other.app);
      expect((await c.signIn(REVIEWER)).status).toBe(200);
      const run = runs.find((r) => r.summary !== null && hardCount(r) === 0)!;
      await resetState(run.id);
      await t.tdb.db.delete(mailOutbox);
      const held = await c.send('post', `${base()}/runs/${run.id}/review`, {
        decision: 'hold',
        reason: 'Checked with the SMTP relay down.',
      });
      expect(held.status, JSON.stringify(held.body)).toBe(200);
      const rows = await outbox();
      expect(rows.map((r) => r.toEmail).sort()).toEqual([ENGINEER, PRODUCER]);
      expect(rows.every((r) => r.sentAt === null)).toBe(true);

      // An invitation is mailed directly (its one-time link is never stored): with the relay down it
      // is still made, and the answer says its mail did not go.
      const admin = new Client(other.app);
      expect((await admin.signIn(ADMIN)).status).toBe(200);
      const inv = await admin.send('post', `${base()}/invitations`, {
        email: 'new.hire@lanternfish.example',
        roles: ['producer'],
      });
      expect(inv.status, JSON.stringify(inv.body)).toBe(201);
      expect(inv.body.mailSent).toBe(false);
      const list = await admin.get(`${base()}/invitations`);
      expect(list.body.map((i: { email: string }) => i.email)).toContain('new.hire@lanternfish.example');
      // With the relay working the same route says the mail went.
      const working = new Client(t.app);
      expect((await working.signIn(ADMIN)).status).toBe(200);
      const sent = await working.send('post', `${base()}/invitations`, {
        email: 'second.hire@lanternfish.example',
        roles: ['producer'],
      });
      expect(sent.status).toBe(201);
      expect(sent.body.mailSent).toBe(true);
      await waitForMail('second.hire@lanternfish.example', /invites you/);
    } finally {
      other.close();
      down.close();
    }
  });
});
