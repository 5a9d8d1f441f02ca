// The second wall: PostgreSQL row-level security on every studio-owned table, behind the app's own
// studio conditions. These checks use the app's database handle (the role legwork_app, as the
// server connects) and deliberately leave the studio condition out of their queries, as a buggy
// query would. Row security's semantics (policies filter rows for roles without BYPASSRLS that do
// not own the table) are PostgreSQL's, documented in "Row Security Policies" of its manual.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { openDb } from '../../server/db/client';
import type { Db } from '../../server/db/client';
import { acrossStudios, inStudioScope } from '../../server/db/wall';
import { seedDemo } from '../../server/db/seed';
import { createTestDb } from './support/services';
import type { TestDb } from './support/services';
import { tracks } from '../../server/db/schema';
import type pg from 'pg';

let tdb: TestDb;
let app: { db: Db; pool: pg.Pool };
let ids: Awaited<ReturnType<typeof seedDemo>>;
let trackA: string;
let trackB: string;

beforeAll(async () => {
  tdb = await createTestDb();
  ids = await seedDemo(tdb.db);
  const [a] = await tdb.db
    .insert(tracks)
    .values({ studioId: ids.studioId, title: 'Wall check A' })
    .returning();
  const [b] = await tdb.db
    .insert(tracks)
    .values({ studioId: ids.secondStudioId, title: 'Wall check B' })
    .returning();
  trackA = a!.id;
  trackB = b!.id;
  // One connection, so every check below reuses the one whose settings the previous check left.
  app = openDb(tdb.url, { max: 1, log: () => undefined });
});
afterAll(async () => {
  await app.pool.end();
  await tdb.drop();
});

const allTrackIds = async (db: Db) => (await db.select({ id: tracks.id }).from(tracks)).map((r) => r.id);

describe('row-level security', () => {
  it('connects as a role that neither owns the tables nor bypasses the policies', async () => {
    const r = await app.pool.query<{ current_user: string; rolsuper: boolean; rolbypassrls: boolean }>(
      'SELECT current_user, rolsuper, rolbypassrls FROM pg_roles WHERE rolname = current_user',
    );
    expect(r.rows[0]).toEqual({ current_user: 'legwork_app', rolsuper: false, rolbypassrls: false });
    const owners = await app.pool.query<{ n: string }>(
      "SELECT count(*) AS n FROM pg_tables WHERE schemaname = 'public' AND tableowner = current_user",
    );
    expect(owners.rows[0]!.n).toBe('0');
  });

  it('has row security on every table with a studio_id column', async () => {
    const r = await tdb.pool.query<{ relname: string; relrowsecurity: boolean }>(
      `SELECT c.relname, c.relrowsecurity FROM pg_class c
         JOIN information_schema.columns col ON col.table_name = c.relname AND col.table_schema = 'public'
        WHERE col.column_name = 'studio_id' AND c.relkind = 'r'`,
    );
    expect(r.rows.length).toBeGreaterThanOrEqual(17);
    expect(r.rows.filter((t) => !t.relrowsecurity).map((t) => t.relname)).toEqual([]);
  });

  it('a query that forgets its studio, outside any scope, finds no row', async () => {
    // The test's own handle sees both tracks: they are there.
    expect(await allTrackIds(tdb.db)).toEqual(expect.arrayContaining([trackA, trackB]));
    expect(await allTrackIds(app.db)).toEqual([]);
    expect((await app.pool.query('SELECT * FROM venues')).rows).toEqual([]);
    expect((await app.pool.query('SELECT * FROM cue_runs')).rows).toEqual([]);
  });

  it("in a studio's scope, a query that forgets its studio sees that studio's rows only", async () => {
    const seen = await inStudioScope(ids.studioId, () => allTrackIds(app.db));
    expect(seen).toContain(trackA);
    expect(seen).not.toContain(trackB);
    const other = await inStudioScope(ids.secondStudioId, () => allTrackIds(app.db));
    expect(other).toContain(trackB);
    expect(other).not.toContain(trackA);
  });

  it("refuses to write a row into another studio from a studio's scope", async () => {
    const refused = await inStudioScope(ids.studioId, () =>
      app.db.insert(tracks).values({ studioId: ids.secondStudioId, title: 'Smuggled' }),
    ).then(
      () => null,
      (e: Error & { cause?: Error }) => e.cause?.message ?? e.message,
    );
    expect(refused).toMatch(/violates row-level security policy/);
    // An update that forgets its studio changes this studio's rows only.
    await inStudioScope(ids.studioId, () =>
      app.db
        .update(tracks)
        .set({ film: 'touched' })
        .where(sql`title LIKE 'Wall check%'`),
    );
    const films = await tdb.db.select({ id: tracks.id, film: tracks.film }).from(tracks);
    expect(films.find((t) => t.id === trackA)?.film).toBe('touched');
    expect(films.find((t) => t.id === trackB)?.film).toBe('');
  });

  it('a scope does not outlive its block on the pooled connection', async () => {
    expect(await acrossStudios(() => allTrackIds(app.db))).toEqual(expect.arrayContaining([trackA, trackB]));
    // The same (single) connection, now outside any scope again.
    expect(await allTrackIds(app.db)).toEqual([]);
    expect(await inStudioScope(ids.secondStudioId, () => allTrackIds(app.db))).not.toContain(trackA);
    expect(await allTrackIds(app.db)).toEqual([]);
  });

  it('a transaction takes the scope of the code that opens it', async () => {
    const seen = await inStudioScope(ids.studioId, () =>
      app.db.transaction(async (tx) => (await tx.select({ id: tracks.id }).from(tracks)).map((r) => r.id)),
    );
    expect(seen).toContain(trackA);
    expect(seen).not.toContain(trackB);
  });

  it('a transaction that widens its own settings leaves the next checkout in its scope', async () => {
    // A studio-scoped transaction that sets its own settings changes only its transaction
    // (set_config local); the next checkout is brought back in line.
    await inStudioScope(ids.studioId, () =>
      app.db.transaction(async (tx) => {
        await tx.execute(sql`SELECT set_config('legwork.scope', 'all', true)`);
      }),
    );
    expect(await inStudioScope(ids.studioId, () => allTrackIds(app.db))).not.toContain(trackB);
  });
});
