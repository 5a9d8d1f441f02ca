import { Router } from 'express';
import { sql } from 'drizzle-orm';
import type { AppDeps } from '../deps';

const CHECK_TIMEOUT_MS = 3000;

const state = async (f: () => Promise<unknown>): Promise<string> => {
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      f(),
      new Promise((_, reject) => {
        timer = setTimeout(
          () => reject(new Error(`no answer within ${CHECK_TIMEOUT_MS} ms`)),
          CHECK_TIMEOUT_MS,
        );
      }),
    ]);
    return 'ok';
  } catch (e) {
    return (e as Error).message || 'unreachable';
  } finally {
    clearTimeout(timer);
  }
};

/** GET /api/health: the state of the database, object storage, mail and queue. */
export function healthRouter(deps: AppDeps): Router {
  const r = Router();
  r.get('/', async (_req, res) => {
    const [database, storage, mail, queue] = await Promise.all([
      state(() => deps.db.execute(sql`select 1`)),
      state(() => deps.storage.check()),
      state(() => deps.mailer.check()),
      state(async () => {
        if (!deps.boss) throw new Error('queue not started');
        await deps.boss.getQueues();
      }),
    ]);
    const ok = [database, storage, mail, queue].every((s) => s === 'ok');
    res.status(ok ? 200 : 503).json({ ok, database, storage, mail, queue });
  });
  return r;
}
