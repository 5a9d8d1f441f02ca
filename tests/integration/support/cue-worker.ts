// The real cue-run handler on the test app's pg-boss queue, with the storage it writes to, and the
// small waits and reads the pipeline tests share.
import { GetObjectCommand } from '@aws-sdk/client-s3';
import { eq } from 'drizzle-orm';
import { cueRuns } from '../../../server/db/schema';
import { QUEUES } from '../../../server/queue';
import { createStorage } from '../../../server/storage';
import { createHandler } from '../../../worker/jobs/cue-run';
import type { JobMeta } from '../../../worker/jobs/cue-run';
import { testEnv } from './services';
import type { TestApp } from './app';

export type Storage = ReturnType<typeof createStorage>;
export type CueRunRow = typeof cueRuns.$inferSelect;

export interface CueWorker {
  storage: Storage;
  handle: ReturnType<typeof createHandler>;
  /** The run's row once `done(state)` holds (by default: no longer queued or cueing). */
  waitForRun: (runId: string, done?: (state: string) => boolean, timeout_ms?: number) => Promise<CueRunRow>;
  /** The bytes of a stored object. */
  stored: (key: string) => Promise<Buffer>;
  /** A stored object parsed as JSON. */
  storedJson: (key: string) => Promise<Record<string, unknown>>;
  close: () => void;
}

const settled = (state: string) => state !== 'queued' && state !== 'cueing';

/** Starts the cue-run handler on `t.boss` (start the app with `queue: true`). */
export async function startCueWorker(t: TestApp): Promise<CueWorker> {
  if (!t.boss) throw new Error('startCueWorker needs the test app started with queue: true');
  const storage = createStorage(testEnv(t.tdb.url));
  const handle = createHandler({ db: t.tdb.db, storage, log: () => undefined, now: () => new Date() });
  await t.boss.work(
    QUEUES.cueRun,
    { batchSize: 1, includeMetadata: true, pollingIntervalSeconds: 0.5 },
    async (jobs) => {
      for (const job of jobs) await handle(job as unknown as JobMeta);
    },
  );
  const stored = async (key: string) => {
    const o = await storage.client.send(new GetObjectCommand({ Bucket: storage.bucket, Key: key }));
    return Buffer.from(await o.Body!.transformToByteArray());
  };
  return {
    storage,
    handle,
    stored,
    storedJson: async (key) => JSON.parse((await stored(key)).toString('utf8')) as Record<string, unknown>,
    waitForRun: async (runId, done = settled, timeout_ms = 60_000) => {
      const until = Date.now() + timeout_ms;
      for (;;) {
        const [row] = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.id, runId));
        if (row && done(row.state)) return row;
        if (Date.now() > until) throw new Error(`run ${runId} still ${row?.state} after ${timeout_ms} ms`);
        await new Promise((r) => setTimeout(r, 100));
      }
    },
    close: () => storage.close(),
  };
}
