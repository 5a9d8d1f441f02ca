// The tracks table's kept answers and the remembered sessions, from the outside. Each check compares
// what the API answers with the rows PostgreSQL holds (counted here with plain SQL), the database
// being the record the answer must agree with:
// - a write is on the very next read, whether made through this server process, through another
//   server process over the same database, or straight in the database as the worker writes;
// - a removed member and a changed role apply at once, in this process and from another one;
// - signing out applies at once in this process, and within AUTH_CACHE_MS in another;
// - answers never pass between studios or to a role that may not read the table.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { testEnv } from './support/services';
import { createApp } from '../../server/app';
import { openDb } from '../../server/db/client';
import { createStorage } from '../../server/storage';
import { createMailer } from '../../server/mail';
import { AUTH_CACHE_MS } from '../../server/auth/auth-cache';
import { trackPageSchema } from '../../shared/schemas/pipeline';
import type { TrackPage } from '../../shared/schemas/pipeline';
import { DEMO_PASSWORD } from '../../shared/demo';

let t: TestApp;
/** A second server process over the same database: its own app, pool, session store and caches. */
let other: { app: TestApp['app']; close: () => Promise<void> };
const PRODUCER = 'pia.producer@lanternfish.example';
const ADMIN = 'ada.admin@lanternfish.example';

beforeAll(async () => {
  t = await startTestApp({ env: { LOGIN_RATE_LIMIT: '1000' } });
  const env = testEnv(t.tdb.url, { LOGIN_RATE_LIMIT: '1000' });
  const own = openDb(t.tdb.url, { max: 3, log: () => undefined });
  const storage = createStorage(env);
  const mailer = createMailer(env);
  const made = createApp({
    env,
    db: own.db,
    pool: own.pool,
    storage,
    mailer,
    boss: null,
    log: () => undefined,
  });
  other = {
    app: made.app,
    close: async () => {
      made.close();
      await own.pool.end();
      mailer.close();
      storage.close();
    },
  };
});
afterAll(async () => {
  await other.close();
  await t.close();
});

const tracksPath = (studioId: string, query = 'page=1&pageSize=25') =>
  `/api/studios/${studioId}/tracks?${query}`;

async function page(c: Client, studioId: string, query?: string): Promise<TrackPage> {
  const r = await c.get(tracksPath(studioId, query));
  expect(r.status, JSON.stringify(r.body)).toBe(200);
  return trackPageSchema.parse(r.body);
}

/** The studio's track count and one track's take count, straight from PostgreSQL. */
async function sqlCounts(studioId: string, trackId?: string) {
  const q = (text: string, values: unknown[]) => t.tdb.pool.query(text, values);
  const tracks = (await q('SELECT count(*)::int AS n FROM tracks WHERE studio_id = $1', [studioId]))
    .rows[0] as { n: number };
  const takes = trackId
    ? ((await q('SELECT count(*)::int AS n FROM takes WHERE track_id = $1', [trackId])).rows[0] as {
        n: number;
      })
    : { n: 0 };
  return { tracks: tracks.n, takes: takes.n };
}

async function signedIn(app: TestApp['app'], email: string): Promise<Client> {
  const c = new Client(app);
  expect((await c.signIn(email)).status).toBe(200);
  return c;
}

/** Signs in over plain requests: the session cookie and its CSRF token. */
async function rawSignIn(email: string): Promise<{ cookie: string; csrf: string }> {
  const sid = (r: request.Response) =>
    String((r.headers['set-cookie'] as unknown as string[])[0]).split(';')[0]!;
  const first = await request(t.app).get('/api/auth/csrf');
  const login = await request(t.app)
    .post('/api/auth/login')
    .set('cookie', sid(first))
    .set('x-csrf-token', (first.body as { csrfToken: string }).csrfToken)
    .send({ email, password: DEMO_PASSWORD });
  expect(login.status).toBe(200);
  const cookie = sid(login);
  const csrf = await request(t.app).get('/api/auth/csrf').set('cookie', cookie);
  return { cookie, csrf: (csrf.body as { csrfToken: string }).csrfToken };
}

async function insertTake(studioId: string, trackId: string, n: number): Promise<string> {
  const r = await t.tdb.pool.query(
    `INSERT INTO takes (studio_id, track_id, number, kind, layout, file_name, storage_key, size_bytes, sha256, samples, duration_s, uploaded_via)
     VALUES ($1, $2, $3::int, 'pose', 'hexapod', 'c.csv', 'studios/x/c-' || $3::text, 10, repeat('1', 64), 2, 1, 'browser') RETURNING id`,
    [studioId, trackId, n],
  );
  return (r.rows[0] as { id: string }).id;
}

