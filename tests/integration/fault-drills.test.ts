// Fault drills against the real services:
// - object storage goes away while a run writes its outputs: the run is retried, then failed with a
//   reason that names storage, and nothing it half-wrote is visible (no files, no result) until it is
//   asked for again with storage back, when it finishes;
// - PostgreSQL is restarted (pg_ctl restart, fast shutdown) under a running server and a running worker
//   process: both reconnect, the signed-in session survives, no request answers 500 after recovery,
//   and the worker cues the next run.
// Mail down is drilled in mail-sender.test.ts (notifications stay queued with the error and go out
// once when SMTP is back) and run-mails.test.ts (an invitation made while SMTP is down is kept and
// answers mailSent: false). One-time links (invitations, password resets) are sent directly and never
// stored, so they are not queued for later: the person asks again.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ChildProcess } from 'node:child_process';
import type { S3Client } from '@aws-sdk/client-s3';
import { ListObjectsV2Command, PutObjectCommand } from '@aws-sdk/client-s3';
import { eq } from 'drizzle-orm';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { testEnv } from './support/services';
import { cueRuns } from '../../server/db/schema';
import { QUEUES } from '../../server/queue';
import { createStorage } from '../../server/storage';
import type { Storage } from '../../server/storage';
import { createHandler } from '../../worker/jobs/cue-run';
import type { JobMeta } from '../../worker/jobs/cue-run';
import { restartPostgres } from '../../server/local/postgres';
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
const base = () => `/api/studios/${t.seed.studioId}`;

beforeAll(async () => {
  t = await startTestApp({
    queue: true,
    env: { LOGIN_RATE_LIMIT: '1000', CUE_RUN_RETRY_LIMIT: '2', CUE_RUN_RETRY_DELAY_S: '1' },
  });
  producer = new Client(t.app);
  await producer.signIn('pia.producer@lanternfish.example');
}, 60_000);
afterAll(async () => {
  for (const c of children) killHard(c);
  await t.close();
});

async function takeWithRun(title: string): Promise<{ runId: string }> {
  const track = trackDetailSchema.parse(
    (await producer.send('post', `${base()}/tracks`, { title, film: 'Undertow (fictional)' })).body,
  );
  const up = await producer
    .raw('post', `${base()}/tracks/${track.id}/takes?fileName=drill.csv`)
    .set('content-type', 'application/octet-stream')
    .send(Buffer.from(makeVehicleCsv({ duration_s: 5 })));
  expect(up.status, JSON.stringify(up.body)).toBe(201);
  const take = uploadedTakeSchema.parse(up.body);
  const [run] = runSummarySchema
    .array()
    .parse(
      (await producer.send('post', `${base()}/takes/${take.id}/runs`, { venueIds: [t.seed.venueIds.dome] }))
        .body,
    );
  return { runId: run!.id };
}

const stateOf = async (id: string) =>
  runDetailSchema.parse((await producer.get(`${base()}/runs/${id}`).expect(200)).body);

/**
 * Storage that reads from the real bucket and lets `writesBeforeOutage` writes through, then sends
 * every write to a port nobody listens on: the store going away in the middle of a run's outputs.
 */
function failingStorage(writesBeforeOutage: number): Storage {
  const real = createStorage(testEnv(t.tdb.url));
  const dead = createStorage(testEnv(t.tdb.url, { S3_ENDPOINT: 'http://127.0.0.1:9' }));
  let writes = 0;
  const client = new Proxy(real.client, {
    get(target, prop, receiver) {
      if (prop === 'send') {
        return (command: unknown, ...rest: unknown[]) => {
          if (command instanceof PutObjectCommand && ++writes > writesBeforeOutage) {
            return (dead.client.send as (c: unknown, ...r: unknown[]) => Promise<unknown>)(command, ...rest);
          }
          return (target.send as (c: unknown, ...r: unknown[]) => Promise<unknown>).call(
            target,
            command,
            ...rest,
          );
        };
      }
      return Reflect.get(target, prop, receiver) as unknown;
    },
  }) as S3Client;
  return { ...real, client, close: () => (real.close(), dead.close()) };
}

