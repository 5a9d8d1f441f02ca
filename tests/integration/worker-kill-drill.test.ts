// Fault drill: a worker process killed (SIGKILL) in the middle of a run. Real worker processes
// (worker/index.ts, as `npm start` runs them) against the test's PostgreSQL and storage: the run must
// show as stalled, a second worker must take it over and finish it exactly once, within a minute of
// starting.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import type { ChildProcess } from 'node:child_process';
import { join, resolve } from 'node:path';
import { and, eq } from 'drizzle-orm';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { auditEvents, cueRuns } from '../../server/db/schema';
import { makeVehicleCsv } from '../factories/takes';
import {
  runDetailSchema,
  runSummarySchema,
  trackDetailSchema,
  uploadedTakeSchema,
} from '../../shared/schemas/pipeline';

const root = resolve(import.meta.dirname, '..', '..');
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

function startWorker(): ChildProcess {
  const child = spawn(join(root, 'node_modules/.bin/tsx'), ['worker/index.ts'], {
    cwd: root,
    env: {
      ...process.env,
      DATABASE_URL: t.tdb.url,
      WORKER_POLL_S: '0.5',
      RUN_HEARTBEAT_S: '0.5',
      RUN_STALL_S: '3',
    },
    stdio: ['ignore', 'ignore', 'inherit'],
    // Its own process group: tsx runs the worker in a child process, and the drill kills both.
    detached: true,
  });
  children.push(child);
  return child;
}

/** SIGKILL to the worker's whole process group (tsx and the node process it runs). */
function killHard(child: ChildProcess): void {
  try {
    process.kill(-child.pid!, 'SIGKILL');
  } catch {
    // already gone
  }
}

async function until<T>(what: string, probe: () => Promise<T | undefined>, timeout_ms: number): Promise<T> {
  const end = Date.now() + timeout_ms;
  for (;;) {
    const v = await probe();
    if (v !== undefined) return v;
    if (Date.now() > end) throw new Error(`${what}: not within ${timeout_ms} ms`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

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