describe('the tracks table after a write', () => {
  it('shows a track made through this process on the next read, and the total PostgreSQL counts', async () => {
    const pia = await signedIn(t.app, PRODUCER);
    const before = await page(pia, t.seed.studioId);
    // The same read again: the same answer and the same validator, and a conditional read is 304.
    const again = await pia.get(tracksPath(t.seed.studioId));
    expect(again.body).toEqual(before);
    const etag = again.headers.etag as string;
    expect(etag).toBeTruthy();
    expect((await pia.get(tracksPath(t.seed.studioId)).set('if-none-match', etag)).status).toBe(304);

    const made = await pia.send('post', `/api/studios/${t.seed.studioId}/tracks`, {
      title: 'Cache Check One',
      film: 'Undertow (fictional)',
    });
    expect(made.status).toBe(201);
    const after = await page(pia, t.seed.studioId);
    expect(after.total).toBe(before.total + 1);
    expect(after.total).toBe((await sqlCounts(t.seed.studioId)).tracks);
    expect(after.items[0]!.title).toBe('Cache Check One');
    // The old validator no longer matches.
    expect((await pia.get(tracksPath(t.seed.studioId)).set('if-none-match', etag)).status).toBe(200);
  });

  it('shows a track made through another server process on the next read here', async () => {
    const here = await signedIn(t.app, PRODUCER);
    const there = await signedIn(other.app, PRODUCER);
    const before = await page(here, t.seed.studioId);
    const made = await there.send('post', `/api/studios/${t.seed.studioId}/tracks`, {
      title: 'Made In The Other Process',
      film: '',
    });
    expect(made.status).toBe(201);
    const after = await page(here, t.seed.studioId);
    expect(after.total).toBe(before.total + 1);
    expect(after.total).toBe((await sqlCounts(t.seed.studioId)).tracks);
    expect(after.items.map((i) => i.title)).toContain('Made In The Other Process');
  });

  it('shows takes, runs and venue names written straight in the database (as the worker writes) on the next read', async () => {
    const pia = await signedIn(t.app, PRODUCER);
    const studioId = t.seed.studioId;
    const track = (
      await pia.send('post', `/api/studios/${studioId}/tracks`, { title: 'Worker Side Writes', film: '' })
    ).body as { id: string };
    const row = async () => (await page(pia, studioId)).items.find((i) => i.id === track.id)!;
    expect((await row()).takes).toBe(0);

    const takeId = await insertTake(studioId, track.id, 1);
    expect((await row()).takes).toBe((await sqlCounts(studioId, track.id)).takes);
    expect((await row()).takes).toBe(1);

    const run = (
      await t.tdb.pool.query(
        `INSERT INTO cue_runs (studio_id, track_id, take_id, venue_id, budget_version_id, state)
         VALUES ($1, $2, $3, $4, $5, 'queued') RETURNING id`,
        [studioId, track.id, takeId, t.seed.venueIds.dome, t.seed.budgetVersionId],
      )
    ).rows[0] as { id: string };
    expect((await row()).venues.map((v) => v.state)).toEqual(['queued']);

    // A heartbeat and progress change nothing the table shows: the studio's version stays.
    const version = async () =>
      Number(
        (
          (
            await t.tdb.pool.query('SELECT version FROM studio_data_versions WHERE studio_id = $1', [
              studioId,
            ])
          ).rows[0] as { version: string }
        ).version,
      );
    const v0 = await version();
    await t.tdb.pool.query(
      `UPDATE cue_runs SET state = 'cueing', progress = 10, heartbeat_at = now() WHERE id = $1`,
      [run.id],
    );
    const v1 = await version();
    expect(v1).toBeGreaterThan(v0);
    await t.tdb.pool.query(`UPDATE cue_runs SET progress = 40, heartbeat_at = now() WHERE id = $1`, [run.id]);
    expect(await version()).toBe(v1);
    expect((await row()).venues.map((v) => v.state)).toEqual(['cueing']);

    await t.tdb.pool.query(`UPDATE cue_runs SET state = 'failed', failure_reason = 'x' WHERE id = $1`, [
      run.id,
    ]);
    const stored = (await t.tdb.pool.query('SELECT state FROM cue_runs WHERE id = $1', [run.id])).rows[0] as {
      state: string;
    };
    expect((await row()).venues.map((v) => v.state)).toEqual([stored.state]);

    const renamed = 'Dome Renamed For The Cache Check';
    await t.tdb.pool.query('UPDATE venues SET name = $1 WHERE id = $2', [renamed, t.seed.venueIds.dome]);
    expect((await row()).venues.map((v) => v.venueName)).toEqual([renamed]);

    await t.tdb.pool.query('DELETE FROM takes WHERE id = $1', [takeId]);
    const gone = await row();
    expect(gone.takes).toBe(0);
    expect(gone.venues).toEqual([]);
  });
});

