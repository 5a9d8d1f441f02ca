// The worker process: takes jobs off the pg-boss queues. Run as many as the queue needs, on as many
// machines as you like; each one only needs the same environment variables as the server.
import { parseEnv, publicUrl } from './env';
import { QUEUES, startQueue } from '../server/queue';
import { openDb } from '../server/db/client';
import { createStorage } from '../server/storage';
import { createHandler } from './jobs/cue-run';
import { createMailer } from '../server/mail';
import { startMailSender } from '../server/notifications/sender';
import type { JobMeta } from './jobs/cue-run';
import { createBuildReleaseHandler } from './jobs/build-release';
import { startStallSweeper } from '../server/pipeline/stalled-runs';

const env = parseEnv();
const log = (m: string) => console.log(`[worker] ${m}`);
// The worker acts for every studio (it takes whatever run or release comes next), so its queries
// are not confined to one studio by the row policies; the server's are.
const { db, pool } = openDb(env.DATABASE_URL, { max: 4, role: env.DATABASE_APP_ROLE, outsideScope: 'all' });
const storage = createStorage(env);
const boss = await startQueue(env.DATABASE_URL);
const handle = createHandler({ db, storage, log, now: () => new Date(), heartbeat_s: env.RUN_HEARTBEAT_S });
await boss.work<object>(
  QUEUES.cueRun,
  { batchSize: 1, includeMetadata: true, pollingIntervalSeconds: env.WORKER_POLL_S },
  async (jobs) => {
    for (const job of jobs) await handle(job as unknown as JobMeta);
  },
);
const buildRelease = createBuildReleaseHandler({ db, storage, log, now: () => new Date() });
await boss.work<object>(
  QUEUES.buildRelease,
  { batchSize: 1, includeMetadata: true, pollingIntervalSeconds: env.WORKER_POLL_S },
  async (jobs) => {
    for (const job of jobs) await buildRelease(job as unknown as JobMeta);
  },
);
// The outbox: every MAIL_POLL_S, the mail now due (server/notifications/sender.ts).
const mailer = createMailer(env);
const mail = startMailSender(
  {
    db,
    mailer,
    baseUrl: publicUrl(env),
    log,
    now: () => new Date(),
    maxAttempts: env.MAIL_MAX_ATTEMPTS,
    retryDelayS: env.MAIL_RETRY_DELAY_S,
  },
  env.MAIL_POLL_S * 1000,
);
// Runs whose worker stopped answering (killed, out of memory, machine gone) go back in the queue;
// every worker sweeps, and the guarded take-over re-queues each run once (server/pipeline/stalled-runs.ts).
const sweeper = startStallSweeper(
  pool,
  boss,
  { stall_s: env.RUN_STALL_S, retry: { limit: env.CUE_RUN_RETRY_LIMIT, delay_s: env.CUE_RUN_RETRY_DELAY_S } },
  Math.min(15_000, (env.RUN_STALL_S * 1000) / 4),
  log,
);
log('ready for jobs');

let stopping = false;
const stop = async () => {
  if (stopping) return;
  stopping = true;
  await sweeper.stop();
  await boss.stop({ graceful: true, wait: true, timeout: 10_000 }).catch(() => undefined);
  await mail.stop();
  mailer.close();
  storage.close();
  await pool.end();
  process.exit(0);
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
