import { drizzle } from 'drizzle-orm/node-postgres';
import type { NodePgDatabase } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import * as schema from './schema';

export type Db = NodePgDatabase<typeof schema>;
/** A transaction handle; query functions accept `Db | Tx`. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

export interface OpenDbOptions {
  max?: number;
  /** Where connection errors go (a restarted or unreachable PostgreSQL); default: stderr. */
  log?: (msg: string) => void;
}

/**
 * Opens a pool and a Drizzle handle over it. A connection the server drops (PostgreSQL restarted,
 * network gone) is reported and thrown away instead of crashing the process: the query running on it
 * fails, and the next one opens a fresh connection, so the process carries on once PostgreSQL is back.
 */
export function openDb(url: string, opts: number | OpenDbOptions = {}): { db: Db; pool: pg.Pool } {
  const { max = 10, log = (m: string) => console.error(m) } = typeof opts === 'number' ? { max: opts } : opts;
  const pool = new pg.Pool({ connectionString: url, max, connectionTimeoutMillis: 10_000 });
  let lastReport = 0;
  const report = (e: Error) => {
    // One line per burst: a restart drops every connection at once.
    const now = Date.now();
    if (now - lastReport < 1000) return;
    lastReport = now;
    log(`database connection lost (${e.message}); reconnecting on the next query`);
  };
  // An idle connection's error reaches the pool; a checked-out one's reaches only its client, and an
  // error event with no listener would end the process.
  pool.on('error', report);
  pool.on('connect', (client) => client.on('error', report));
  return { db: drizzle(pool, { schema }), pool };
}

/** Runs SQL on the transaction's own connection (pg-boss's `db` send option takes this shape). */
export interface SqlExecutor {
  executeSql: (text: string, values: unknown[]) => Promise<{ rows: unknown[] }>;
}

/**
 * Runs `fn` in one transaction on one pooled connection, handing it a Drizzle handle and an executor on
 * the same connection, so that a queue job sent through pg-boss commits or rolls back with the rows.
 */
export async function inClientTransaction<T>(
  pool: pg.Pool,
  fn: (tx: Db, sql: SqlExecutor) => Promise<T>,
): Promise<T> {
  const client = await pool.connect();
  try {
    await client.query('BEGIN');
    const out = await fn(drizzle(client, { schema }), {
      executeSql: (text, values) => client.query(text, values),
    });
    await client.query('COMMIT');
    return out;
  } catch (e) {
    await client.query('ROLLBACK').catch(() => undefined);
    throw e;
  } finally {
    client.release();
  }
}