describe('the data version', () => {
  it('rises once for a transaction of many changes, and a studio deleted with its rows leaves none', async () => {
    const version = async (id: string) =>
      (
        (await t.tdb.pool.query('SELECT version FROM studio_data_versions WHERE studio_id = $1', [id]))
          .rows[0] as { version: string } | undefined
      )?.version;
    const studio = (
      await t.tdb.pool.query(
        `INSERT INTO studios (name, slug) VALUES ('Short-Lived Studio', 'short-lived') RETURNING id`,
      )
    ).rows[0] as { id: string };
    expect(await version(studio.id)).toBeUndefined();
    const c = await t.tdb.pool.connect();
    try {
      await c.query('BEGIN');
      await c.query(
        `INSERT INTO tracks (studio_id, title) SELECT $1, 'Short ' || g FROM generate_series(1, 50) g`,
        [studio.id],
      );
      await c.query(`UPDATE tracks SET film = 'x' WHERE studio_id = $1`, [studio.id]);
      await c.query('COMMIT');
    } finally {
      c.release();
    }
    expect(await version(studio.id)).toBe('1');
    await t.tdb.pool.query('DELETE FROM studios WHERE id = $1', [studio.id]);
    expect(await version(studio.id)).toBeUndefined();
    expect(
      (
        (await t.tdb.pool.query('SELECT count(*)::int AS n FROM tracks WHERE studio_id = $1', [studio.id]))
          .rows[0] as {
          n: number;
        }
      ).n,
    ).toBe(0);
  });
});

describe('members and sessions', () => {
  it('refuses a removed member on their very next request, in this process and in another', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const engineerHere = await signedIn(t.app, 'eli.engineer@lanternfish.example');
    const engineerThere = await signedIn(other.app, 'eli.engineer@lanternfish.example');
    await page(engineerHere, t.seed.studioId);
    await page(engineerThere, t.seed.studioId);
    const userId = t.seed.userIds['eli.engineer@lanternfish.example']!;
    expect((await admin.send('delete', `/api/studios/${t.seed.studioId}/members/${userId}`)).status).toBe(
      204,
    );
    expect((await engineerHere.get(tracksPath(t.seed.studioId))).status).toBe(404);
    expect((await engineerThere.get(tracksPath(t.seed.studioId))).status).toBe(404);
  });

  it('applies a role change on the next request: a reviewer made venue operator may no longer read tracks', async () => {
    const admin = await signedIn(t.app, ADMIN);
    const reviewer = await signedIn(t.app, 'rosa.reviewer@lanternfish.example');
    await page(reviewer, t.seed.studioId);
    const userId = t.seed.userIds['rosa.reviewer@lanternfish.example']!;
    const changed = await admin.send('patch', `/api/studios/${t.seed.studioId}/members/${userId}`, {
      roles: ['venue_operator'],
      venueIds: [t.seed.venueIds.arcade],
    });
    expect(changed.status).toBe(200);
    expect((await reviewer.get(tracksPath(t.seed.studioId))).status).toBe(403);
  });

  it('refuses a signed-out session at once here, and within AUTH_CACHE_MS in another process', async () => {
    const { cookie, csrf } = await rawSignIn(PRODUCER);
    const read = (app: TestApp['app']) => request(app).get(tracksPath(t.seed.studioId)).set('cookie', cookie);
    // Both processes have just read this session.
    expect((await read(t.app)).status).toBe(200);
    expect((await read(other.app)).status).toBe(200);
    const out = await request(t.app).post('/api/auth/logout').set('cookie', cookie).set('x-csrf-token', csrf);
    expect(out.status).toBe(204);
    expect((await read(t.app)).status).toBe(401);
    const t0 = Date.now();
    let refusedAfter_ms = -1;
    while (Date.now() - t0 < AUTH_CACHE_MS + 1000) {
      const s = (await read(other.app)).status;
      if (s === 401) {
        refusedAfter_ms = Date.now() - t0;
        break;
      }
      expect(s).toBe(200);
      await new Promise((r) => setTimeout(r, 100));
    }
    expect(refusedAfter_ms).toBeGreaterThanOrEqual(0);
    expect(refusedAfter_ms).toBeLessThanOrEqual(AUTH_CACHE_MS + 200);
  });

  it('lets nobody in with a session after its password was reset in this process', async () => {
    const pia = await signedIn(t.app, PRODUCER);
    await page(pia, t.seed.studioId);
    const userId = t.seed.userIds[PRODUCER]!;
    const token = 'cache-check-reset-token-0123456789abcdef';
    const { hashToken } = await import('../../server/lib/tokens');
    await t.tdb.pool.query(
      `INSERT INTO password_resets (user_id, token_hash, expires_at) VALUES ($1, $2, now() + interval '1 hour')`,
      [userId, hashToken(token)],
    );
    const stranger = new Client(t.app);
    await stranger.refreshCsrf();
    const reset = await stranger.send('post', '/api/auth/password-reset/confirm', {
      token,
      password: DEMO_PASSWORD,
    });
    expect(reset.status).toBe(204);
    expect((await pia.get(tracksPath(t.seed.studioId))).status).toBe(401);
  });
});

