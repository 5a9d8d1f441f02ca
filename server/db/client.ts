import { drizzle } from 'drizzle-orm/node-postgres';
import type { NodePgDatabase } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import * as schema from './schema';
import { currentScope, scopeSettings } from './wall';
import type { Scope } from './wall';

export type Db = NodePgDatabase<typeof schema>;
/** A transaction handle; query functions accept `Db | Tx`. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

export interface OpenDbOptions {
  max?: number;
  /** Where connection errors go (a restarted or unreachable PostgreSQL); default: stderr. */
  log?: (msg: string) => void;
  /**
   * The role the connections act as (SET ROLE), subject to the row policies: default `legwork_app`,
   * which the migrations create. '' keeps the login role, for a deployment whose login role is
   * itself without BYPASSRLS.
   */
  role?: string;
  /** The scope of queries made outside inStudioScope/acrossStudios (server/db/wall.ts). */
  outsideScope?: Scope;
}

/** The default role of the application's connections (created by drizzle/0009_row_security.sql). */
export const APP_ROLE = 'legwork_app';

/**
 * A pool whose every checkout (a query, a transaction, a client taken for a queue job) first
 * brings the connection's role and scope settings in line with the code asking for it. The
 * settings are session-level and remembered per connection, so a connection that already has them
 * costs no extra round trip.
 */
class WalledPool extends pg.Pool {
  private readonly applied = new WeakMap<pg.PoolClient, string>();
  constructor(
    config: pg.PoolConfig,
    private readonly role: string,
    private readonly outside: Scope,
  ) {
    super(config);
  }

  override connect(): Promise<pg.PoolClient>;
  override connect(
    callback: (
      err: Error | undefined,
      client: pg.PoolClient | undefined,
      done: (release?: unknown) => void,
    ) => void,
  ): void;
  override connect(
    callback?: (
      err: Error | undefined,
      client: pg.PoolClient | undefined,
      done: (release?: unknown) => void,
    ) => void,
  ): Promise<pg.PoolClient> | void {
    const out = this.scopedClient();
    if (!callback) return out;
    out.then(
      (client) => callback(undefined, client, (release?: unknown) => client.release(release as Error)),
      (err: Error) => callback(err, undefined, () => undefined),
    );
  }

  private async scopedClient(): Promise<pg.PoolClient> {
    const client = await super.connect();
    const { scope, studioId } = scopeSettings(currentScope(this.outside));
    const key = `${scope}:${studioId}`;
    if (this.applied.get(client) === key) return client;
    try {
      if (this.role) {
        await client.query(
          "SELECT set_config('role', $1, false), set_config('legwork.scope', $2, false), set_config('legwork.studio_id', $3, false)",
          [this.role, scope, studioId],
        );
      } else {
        await client.query(
          "SELECT set_config('legwork.scope', $1, false), set_config('legwork.studio_id', $2, false)",
          [scope, studioId],
        );
      }
    } catch (e) {
      this.applied.delete(client);
      client.release(e as Error);
      throw e;
    }
    this.applied.set(client, key);
    return client;
  }
}

/**
 * Opens a pool and a Drizzle handle over it. A connection the server drops (PostgreSQL restarted,
 * network gone) is reported and thrown away instead of crashing the process: the query running on it
 * fails, and the next one opens a fresh connection, so the process carries on once PostgreSQL is back.
 */
export function openDb(url: string, opts: number | OpenDbOptions = {}): { db: Db; pool: pg.Pool } {
  const {
    max = 10,
    log = (m: string) => console.error(m),
    role = APP_ROLE,
    outsideScope = 'none',
  } = typeof opts === 'number' ? { max: opts } : opts;
  const pool: pg.Pool = new WalledPool(
    { connectionString: url, max, connectionTimeoutMillis: 10_000 },
    role,
    outsideScope,
  );
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
