import request from 'supertest';
import type { Agent } from 'supertest';
import { createApp } from '../../../server/app';
import { createStorage } from '../../../server/storage';
import { createMailer } from '../../../server/mail';
import { startQueue } from '../../../server/queue';
import { seedDemo } from '../../../server/db/seed';
import { DEMO_PASSWORD } from '../../../shared/demo';
import { openDb } from '../../../server/db/client';
import { createTestDb, testEnv } from './services';
import type { TestDb } from './services';
import type PgBoss from 'pg-boss';

export interface TestApp {
  app: ReturnType<typeof createApp>['app'];
  tdb: TestDb;
  seed: Awaited<ReturnType<typeof seedDemo>>;
  boss: PgBoss | null;
  close: () => Promise<void>;
}

/** createApp over a fresh seeded database and the real local storage and mail. */
export async function startTestApp(
  opts: { env?: Record<string, string>; queue?: boolean; log?: (m: string) => void } = {},
): Promise<TestApp> {
  const tdb = await createTestDb();
  const env = testEnv(tdb.url, opts.env);
  const seed = await seedDemo(tdb.db);
  const storage = createStorage(env);
  const mailer = createMailer(env);
  const boss = opts.queue ? await startQueue(tdb.url) : null;
  const own = openDb(tdb.url, { max: 5, log: () => undefined });
  const { app, close } = createApp({
    env,
    db: own.db,
    pool: own.pool,
    storage,
    mailer,
    boss,
    log: opts.log ?? (() => undefined),
  });
  return {
    app,
    tdb,
    seed,
    boss,
    close: async () => {
      close();
      await own.pool.end();
      if (boss) await boss.stop({ graceful: false, wait: true });
      mailer.close();
      storage.close();
      await tdb.drop();
    },
  };
}

/** A cookie-keeping client that carries the session's CSRF token on writes. */
export class Client {
  readonly agent: Agent;
  private csrf = '';
  constructor(app: TestApp['app']) {
    this.agent = request.agent(app);
  }
  async refreshCsrf(): Promise<string> {
    const r = await this.agent.get('/api/auth/csrf').expect(200);
    this.csrf = (r.body as { csrfToken: string }).csrfToken;
    return this.csrf;
  }
  get(path: string) {
    return this.agent.get(path);
  }
  async send(method: 'post' | 'patch' | 'delete' | 'put', path: string, body?: object) {
    if (!this.csrf) await this.refreshCsrf();
    const req = this.agent[method](path).set('x-csrf-token', this.csrf);
    return body ? req.send(body) : req;
  }
  /** An unsent request carrying the CSRF token (call refreshCsrf or signIn first); for raw bodies. */
  raw(method: 'post' | 'put', path: string) {
    return this.agent[method](path).set('x-csrf-token', this.csrf);
  }
  async signIn(email: string, password = DEMO_PASSWORD) {
    await this.refreshCsrf();
    const r = await this.send('post', '/api/auth/login', { email, password });
    // The session id changes at sign-in, and with it the CSRF token.
    if (r.status === 200) await this.refreshCsrf();
    return r;
  }
}