describe('kept answers stay with their studio and role', () => {
  it("never shows one studio's answer for another, for the same query", async () => {
    // The admin belongs to both studios (producer in the second).
    const admin = await signedIn(t.app, ADMIN);
    const first = await page(admin, t.seed.studioId);
    const second = await page(admin, t.seed.secondStudioId);
    expect(first.total).toBe((await sqlCounts(t.seed.studioId)).tracks);
    expect(second.total).toBe((await sqlCounts(t.seed.secondStudioId)).tracks);
    const made = await admin.send('post', `/api/studios/${t.seed.secondStudioId}/tracks`, {
      title: 'Only In The Second Studio',
      film: '',
    });
    expect(made.status).toBe(201);
    const first2 = await page(admin, t.seed.studioId);
    const second2 = await page(admin, t.seed.secondStudioId);
    expect(first2.items.map((i) => i.title)).not.toContain('Only In The Second Studio');
    expect(second2.items.map((i) => i.title)).toContain('Only In The Second Studio');
    expect(first2.total).toBe((await sqlCounts(t.seed.studioId)).tracks);
    expect(second2.total).toBe((await sqlCounts(t.seed.secondStudioId)).tracks);
    expect(first2.total).not.toBe(second2.total);
    // A member of the first studio only: the second's answer, just made and kept, is not theirs.
    const pia = await signedIn(t.app, PRODUCER);
    expect((await pia.get(tracksPath(t.seed.secondStudioId))).status).toBe(404);
  });

  it('gives each of many members asking at the same moment their own roles (shared look-ups)', async () => {
    const pia = await signedIn(t.app, PRODUCER);
    const operator = await signedIn(t.app, 'otto.operator@lanternfish.example');
    const admin = await signedIn(t.app, ADMIN);
    // Expected from each one's roles as stored (shared/demo.ts): producer and admin may read the
    // table, the operator may not; the admin also reads the second studio, the producer may not.
    const asks = Array.from({ length: 12 }, (_, i) => {
      const who = [pia, operator, admin][i % 3]!;
      const studio = i % 2 ? t.seed.secondStudioId : t.seed.studioId;
      const expected =
        who === operator
          ? studio === t.seed.studioId
            ? 403
            : 404
          : who === pia && studio !== t.seed.studioId
            ? 404
            : 200;
      return { who, studio, expected };
    });
    const got = await Promise.all(asks.map((a) => a.who.get(tracksPath(a.studio)).then((r) => r.status)));
    expect(got).toEqual(asks.map((a) => a.expected));
  });

  it('gives a venue operator and an API token no answer that a producer has just been given', async () => {
    const pia = await signedIn(t.app, PRODUCER);
    await page(pia, t.seed.studioId);
    const operator = await signedIn(t.app, 'otto.operator@lanternfish.example');
    expect((await operator.get(tracksPath(t.seed.studioId))).status).toBe(403);
    const admin = await signedIn(t.app, ADMIN);
    const tok = await admin.send('post', `/api/studios/${t.seed.studioId}/tokens`, { name: 'cache check' });
    expect(tok.status).toBe(201);
    const secret = (tok.body as { token: string }).token;
    const r = await request(t.app).get(tracksPath(t.seed.studioId)).set('authorization', `Bearer ${secret}`);
    expect(r.status).toBe(403);
  });
});
