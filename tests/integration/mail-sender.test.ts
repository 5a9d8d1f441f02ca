// The outbox sender on the real services: with the SMTP server unreachable (a real nodemailer transport
// to a closed port) rows stay queued with the error and back off; once the SMTP capture is reachable
// each is delivered exactly once, read back from the capture; two senders on two connection pools
// racing over the same rows deliver each once (row locks skipped, not shared: the SKIP LOCKED queue
// pattern of the PostgreSQL manual, SELECT ... FOR UPDATE SKIP LOCKED).
import { randomBytes } from 'node:crypto';
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inArray } from 'drizzle-orm';
import { createTestDb, testEnv } from './support/services';
import type { Mail, TestDb } from './support/services';
import { openDb } from '../../server/db/client';
import { seedDemo } from '../../server/db/seed';
import { mailOutbox } from '../../server/db/schema';
import { createMailer } from '../../server/mail';
import type { Mailer } from '../../server/mail';
import { queueMail } from '../../server/notifications/outbox';
import { sendDueMail, startMailSender } from '../../server/notifications/sender';
import type { SenderDeps } from '../../server/notifications/sender';
import { appPaths } from '../../shared/app-paths';

let tdb: TestDb;
let seed: Awaited<ReturnType<typeof seedDemo>>;
let working: Mailer;
let broken: Mailer;
const PRODUCER = 'pia.producer@lanternfish.example';
const ENGINEER = 'eli.engineer@lanternfish.example';
const REVIEWER = 'rosa.reviewer@lanternfish.example';
// The senders' clock: an hour ahead of the rows' queue time (next_attempt_at defaults to now()).
const t0 = new Date(Math.ceil(Date.now() / 1000) * 1000 + 3_600_000);

/** Every captured mail whose subject contains `tag`. */
async function captured(tag: string): Promise<Mail[]> {
  const dir = process.env.MAIL_CAPTURE_DIR;
  if (!dir) throw new Error('MAIL_CAPTURE_DIR is not set: run through `npm test` or `npm run services`.');
  const out: Mail[] = [];
  for (const n of (await readdir(dir)).filter((x) => x.endsWith('.json'))) {
    const m = JSON.parse(await readFile(join(dir, n), 'utf8')) as Mail;
    if (m.subject.includes(tag)) out.push(m);
  }
  return out;
}

/** Polls (no fixed sleep) until `n` mails tagged `tag` are in the capture, then answers them. */
async function waitForCaptured(tag: string, n: number, timeout_ms = 15_000): Promise<Mail[]> {
  const until = Date.now() + timeout_ms;
  for (;;) {
    const got = await captured(tag);
    if (got.length >= n || Date.now() > until) return got;
    await new Promise((r) => setTimeout(r, 50));
  }
}

const deps = (over: Partial<SenderDeps> = {}): SenderDeps => ({
  db: tdb.db,
  mailer: working,
  baseUrl: 'http://legwork.test',
  log: () => undefined,
  now: () => t0,
  maxAttempts: 10,
  retryDelayS: 30,
  ...over,
});

async function queue(tag: string, emails: string[]): Promise<string[]> {
  await queueMail(tdb.db, {
    studioId: seed.studioId,
    kind: 'run_held',
    userIds: emails.map((e) => seed.userIds[e]!),
    subject: `Legwork: a run is held [${tag}]`,
    text: 'Breakwater Chase is held.',
    path: appPaths.run(seed.studioId, '00000000-0000-4000-8000-000000000002'),
  });
  const rows = await tdb.db.select().from(mailOutbox);
  return rows.filter((r) => r.subject.includes(`[${tag}]`)).map((r) => r.id);
}

beforeAll(async () => {
  tdb = await createTestDb();
  seed = await seedDemo(tdb.db);
  const env = testEnv(tdb.url);
  working = createMailer(env);
  // A port beside the SMTP capture where nothing listens: connection refused, as when SMTP is down.
  broken = createMailer({ ...env, SMTP_PORT: env.SMTP_PORT + 6 });
}, 60_000);
afterAll(async () => {
  working.close();
  broken.close();
  await tdb.drop();
});

