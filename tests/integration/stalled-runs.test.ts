// Runs whose worker stopped answering, and asking again for a run, against the real services: the
// heartbeat the worker writes, the sweep that takes a stalled run over under a new job, the old job
// that must then change nothing, and the requeue route with its role and state rules.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { auditEvents, cueRuns } from '../../server/db/schema';
import { startCueWorker } from './support/cue-worker';
import type { CueWorker } from './support/cue-worker';
import { makeVehicleCsv } from '../factories/takes';
import {
  runDetailSchema,
  runSummarySchema,
  trackDetailSchema,
  uploadedTakeSchema,
} from '../../shared/schemas/pipeline';
import { sweepStalledRuns } from '../../server/pipeline/stalled-runs';

const policy = { stall_s: 60, retry: { limit: 2, delay_s: 1 } };
let t: TestApp;
let producer: Client;
let worker: CueWorker;

beforeAll(async () => {
  t = await startTestApp({
    queue: true,
    env: {
      CUE_RUN_RETRY_LIMIT: '2',
      CUE_RUN_RETRY_DELAY_S: '1',
      LOGIN_RATE_LIMIT: '1000',
      RUN_STALL_S: '60',
    },
  });
  worker = await startCueWorker(t);
  producer = new Client(t.app);
  await producer.signIn('pia.producer@lanternfish.example');
}, 60_000);
afterAll(async () => {
  worker.close();
  await t.close();
});

const base = () => `/api/studios/${t.seed.studioId}`;
const settled = (s: string) => s !== 'queued' && s !== 'cueing';

/** A finished run of a fresh 3 s take at the dome. */
async function finishedRun(title: string) {
  const tr = await producer.send('post', `${base()}/tracks`, { title, film: 'Undertow (fictional)' });
  const track = trackDetailSchema.parse(tr.body);
  const up = await producer
    .raw('post', `${base()}/tracks/${track.id}/takes?fileName=ride.csv`)
    .set('content-type', 'application/octet-stream')
    .send(Buffer.from(makeVehicleCsv({ duration_s: 3 })));
  const take = uploadedTakeSchema.parse(up.body);
  const r = await producer.send('post', `${base()}/takes/${take.id}/runs`, {
    venueIds: [t.seed.venueIds.dome],
  });
  const [run] = runSummarySchema.array().parse(r.body);
  return worker.waitForRun(run!.id, settled);
}

/** What a worker killed mid-run leaves behind: cueing at 40 %, no result, its last heartbeat `ago_s` back. */
async function leaveHalfDone(runId: string, ago_s: number) {
  await t.tdb.db
    .update(cueRuns)
    .set({
      state: 'cueing',
      progress: 40,
      summary: null,
      finishedAt: null,
      heartbeatAt: new Date(Date.now() - ago_s * 1000),
    })
    .where(eq(cueRuns.id, runId));
}

const auditOf = (runId: string, action: string) =>
  t.tdb.db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.subjectId, runId), eq(auditEvents.action, action)));