describe('fault drill: storage goes away mid-run', () => {
  it('retries, fails with the reason, shows nothing half-written, and finishes when asked again', async () => {
    const storage = failingStorage(2);
    const failing = createHandler({ db: t.tdb.db, storage, log: () => undefined, now: () => new Date() });
    await t.boss!.work(
      QUEUES.cueRun,
      { batchSize: 1, includeMetadata: true, pollingIntervalSeconds: 0.5 },
      async (jobs) => {
        for (const job of jobs) await failing(job as unknown as JobMeta);
      },
    );
    const { runId } = await takeWithRun('Power Cut');
    const failed = await until(
      'the run failing',
      async () => {
        const d = await stateOf(runId);
        return d.state === 'failed' ? d : undefined;
      },
      90_000,
    );
    expect(failed.attempts).toBe(3);
    expect(failed.failureReason).toMatch(/^Gave up after 3 attempt\(s\): /);
    expect(failed.failureReason).toMatch(/ECONNREFUSED|connect|socket|storage/i);
    // Two files reached the bucket before it went away, but the run shows none of them.
    const [row] = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.id, runId));
    const listed = await storage.client.send(
      new ListObjectsV2Command({
        Bucket: storage.bucket,
        Prefix: `studios/${t.seed.studioId}/runs/${runId}/`,
      }),
    );
    expect(listed.KeyCount ?? 0).toBeGreaterThan(0);
    expect(row!.artifactPrefix).toBeNull();
    expect(failed.result).toBeNull();
    expect(failed.files).toEqual([]);
    await producer.get(`${base()}/runs/${runId}/series`).expect(404);
    await producer.get(`${base()}/runs/${runId}/files/manifest.json`).expect(404);
    await t.boss!.offWork(QUEUES.cueRun);
    storage.close();

    // Storage is back: the producer asks again and the run finishes.
    const real = createStorage(testEnv(t.tdb.url));
    const handle = createHandler({
      db: t.tdb.db,
      storage: real,
      log: () => undefined,
      now: () => new Date(),
    });
    await t.boss!.work(
      QUEUES.cueRun,
      { batchSize: 1, includeMetadata: true, pollingIntervalSeconds: 0.5 },
      async (jobs) => {
        for (const job of jobs) await handle(job as unknown as JobMeta);
      },
    );
    expect((await producer.send('post', `${base()}/runs/${runId}/requeue`, {})).status).toBe(202);
    const done = await until(
      'the run finishing',
      async () => {
        const d = await stateOf(runId);
        return d.state === 'awaiting_review' || d.state === 'held_by_budget' ? d : undefined;
      },
      60_000,
    );
    expect(done.files.length).toBeGreaterThan(0);
    await producer.get(`${base()}/runs/${runId}/files/manifest.json`).expect(200);
    await t.boss!.offWork(QUEUES.cueRun);
    real.close();
  }, 180_000);
});

describe('fault drill: PostgreSQL restarted under the server and a worker', () => {
  it('both reconnect: no 500 after recovery, the session holds, and the worker cues the next run', async () => {
    const control = process.env.LEGWORK_TEST_PG_CONTROL;
    if (!control)
      throw new Error('LEGWORK_TEST_PG_CONTROL is not set: run through `npm test` or `npm run services`.');
    const worker = startWorkerProcess(t.tdb.url);
    children.push(worker);
    const before = await takeWithRun('Before The Restart');
    await until(
      'the first run finishing',
      async () =>
        ['awaiting_review', 'held_by_budget'].includes((await stateOf(before.runId)).state)
          ? true
          : undefined,
      60_000,
    );

    restartPostgres(control);

    // Recovery: the first good answer, then no 500 at all.
    await until(
      'the server answering again',
      async () => {
        const r = await producer.get(`${base()}/tracks`);
        return r.status === 200 ? true : undefined;
      },
      30_000,
    );
    const statuses: number[] = [];
    for (let i = 0; i < 20; i++) {
      statuses.push((await producer.get(`${base()}/tracks`)).status);
      statuses.push((await producer.get(`${base()}/runs/${before.runId}`)).status);
    }
    expect(statuses.filter((s) => s !== 200)).toEqual([]);

    // The worker process reconnected too: a new run is cued.
    const after = await takeWithRun('After The Restart');
    const done = await until(
      'the worker cueing a run after the restart',
      async () => {
        const d = await stateOf(after.runId);
        return d.state === 'awaiting_review' || d.state === 'held_by_budget' ? d : undefined;
      },
      60_000,
    );
    expect(done.attempts).toBeGreaterThanOrEqual(1);
  }, 180_000);
});