describe('mail that cannot be sent now is sent later', () => {
  it('keeps rows queued with the error while SMTP is down, then sends each exactly once', async () => {
    const tag = randomBytes(4).toString('hex');
    const ids = await queue(tag, [PRODUCER, ENGINEER]);
    expect(ids).toHaveLength(2);

    expect(await sendDueMail(deps({ mailer: broken }))).toEqual({ sent: 0, failed: 2 });
    let rows = await tdb.db.select().from(mailOutbox).where(inArray(mailOutbox.id, ids));
    for (const r of rows) {
      expect(r.sentAt).toBeNull();
      expect(r.attempts).toBe(1);
      expect(r.lastError).toMatch(/ECONNREFUSED|connect/i);
      // First wait: MAIL_RETRY_DELAY_S (30 s) after the failed try.
      expect(r.nextAttemptAt.getTime() - t0.getTime()).toBe(30_000);
    }
    // Not due again before its time, whichever mailer.
    expect(await sendDueMail(deps({ now: () => new Date(t0.getTime() + 29_000) }))).toEqual({
      sent: 0,
      failed: 0,
    });

    // A second failure doubles the wait: 60 s after that try.
    const t1 = new Date(t0.getTime() + 30_000);
    expect(await sendDueMail(deps({ mailer: broken, now: () => t1 }))).toEqual({ sent: 0, failed: 2 });
    rows = await tdb.db.select().from(mailOutbox).where(inArray(mailOutbox.id, ids));
    for (const r of rows) {
      expect(r.attempts).toBe(2);
      expect(r.nextAttemptAt.getTime() - t1.getTime()).toBe(60_000);
    }
    expect(await captured(tag)).toHaveLength(0);

    // SMTP is back.
    const t2 = new Date(t1.getTime() + 60_000);
    expect(await sendDueMail(deps({ now: () => t2 }))).toEqual({ sent: 2, failed: 0 });
    rows = await tdb.db.select().from(mailOutbox).where(inArray(mailOutbox.id, ids));
    for (const r of rows) {
      expect(r.sentAt?.getTime()).toBe(t2.getTime());
      expect(r.attempts).toBe(3);
      expect(r.lastError).toBeNull();
    }
    // Later passes find nothing more to send.
    expect(await sendDueMail(deps({ now: () => new Date(t2.getTime() + 86_400_000) }))).toEqual({
      sent: 0,
      failed: 0,
    });
    const mails = await waitForCaptured(tag, 2);
    expect(mails.map((m) => m.to).sort()).toEqual([[ENGINEER], [PRODUCER]]);
    for (const m of mails) {
      expect(m.text).toContain('Breakwater Chase is held.');
      const link = new URL(/https?:\/\/\S+/.exec(m.text)![0]);
      expect(link.origin).toBe('http://legwork.test');
      expect(link.pathname).toBe(`/s/${seed.studioId}/runs/00000000-0000-4000-8000-000000000002`);
    }
  });

  it('gives up after MAIL_MAX_ATTEMPTS tries and leaves the row with its last error', async () => {
    const tag = randomBytes(4).toString('hex');
    const ids = await queue(tag, [REVIEWER]);
    let at = t0.getTime();
    for (let i = 0; i < 3; i++) {
      expect(await sendDueMail(deps({ mailer: broken, maxAttempts: 3, now: () => new Date(at) }))).toEqual({
        sent: 0,
        failed: 1,
      });
      at += 3_600_000;
    }
    expect(await sendDueMail(deps({ maxAttempts: 3, now: () => new Date(at) }))).toEqual({
      sent: 0,
      failed: 0,
    });
    const [row] = await tdb.db.select().from(mailOutbox).where(inArray(mailOutbox.id, ids));
    expect(row).toMatchObject({ attempts: 3, sentAt: null });
    expect(row!.lastError).toBeTruthy();
    await tdb.db.delete(mailOutbox).where(inArray(mailOutbox.id, ids));
  });
});

describe('several workers', () => {
  it('two senders racing over the same rows send each row once', async () => {
    const tag = randomBytes(4).toString('hex');
    const emails = [PRODUCER, ENGINEER, REVIEWER];
    const ids: string[] = [];
    for (let i = 0; i < 12; i++) ids.push(...(await queue(`${tag}-${i}`, emails)));
    expect(new Set(ids).size).toBe(36);
    const sends = new Map<string, number>();
    const counting = (who: string): Mailer => ({
      send: async (msg) => {
        // A little time per mail so the two passes overlap.
        await new Promise((r) => setTimeout(r, 5));
        sends.set(who, (sends.get(who) ?? 0) + 1);
        await working.send(msg);
      },
      check: () => working.check(),
      close: () => undefined,
    });
    // A second worker's handle: workers act across studios.
    const other = openDb(tdb.url, { max: 2, outsideScope: 'all' });
    try {
      const a = startMailSender(deps({ mailer: counting('a'), batchSize: 4 }), 20);
      const b = startMailSender(deps({ db: other.db, mailer: counting('b'), batchSize: 4 }), 20);
      const until = Date.now() + 30_000;
      for (;;) {
        const rows = await tdb.db.select().from(mailOutbox).where(inArray(mailOutbox.id, ids));
        if (rows.every((r) => r.sentAt !== null) || Date.now() > until) break;
        await new Promise((r) => setTimeout(r, 50));
      }
      await Promise.all([a.stop(), b.stop()]);
    } finally {
      await other.pool.end();
    }
    const rows = await tdb.db.select().from(mailOutbox).where(inArray(mailOutbox.id, ids));
    expect(rows.every((r) => r.sentAt !== null && r.attempts === 1)).toBe(true);
    expect((sends.get('a') ?? 0) + (sends.get('b') ?? 0)).toBe(36);
    // Both took part: the race was real.
    expect(sends.get('a')).toBeGreaterThan(0);
    expect(sends.get('b')).toBeGreaterThan(0);
    // Read back from the capture: each of the 36 (subject, address) pairs exactly once.
    const mails = await waitForCaptured(tag, 36);
    const pairs = mails.map((m) => `${m.subject} ${m.to.join(',')}`);
    expect(pairs).toHaveLength(36);
    expect(new Set(pairs).size).toBe(36);
  });
});
