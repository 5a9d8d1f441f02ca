// Reviews from the outside: the demo ride's cuts cued by the real worker handler, then cleared and
// held over HTTP. The rules checked are the product's own (a hard finding cannot be cleared, a
// reviewer does not clear their own work, a hold needs a reason): separation of duties is common
// practice in safety review (the four-eyes principle).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { testEnv } from './support/services';
import { createStorage } from '../../server/storage';
import { seedDemoReviews, seedDemoTrack } from '../../server/db/seed';
import { auditEvents, cueRuns, memberships, takes } from '../../server/db/schema';
import type { CueRunRow } from '../../server/db/schema';
import { reviewedRunSchema, runDecisionSchema } from '../../shared/schemas/review';
import { engineerHomeSchema, reviewQueueSchema } from '../../shared/schemas/homes';

let t: TestApp;
let storage: ReturnType<typeof createStorage>;
const clients = new Map<string, Client>();
let runs: CueRunRow[] = [];
let seeded: Awaited<ReturnType<typeof seedDemoTrack>> = [];

const base = () => `/api/studios/${t.seed.studioId}`;
const as = (email: string) => clients.get(email)!;
const REVIEWER = 'rosa.reviewer@lanternfish.example';
const PRODUCER = 'pia.producer@lanternfish.example';
const ENGINEER = 'eli.engineer@lanternfish.example';
const OPERATOR = 'otto.operator@lanternfish.example';

const counts = (r: CueRunRow) => {
  const f = r.summary?.findings ?? [];
  return {
    hard: f.filter((x) => x.severity === 'hard').length,
    comfort: f.filter((x) => x.severity === 'comfort').length,
  };
};
const pick = (pred: (c: { hard: number; comfort: number }) => boolean, skip: string[] = []) => {
  const r = runs.find((x) => x.summary && pred(counts(x)) && !skip.includes(x.id));
  if (!r) throw new Error('the demo ride has no run of that kind');
  return r;
};
const review = (email: string, runId: string, body: object) =>
  as(email).send('post', `${base()}/runs/${runId}/review`, body);
const decision = async (email: string, runId: string) => {
  const r = await as(email).get(`${base()}/runs/${runId}/decision`);
  expect(r.status, JSON.stringify(r.body)).toBe(200);
  return runDecisionSchema.parse(r.body);
};
/** A run of the demo's kind made reviewable again for the next case (a fresh copy of its state). */
async function resetState(runId: string, state: CueRunRow['state']) {
  await t.tdb.db.update(cueRuns).set({ state }).where(eq(cueRuns.id, runId));
}

beforeAll(async () => {
  t = await startTestApp({ queue: true, env: { LOGIN_RATE_LIMIT: '1000' } });
  storage = createStorage(testEnv(t.tdb.url));
  seeded = await seedDemoTrack(t.tdb.db, t.tdb.pool, storage, t.boss!, t.seed);
  runs = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.studioId, t.seed.studioId));
  for (const email of [REVIEWER, PRODUCER, ENGINEER, OPERATOR]) {
    const c = new Client(t.app);
    await c.signIn(email);
    clients.set(email, c);
  }
}, 120_000);
afterAll(async () => {
  storage.close();
  await t.close();
});

describe('the demo ride gives every kind of run a reviewer meets', () => {
  it('has a run with no finding, one with comfort findings only and one with a hard finding', () => {
    expect(() => pick((c) => c.hard === 0 && c.comfort === 0)).not.toThrow();
    expect(() => pick((c) => c.hard === 0 && c.comfort > 0)).not.toThrow();
    expect(() => pick((c) => c.hard > 0)).not.toThrow();
  });
});