describe('stalled runs', () => {
  it('the worker writes a heartbeat while it cues and clears it when done', async () => {
    const run = await finishedRun('Heartbeat Hill');
    expect(run.startedAt).not.toBeNull();
    // Cleared at the end: a finished run has no worker to vouch for it.
    expect(run.heartbeatAt).toBeNull();
    expect(['awaiting_review', 'held_by_budget']).toContain(run.state);
  });

  it('shows a run as stalled, takes it over under a new job, finishes it once, and the old job changes nothing', async () => {
    const done = await finishedRun('Lost Worker Loop');
    await leaveHalfDone(done.id, 120);
    const shown = runDetailSchema.parse((await producer.get(`${base()}/runs/${done.id}`).expect(200)).body);
    expect(shown.stalled).toBe(true);
    expect(shown.silent_s).toBeGreaterThanOrEqual(119);

    // A heartbeat 30 s old is a worker still alive: the sweep leaves that run alone.
    const other = await finishedRun('Slow But Alive');
    await leaveHalfDone(other.id, 30);

    const swept = await sweepStalledRuns(t.tdb.pool, t.boss!, policy, new Date());
    expect(swept.requeued).toContain(done.id);
    expect(swept.requeued).not.toContain(other.id);
    // A second sweeper right after finds nothing left to take over.
    expect((await sweepStalledRuns(t.tdb.pool, t.boss!, policy, new Date())).requeued).not.toContain(done.id);

    const after = await worker.waitForRun(done.id, settled);
    expect(['awaiting_review', 'held_by_budget']).toContain(after.state);
    expect(after.jobId).not.toBeNull();
    expect(after.jobId).not.toBe(done.id);
    expect(after.summary).not.toBeNull();
    expect(await auditOf(done.id, 'run.stalled')).toHaveLength(1);
    // Finished once more after the take-over, by the new job only.
    const finishes = await auditOf(
      done.id,
      after.state === 'held_by_budget' ? 'run.held_by_budget' : 'run.awaiting_review',
    );
    expect(finishes).toHaveLength(2);

    // The old job (id = the run's id), handed out again by the queue, is no longer the run's job.
    await t.tdb.db.update(cueRuns).set({ state: 'cueing', progress: 50 }).where(eq(cueRuns.id, done.id));
    await worker.handle({
      id: done.id,
      data: { runId: done.id, studioId: t.seed.studioId },
      retryCount: 0,
      retryLimit: 2,
    });
    const [untouched] = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.id, done.id));
    expect(untouched!.progress).toBe(50);
    expect(untouched!.attempts).toBe(after.attempts);

    // Tidy: the slow one is left for its own worker; mark it back as done.
    await t.tdb.db
      .update(cueRuns)
      .set({ state: other.state, heartbeatAt: null })
      .where(eq(cueRuns.id, other.id));
  });

  it('a run that stalls on every attempt the queue allows fails, with the reason', async () => {
    const done = await finishedRun('Cursed Carousel');
    await leaveHalfDone(done.id, 300);
    await t.tdb.db
      .update(cueRuns)
      .set({ attempts: policy.retry.limit + 1 })
      .where(eq(cueRuns.id, done.id));
    const swept = await sweepStalledRuns(t.tdb.pool, t.boss!, policy, new Date());
    expect(swept.failed).toContain(done.id);
    const [row] = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.id, done.id));
    expect(row!.state).toBe('failed');
    expect(row!.failureReason).toMatch(
      /^Gave up after 3 attempt\(s\): The worker cueing this run stopped answering/,
    );
  });
});

describe('asking again for a run', () => {
  it('a failed run is queued again by a producer and finishes; the audit log keeps both', async () => {
    const done = await finishedRun('Second Wind');
    await t.tdb.db
      .update(cueRuns)
      .set({
        state: 'failed',
        failureReason: 'Gave up after 3 attempt(s): storage did not answer',
        summary: null,
      })
      .where(eq(cueRuns.id, done.id));
    const r = await producer.send('post', `${base()}/runs/${done.id}/requeue`, {});
    expect(r.status, JSON.stringify(r.body)).toBe(202);
    const queued = runSummarySchema.parse(r.body);
    expect(queued.state).toBe('queued');
    expect(queued.failureReason).toBeNull();
    const after = await worker.waitForRun(done.id, settled);
    expect(['awaiting_review', 'held_by_budget']).toContain(after.state);
    const asked = await auditOf(done.id, 'run.requeued');
    expect(asked).toHaveLength(1);
    expect(asked[0]!.detail).toMatchObject({
      from: 'failed',
      reason: 'Gave up after 3 attempt(s): storage did not answer',
    });
  });

  it('refuses a run that has not failed (409), a role that may not ask for runs (403) and another studio (404)', async () => {
    const done = await finishedRun('Steady State');
    const notFailed = await producer.send('post', `${base()}/runs/${done.id}/requeue`, {});
    expect(notFailed.status).toBe(409);
    expect(notFailed.body.error).toMatch(/Only a failed run/);

    // Cueing with a live worker: not stalled, so not to be asked again either.
    await leaveHalfDone(done.id, 5);
    expect((await producer.send('post', `${base()}/runs/${done.id}/requeue`, {})).status).toBe(409);

    await t.tdb.db.update(cueRuns).set({ state: 'failed', heartbeatAt: null }).where(eq(cueRuns.id, done.id));
    const reviewer = new Client(t.app);
    await reviewer.signIn('rosa.reviewer@lanternfish.example');
    expect((await reviewer.send('post', `${base()}/runs/${done.id}/requeue`, {})).status).toBe(403);
    const [row] = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.id, done.id));
    expect(row!.state).toBe('failed');

    const elsewhere = await producer.send(
      'post',
      `/api/studios/00000000-0000-4000-8000-000000000000/runs/${done.id}/requeue`,
      {},
    );
    expect([403, 404]).toContain(elsewhere.status);
  });
});
