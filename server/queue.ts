// The job queue: pg-boss 10 on the same PostgreSQL, in its own schema.
import PgBoss from 'pg-boss';

/** Queue names used between the server and the worker. */
export const QUEUES = { cueRun: 'cue-run', buildRelease: 'build-release' } as const;

/** Starts a pg-boss instance and makes sure every queue exists (pg-boss 10 drops sends to missing queues). */
export async function startQueue(databaseUrl: string, opts: { schema?: string } = {}): Promise<PgBoss> {
  const boss = new PgBoss({ connectionString: databaseUrl, schema: opts.schema ?? 'pgboss', max: 5 });
  boss.on('error', (e) => console.error('queue error:', e.message));
  await boss.start();
  for (const name of Object.values(QUEUES)) {
    const existing = await boss.getQueue(name);
    if (!existing) {
      await boss.createQueue(name, {
        name,
        retryLimit: 3,
        retryDelay: 2,
        retryBackoff: true,
        expireInSeconds: 15 * 60,
      });
    }
  }
  return boss;
}
