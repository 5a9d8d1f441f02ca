import type pg from 'pg';
import type PgBoss from 'pg-boss';
import type { Db } from './db/client';
import type { Env } from './env';
import type { Mailer } from './mail';
import type { Storage } from './storage';

/** Side effects handed to createApp, so tests can pass real local services or fakes. */
export interface AppDeps {
  env: Env;
  db: Db;
  pool: pg.Pool;
  storage: Storage;
  mailer: Mailer;
  boss: PgBoss | null;
  log: (msg: string) => void;
  now?: () => Date;
}