describe('clear and hold', () => {
  it('refuses to clear a run with a hard finding, with or without a reason (409)', async () => {
    const hard = pick((c) => c.hard > 0);
    const d = await decision(REVIEWER, hard.id);
    expect(d.actions.clear.allowed).toBe(false);
    expect(d.actions.clear.why).toMatch(/hard finding/);
    expect(d.actions.hold.allowed).toBe(true);
    const r = await review(REVIEWER, hard.id, { decision: 'clear', reason: 'looks fine to me' });
    expect(r.status, JSON.stringify(r.body)).toBe(409);
    expect((r.body as { error: string }).error).toMatch(/no one can clear it/);
    const [row] = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.id, hard.id));
    expect(row!.state).toBe(hard.state);
  });

  it('needs a reason to hold (400) and keeps who, when, why and the budget version', async () => {
    const hard = pick((c) => c.hard > 0);
    const none = await review(REVIEWER, hard.id, { decision: 'hold', reason: '   ' });
    expect(none.status).toBe(400);
    expect((none.body as { issues: { path: string }[] }).issues[0]!.path).toBe('reason');
    const ok = await review(REVIEWER, hard.id, {
      decision: 'hold',
      reason: 'Leg 3 runs out of stroke in the drop.',
    });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    const run = reviewedRunSchema.parse(ok.body);
    expect(run.state).toBe('held');
    expect(run.reviews).toHaveLength(1);
    const rev = run.reviews[0]!;
    expect(rev.decision).toBe('hold');
    expect(rev.reason).toBe('Leg 3 runs out of stroke in the drop.');
    expect(rev.reviewer.email).toBe(REVIEWER);
    expect(rev.budgetVersion.id).toBe(hard.budgetVersionId);
    expect(rev.fromState).toBe(hard.state);
    expect(rev.toState).toBe('held');
    const audit = await t.tdb.db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.action, 'review.held'), eq(auditEvents.subjectId, hard.id)));
    expect(audit).toHaveLength(1);
    // The engineer's home lists it to cue again, with the reviewer's words.
    const home = await as(ENGINEER).get(`${base()}/home/engineer`);
    expect(home.status).toBe(200);
    const held = engineerHomeSchema.parse(home.body).held.find((x) => x.id === hard.id);
    expect(held?.lastReview?.reason).toBe('Leg 3 runs out of stroke in the drop.');
  });

  it('needs a reason to clear a run with comfort findings, then clears it', async () => {
    const comfort = pick((c) => c.hard === 0 && c.comfort > 0);
    const d = await decision(REVIEWER, comfort.id);
    expect(d.actions.clear).toMatchObject({ allowed: true, reasonRequired: true });
    const none = await review(REVIEWER, comfort.id, { decision: 'clear' });
    expect(none.status).toBe(400);
    expect((none.body as { error: string }).error).toMatch(/comfort finding/);
    const ok = await review(REVIEWER, comfort.id, {
      decision: 'clear',
      reason: 'Brief vertical dose over the comfort line in the bumps; accepted for this ride.',
    });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(reviewedRunSchema.parse(ok.body).state).toBe('cleared');
  });

  it('clears a run with no finding without a reason, and holds a cleared run again before release', async () => {
    const clean = pick((c) => c.hard === 0 && c.comfort === 0);
    const d = await decision(REVIEWER, clean.id);
    expect(d.actions.clear).toMatchObject({ allowed: true, reasonRequired: false, why: null });
    const ok = await review(REVIEWER, clean.id, { decision: 'clear' });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    const again = await review(REVIEWER, clean.id, { decision: 'clear' });
    expect(again.status).toBe(409);
    const hold = await review(REVIEWER, clean.id, {
      decision: 'hold',
      reason: 'Waiting for the new seat map.',
    });
    expect(hold.status).toBe(200);
    expect(reviewedRunSchema.parse(hold.body).reviews.map((r) => r.decision)).toEqual(['hold', 'clear']);
    await resetState(clean.id, 'awaiting_review');
  });

  it('lets only one of two parallel reviews of a run apply', async () => {
    const clean = pick((c) => c.hard === 0 && c.comfort === 0);
    await resetState(clean.id, 'awaiting_review');
    const [a, b] = await Promise.all([
      review(REVIEWER, clean.id, { decision: 'clear' }),
      review(REVIEWER, clean.id, { decision: 'clear' }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    await resetState(clean.id, 'awaiting_review');
  });
});

describe('who may review', () => {
  it('refuses a producer, an engineer and an operator (403), and hides runs from an operator', async () => {
    const clean = pick((c) => c.hard === 0 && c.comfort === 0);
    for (const email of [PRODUCER, ENGINEER, OPERATOR]) {
      const r = await review(email, clean.id, { decision: 'hold', reason: 'not mine to say' });
      expect(r.status, email).toBe(403);
    }
    expect((await as(OPERATOR).get(`${base()}/runs/${clean.id}/decision`)).status).toBe(403);
    const d = await decision(PRODUCER, clean.id);
    expect(d.actions.clear.allowed).toBe(false);
    expect(d.actions.clear.why).toMatch(/safety reviewer/);
  });

  it('refuses a reviewer who asked for the run or uploaded its take (separation of duties, 403)', async () => {
    const clean = pick((c) => c.hard === 0 && c.comfort === 0);
    await resetState(clean.id, 'awaiting_review');
    const pia = t.seed.userIds[PRODUCER]!;
    const eli = t.seed.userIds[ENGINEER]!;
    // The producer of the demo ride is made a reviewer too.
    await t.tdb.db
      .update(memberships)
      .set({ roles: ['producer', 'safety_reviewer'] })
      .where(and(eq(memberships.studioId, t.seed.studioId), eq(memberships.userId, pia)));
    // She uploaded the take and asked for the run.
    const asked = await review(PRODUCER, clean.id, { decision: 'clear' });
    expect(asked.status).toBe(403);
    expect((asked.body as { error: string }).error).toMatch(/You asked for this run/);
    // Someone else asked for it; she still uploaded its take.
    await t.tdb.db.update(cueRuns).set({ requestedBy: eli }).where(eq(cueRuns.id, clean.id));
    const uploaded = await review(PRODUCER, clean.id, { decision: 'clear' });
    expect(uploaded.status).toBe(403);
    expect((uploaded.body as { error: string }).error).toMatch(/You uploaded this run's take/);
    // Neither: she may clear it.
    await t.tdb.db.update(takes).set({ uploadedBy: eli }).where(eq(takes.id, clean.takeId));
    const ok = await review(PRODUCER, clean.id, { decision: 'clear' });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    await t.tdb.db
      .update(memberships)
      .set({ roles: ['producer'] })
      .where(and(eq(memberships.studioId, t.seed.studioId), eq(memberships.userId, pia)));
    await resetState(clean.id, 'awaiting_review');
  });

  it('answers 404 for a run of another studio, even to a reviewer', async () => {
    const clean = pick((c) => c.hard === 0 && c.comfort === 0);
    const r = await as(REVIEWER).send(
      'post',
      `/api/studios/${t.seed.secondStudioId}/runs/${clean.id}/review`,
      {
        decision: 'hold',
        reason: 'x',
      },
    );
    expect(r.status).toBe(404);
  });
});

describe('the review queue', () => {
  it('lists runs awaiting a decision, worst first', async () => {
    const r = await as(REVIEWER).get(`${base()}/home/review`);
    expect(r.status).toBe(200);
    const q = reviewQueueSchema.parse(r.body).runs;
    expect(q.length).toBeGreaterThan(0);
    for (const x of q) expect(['awaiting_review', 'held_by_budget']).toContain(x.state);
    for (let i = 1; i < q.length; i++) {
      const [a, b] = [q[i - 1]!, q[i]!];
      expect(
        a.hardFindings > b.hardFindings ||
          (a.hardFindings === b.hardFindings && a.comfortFindings >= b.comfortFindings),
      ).toBe(true);
    }
  });
});

describe('the demo seed', () => {
  it('holds a run with a hard finding and clears one with none, through the same rules', async () => {
    for (const r of runs) await resetState(r.id, r.state);
    await seedDemoReviews(t.tdb.db, t.seed, seeded);
    const hard = pick((c) => c.hard > 0);
    const clean = pick((c) => c.hard === 0 && c.comfort === 0);
    const h = await decision(REVIEWER, hard.id);
    expect(h.state).toBe('held');
    expect(h.reviews[0]).toMatchObject({ decision: 'hold', reviewer: { email: REVIEWER } });
    expect(h.reviews[0]!.reason.length).toBeGreaterThan(10);
    expect((await decision(REVIEWER, clean.id)).state).toBe('cleared');
    // Something is still left for the reviewer's queue.
    const q = reviewQueueSchema.parse((await as(REVIEWER).get(`${base()}/home/review`)).body).runs;
    expect(q.length).toBeGreaterThan(0);
  });
});
