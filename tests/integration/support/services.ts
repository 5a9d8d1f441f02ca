// Integration tests run against the real services that `npm test` starts (PostgreSQL, the S3 fake,
// the SMTP capture). Each test file gets a database of its own.
import { randomBytes } from 'node:crypto';
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import pg from 'pg';
import { migrateDb } from '../../../server/db/migrate';
import { openDb } from '../../../server/db/client';
import type { Db } from '../../../server/db/client';
import { parseEnv } from '../../../server/env';
import type { Env } from '../../../server/env';

export function adminUrl(): string {
  const url = process.env.LEGWORK_TEST_PG_ADMIN_URL;
  if (!url) {
    throw new Error(
      'LEGWORK_TEST_PG_ADMIN_URL is not set: run the integration tests through `npm test`, which starts the services.',
    );
  }
  return url;
}

export interface TestDb {
  url: string;
  db: Db;
  pool: pg.Pool;
  drop: () => Promise<void>;
}

/** A fresh, migrated database for one test file. */
export async function createTestDb(): Promise<TestDb> {
  const name = `t_${randomBytes(6).toString('hex')}`;
  const admin = new pg.Client({ connectionString: adminUrl() });
  await admin.connect();
  await admin.query(`CREATE DATABASE ${name}`);
  await admin.end();
  const url = adminUrl().replace(/\/[^/]*$/, `/${name}`);
  await migrateDb(url);
  // The tests' own handle looks across studios (to set up and inspect rows); the app under test
  // gets a handle of its own with the server's default (startTestApp).
  const { db, pool } = openDb(url, { max: 5, outsideScope: 'all' });
  return {
    url,
    db,
    pool,
    drop: async () => {
      await pool.end();
      const c = new pg.Client({ connectionString: adminUrl() });
      await c.connect();
      await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      await c.end();
    },
  };
}

/** The environment the server would see, pointed at this test database. */
export function testEnv(databaseUrl: string, overrides: Record<string, string> = {}): Env {
  return parseEnv({
    ...process.env,
    DATABASE_URL: databaseUrl,
    PUBLIC_URL: 'http://legwork.test',
    ...overrides,
  });
}

export interface Mail {
  id: string;
  to: string[];
  subject: string;
  text: string;
}

/** Waits (polling the capture folder, no fixed sleep) for a mail to `to` whose subject matches. */
export async function waitForMail(to: string, subject: RegExp, timeout_ms = 15_000): Promise<Mail> {
  const dir = process.env.MAIL_CAPTURE_DIR;
  if (!dir) throw new Error('MAIL_CAPTURE_DIR is not set: run through `npm test`.');
  const until = Date.now() + timeout_ms;
  while (Date.now() < until) {
    const names = (await readdir(dir))
      .filter((n) => n.endsWith('.json'))
      .sort()
      .reverse();
    for (const n of names) {
      const m = JSON.parse(await readFile(join(dir, n), 'utf8')) as Mail;
      if (m.to.includes(to) && subject.test(m.subject)) return m;
    }
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail to ${to} matching ${subject} within ${timeout_ms} ms`);
}

/** The first link in a mail's text. */
export function firstLink(text: string): URL {
  const m = /https?:\/\/\S+/.exec(text);
  if (!m) throw new Error(`no link in mail: ${text}`);
  return new URL(m[0]);
}
