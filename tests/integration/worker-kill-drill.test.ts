// Real worker processes (worker/index.ts, as `npm start` and `npm run worker` run them) against the
// test's PostgreSQL and storage:
// - fault drill: a worker killed (SIGKILL) in the middle of a run; the run must show as stalled, and a
//   second worker must take it over and finish it exactly once, within a minute of starting;
// - scale-out: two workers share a burst of runs, none done twice and none lost.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ChildProcess } from 'node:child_process';
import { and, eq } from 'drizzle-orm';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { auditEvents, cueRuns } from '../../server/db/schema';
import { makeVehicleCsv } from '../factories/takes';
import { killHard, startWorkerProcess, until } from './support/worker-process';
import {
  runDetailSchema,
  runSummarySchema,
  trackDetailSchema,
  uploadedTakeSchema,
} from '../../shared/schemas/pipeline';

let t: TestApp;
let producer: Client;
const children: ChildProcess[] = [];

beforeAll(async () => {
  t = await startTestApp({ queue: true, env: { LOGIN_RATE_LIMIT: '1000', RUN_STALL_S: '3' } });
  producer = new Client(t.app);
  await producer.signIn('pia.producer@lanternfish.example');
}, 60_000);
afterAll(async () => {
  for (const c of children) killHard(c);
  await t.close();
});

const startWorker = (onLine?: (line: string) => void): ChildProcess => {
  const child = startWorkerProcess(t.tdb.url, { RUN_HEARTBEAT_S: '0.5', RUN_STALL_S: '3' }, onLine);
  children.push(child);
  return child;
};

const rowOf = async (id: string) => (await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.id, id)))[0]!;

describe('fault drill: a worker killed mid-run', () => {
  it('the run shows as stalled, and a new worker finishes it exactly once within a minute', async () => {
    const base = `/api/studios/${t.seed.studioId}`;
    const track = trackDetailSchema.parse(
      (await producer.send('post', `${base}/tracks`, { title: 'Pulled Plug', film: 'Undertow (fictional)' }))
        .body,
    );
    // Five minutes at 1 kHz: long enough in the motion core to be killed there.
    const csv = makeVehicleCsv({ duration_s: 300, rate_hz: 1000 });
    const up = await producer
      .raw('post', `${base}/tracks/${track.id}/takes?fileName=long.csv`)
      .set('content-type', 'application/octet-stream')
      .send(Buffer.from(csv));
    expect(up.status, JSON.stringify(up.body)).toBe(201);
    const take = uploadedTakeSchema.parse(up.body);

    const first = startWorker();
    const [run] = runSummarySchema
      .array()
      .parse(
        (await producer.send('post', `${base}/takes/${take.id}/runs`, { venueIds: [t.seed.venueIds.dome] }))
          .body,
      );
    // Killed once the take is read and the motion core is at work (progress 30).
    await until(
      'the first worker reaching the motion core',
      async () => {
        const r = await rowOf(run!.id);
        return r.state === 'cueing' && r.progress >= 30 ? r : undefined;
      },
      60_000,
    );
    killHard(first);
    await new Promise((r) => first.once('exit', r));
    const killed = await rowOf(run!.id);
    expect(killed.state).toBe('cueing');
    expect(killed.summary).toBeNull();

    // With no worker left, the run is shown as stalled once its heartbeat is older than RUN_STALL_S.
    await until(
      'the run showing as stalled',
      async () => {
        const d = runDetailSchema.parse((await producer.get(`${base}/runs/${run!.id}`).expect(200)).body);
        return d.stalled ? d : undefined;
      },
      30_000,
    );

    const started = Date.now();
    startWorker();
    const done = await until(
      'the second worker finishing the run',
      async () => {
        const r = await rowOf(run!.id);
        return r.state !== 'queued' && r.state !== 'cueing' ? r : undefined;
      },
      60_000,
    );
    expect(Date.now() - started).toBeLessThan(60_000);
    expect(['awaiting_review', 'held_by_budget']).toContain(done.state);
    expect(done.summary).not.toBeNull();
    expect(done.attempts).toBe(2); // the killed attempt and the one that finished
    const events = await t.tdb.db
      .select({ action: auditEvents.action })
      .from(auditEvents)
      .where(and(eq(auditEvents.subjectId, run!.id)));
    const actions = events.map((e) => e.action);
    expect(actions.filter((a) => a === 'run.stalled')).toHaveLength(1);
    expect(actions.filter((a) => a === 'run.awaiting_review' || a === 'run.held_by_budget')).toHaveLength(1);
  }, 180_000);
});

describe('scale-out: two workers share a burst', () => {
  it('twelve runs queued at once are each finished exactly once, by both workers between them', async () => {
    const base = `/api/studios/${t.seed.studioId}`;
    const finishedBy = new Map<string, string[]>(); // run id -> workers that logged finishing it
    const ready = new Set<string>();
    // Only the two workers of this test: the drill's are stopped first.
    for (const c of children.splice(0)) killHard(c);
    const watch = (name: string) => (line: string) => {
      if (line.includes('ready for jobs')) ready.add(name);
      const m = /cue run ([0-9a-f-]{36}): (awaiting_review|held_by_budget)/.exec(line);
      if (m) finishedBy.set(m[1]!, [...(finishedBy.get(m[1]!) ?? []), name]);
    };
    startWorker(watch('a'));
    startWorker(watch('b'));
    await until('both workers ready', async () => (ready.size === 2 ? true : undefined), 60_000);

    const track = trackDetailSchema.parse(
      (await producer.send('post', `${base}/tracks`, { title: 'Rush Hour', film: 'Undertow (fictional)' }))
        .body,
    );
    const runIds: string[] = [];
    for (let k = 0; k < 6; k++) {
      const up = await producer
        .raw('post', `${base}/tracks/${track.id}/takes?fileName=burst-${k}.csv`)
        .set('content-type', 'application/octet-stream')
        .send(Buffer.from(makeVehicleCsv({ duration_s: 20 + k })));
      const take = uploadedTakeSchema.parse(up.body);
      const runs = runSummarySchema.array().parse(
        (
          await producer.send('post', `${base}/takes/${take.id}/runs`, {
            venueIds: [t.seed.venueIds.dome, t.seed.venueIds.arcade],
          })
        ).body,
      );
      runIds.push(...runs.map((r) => r.id));
    }
    expect(runIds).toHaveLength(12);
    const rows = await until(
      'every run of the burst finished',
      async () => {
        const all = await Promise.all(runIds.map(rowOf));
        return all.every((r) => r.state !== 'queued' && r.state !== 'cueing') ? all : undefined;
      },
      120_000,
    );
    for (const r of rows) {
      expect(['awaiting_review', 'held_by_budget'], r.id).toContain(r.state);
      expect(r.attempts, r.id).toBe(1);
      // Exactly one worker finished each run, and the audit log holds one finish per run.
      expect(finishedBy.get(r.id), r.id).toHaveLength(1);
    }
    const finishes = await t.tdb.db
      .select({ subject: auditEvents.subjectId, action: auditEvents.action })
      .from(auditEvents)
      .where(and(eq(auditEvents.studioId, t.seed.studioId)));
    for (const id of runIds) {
      expect(
        finishes.filter(
          (e) =>
            e.subject === id && (e.action === 'run.awaiting_review' || e.action === 'run.held_by_budget'),
        ),
        id,
      ).toHaveLength(1);
    }
    const workers = new Set([...finishedBy.values()].flat());
    expect(workers).toEqual(new Set(['a', 'b']));
  }, 240_000);
});
