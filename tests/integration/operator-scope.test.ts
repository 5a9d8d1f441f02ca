// An operator's overview counts only their venues (issue: studio-wide figures leaked to operators), and
// the local mailbox, which needs no sign-in, answers only in an explicitly local installation.
// Expected figures are the fixture's, counted by hand; the members figure is checked against SQL
// written another way (`= ANY(venue_ids)` per venue rather than array overlap).
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import request from 'supertest';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { cueRuns, takes, tracks } from '../../server/db/schema';
import type { RunStateName as RunState } from '../../shared/schemas/pipeline';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ env: { LEGWORK_MODE: 'hosted' } });
  const studioId = t.seed.studioId;
  const { dome, arcade } = t.seed.venueIds;
  const track = async (title: string) =>
    (await t.tdb.db.insert(tracks).values({ studioId, title }).returning())[0]!.id;
  const take = async (trackId: string) =>
    (
      await t.tdb.db
        .insert(takes)
        .values({
          studioId,
          trackId,
          number: 1,
          kind: 'pose',
          layout: 'hexapod',
          fileName: 'take1.csv',
          storageKey: `studios/${studioId}/takes/${trackId}/take1.csv`,
          sizeBytes: 10,
          sha256: trackId.replace(/-/g, '').padEnd(64, '0'),
          samples: 2,
          duration_s: 1,
          uploadedVia: 'browser',
        })
        .returning()
    )[0]!.id;
  const run = (trackId: string, takeId: string, venueId: string, state: RunState) =>
    t.tdb.db.insert(cueRuns).values({
      studioId,
      trackId,
      takeId,
      venueId,
      budgetVersionId: t.seed.budgetVersionId,
      state,
    });
  // A: awaiting review at the Dome, held at the Arcade. B: failed at the Arcade only. C: no runs.
  const a = await track('Scope A');
  const aTake = await take(a);
  await run(a, aTake, dome, 'awaiting_review');
  await run(a, aTake, arcade, 'held_by_budget');
  const b = await track('Scope B');
  await run(b, await take(b), arcade, 'failed');
  await track('Scope C');
});
afterAll(async () => t.close());

type Counts = Record<
  'venues' | 'members' | 'tracks' | 'awaitingReview' | 'held' | 'failed' | 'released',
  number
>;

async function overview(email: string): Promise<Counts> {
  const c = new Client(t.app);
  await c.signIn(email);
  const r = await c.get(`/api/studios/${t.seed.studioId}/overview`);
  expect(r.status).toBe(200);
  return (r.body as { counts: Counts }).counts;
}

describe('overview figures', () => {
  it("an operator's figures count only their venue (the Dome)", async () => {
    const counts = await overview('otto.operator@lanternfish.example');
    const dome = t.seed.venueIds.dome;
    const members = await t.tdb.db.execute<{ n: number }>(
      sql`select count(*)::int as n from memberships where studio_id = ${t.seed.studioId} and ${dome}::uuid = any(venue_ids)`,
    );
    expect(counts).toMatchObject({
      venues: 1,
      tracks: 1, // only A has a run at the Dome
      awaitingReview: 1,
      held: 0, // A's hold is at the Arcade
      failed: 0, // B failed at the Arcade
      released: 0,
      members: members.rows[0]!.n,
    });
    expect(counts.members).toBeGreaterThanOrEqual(1); // the operator themself
  });

  it('a producer still sees the whole studio', async () => {
    const counts = await overview('pia.producer@lanternfish.example');
    const all = await t.tdb.db.execute<{ n: number }>(
      sql`select count(*)::int as n from memberships where studio_id = ${t.seed.studioId}`,
    );
    expect(counts).toMatchObject({
      venues: 2,
      tracks: 3,
      awaitingReview: 1,
      held: 1,
      failed: 1,
      members: all.rows[0]!.n,
    });
    expect(counts.members).toBeGreaterThan(1);
  });
});

describe('local mailbox', () => {
  const dir = mkdtempSync(join(tmpdir(), 'legwork-mailbox-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('is 404 with a capture folder set but not in local mode, in production and in hosted mode', async () => {
    for (const env of <Record<string, string>[]>[
      { MAIL_CAPTURE_DIR: dir, NODE_ENV: 'production' },
      { MAIL_CAPTURE_DIR: dir, NODE_ENV: 'development', LEGWORK_MODE: 'hosted' },
      { MAIL_CAPTURE_DIR: dir },
    ]) {
      const app = await startTestApp({ env: { LEGWORK_MODE: 'hosted', ...env } });
      try {
        const r = await request(app.app).get('/api/dev/mailbox');
        expect(r.status, JSON.stringify(env)).toBe(404);
        expect((r.body as { error: string }).error).toMatch(/LEGWORK_MODE=local/);
        expect((await request(app.app).get('/api/dev/mailbox/anything')).status).toBe(404);
      } finally {
        await app.close();
      }
    }
  });

  it('answers in local mode with the capture, and is off in local mode without it', async () => {
    let app = await startTestApp({
      env: { LEGWORK_MODE: 'local', MAIL_CAPTURE_DIR: dir, NODE_ENV: 'production' },
    });
    try {
      const r = await request(app.app).get('/api/dev/mailbox');
      expect(r.status).toBe(200);
      expect(r.body).toEqual({ enabled: true, messages: [] });
    } finally {
      await app.close();
    }
    app = await startTestApp({ env: { LEGWORK_MODE: 'local', MAIL_CAPTURE_DIR: '' } });
    try {
      expect((await request(app.app).get('/api/dev/mailbox')).status).toBe(404);
    } finally {
      await app.close();
    }
  });
});
