// Random bodies against the endpoints that take the most input (take upload, profiles and their
// versions, reviews, venue base and settings), signed in with the roles that may use them: every
// answer must be a 2xx or a 4xx with an error message, never a 5xx, and the server must keep working
// (what was stored before is still there). Seeded, so a failure is reproduced by its seed.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { count, eq } from 'drizzle-orm';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { startCueWorker } from './support/cue-worker';
import type { CueWorker } from './support/cue-worker';
import { profiles, takes } from '../../server/db/schema';
import { makeRng } from '../factories/motion';
import { makeVehicleCsv } from '../factories/takes';
import { runSummarySchema, trackDetailSchema, uploadedTakeSchema } from '../../shared/schemas/pipeline';

const SEED = 20261203;
const ROUNDS = 150;

let t: TestApp;
let worker: CueWorker;
const as: Record<'producer' | 'engineer' | 'reviewer', Client> = {} as never;

beforeAll(async () => {
  t = await startTestApp({ queue: true, env: { LOGIN_RATE_LIMIT: '1000' } });
  worker = await startCueWorker(t);
  for (const [k, email] of [
    ['producer', 'pia.producer@lanternfish.example'],
    ['engineer', 'eli.engineer@lanternfish.example'],
    ['reviewer', 'rosa.reviewer@lanternfish.example'],
  ] as const) {
    as[k] = new Client(t.app);
    await as[k].signIn(email);
  }
}, 60_000);
afterAll(async () => {
  worker.close();
  await t.close();
});

/** A random JSON value: field names from the endpoints' own vocabulary, hostile strings and numbers. */
function randomValue(rng: () => number, depth = 0): unknown {
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rng() * xs.length)] as T;
  const strings = [
    '',
    ' ',
    'a'.repeat(5000),
    'nul\u0000byte',
    'lone \ud800 surrogate',
    '\u202eright-to-left',
    '<script>alert(1)</script>',
    "'; drop table takes; --",
    '../../etc/passwd',
    '%00%ff',
    'hold',
    'clear',
    'cueing',
    'budget',
    'hexapod',
    'planar3',
    '1e309',
    'NaN',
  ];
  const numbers = [0, -0, 1, -1, 0.5, 1e308, -1e308, 5e-324, 2 ** 53, -(2 ** 31), 42, 1e21];
  const keys = [
    'kind',
    'name',
    'note',
    'params',
    'decision',
    'reason',
    'base',
    'cueingVersionId',
    'budgetVersionId',
    'envelope',
    'comfort',
    'legLimits',
    'controllerRate_hz',
    'seats_m',
    'x',
    'fx',
    'gain',
    '__proto__',
    'constructor',
    'toString',
  ];
  const r = rng();
  if (depth > 4 || r < 0.15) return pick(strings);
  if (r < 0.3) return pick(numbers);
  if (r < 0.35) return rng() < 0.5;
  if (r < 0.4) return null;
  if (r < 0.55) return Array.from({ length: Math.floor(rng() * 6) }, () => randomValue(rng, depth + 1));
  const o: Record<string, unknown> = {};
  const n = Math.floor(rng() * 6);
  for (let i = 0; i < n; i++)
    o[rng() < 0.8 ? pick(keys) : `k${Math.floor(rng() * 100)}`] = randomValue(rng, depth + 1);
  return o;
}

/** A random request body: JSON of a random value, or raw bytes under a random content type. */
function randomBody(rng: () => number): { type: string; body: Buffer } {
  const r = rng();
  if (r < 0.6)
    return { type: 'application/json', body: Buffer.from(JSON.stringify(randomValue(rng)) ?? 'null') };
  const bytes = Buffer.from(Array.from({ length: Math.floor(rng() * 400) }, () => Math.floor(rng() * 256)));
  const types = [
    'application/json',
    'application/json; charset=utf-16',
    'text/plain',
    'application/x-www-form-urlencoded',
    'application/octet-stream',
    'multipart/form-data; boundary=x',
  ];
  return { type: types[Math.floor(rng() * types.length)]!, body: bytes };
}

/** A random take file: CSV-like lines of plausible headers and hostile fields, sometimes binary. */
function randomTake(rng: () => number): Buffer {
  // Now and then a good file, so that accepted uploads are counted as well.
  if (rng() < 0.2) return Buffer.from(makeVehicleCsv({ duration_s: 1 + Math.floor(rng() * 3) }));
  if (rng() < 0.2)
    return Buffer.from(Array.from({ length: Math.floor(rng() * 2000) }, () => Math.floor(rng() * 256)));
  const headers = [
    'time_s,fx_mps2,fy_mps2,fz_mps2,wx_radps,wy_radps,wz_radps',
    'time_s,x_m,y_m,z_m,roll_rad,pitch_rad,yaw_rad',
    'time_s,leg1_m,leg2_m,leg3_m,leg4_m,leg5_m,leg6_m',
    'time_ms,x_mm,y_mm,yaw_deg',
    'time_s,,',
    '',
  ];
  const fields = [
    '0',
    '0.01',
    '-1',
    '1e300',
    'NaN',
    '',
    '"1"',
    ' 2 ',
    '9.81',
    '1,5',
    '\u0000',
    '0x10',
    '1e-400',
  ];
  const lines = [headers[Math.floor(rng() * headers.length)]!];
  const rows = Math.floor(rng() * 40);
  for (let i = 0; i < rows; i++) {
    const n = 1 + Math.floor(rng() * 8);
    lines.push(
      Array.from({ length: n }, (_, c) =>
        c === 0 && rng() < 0.7 ? String(i / 100) : fields[Math.floor(rng() * fields.length)],
      ).join(','),
    );
  }
  return Buffer.from(lines.join(rng() < 0.1 ? '\r\n' : '\n'));
}

const base = () => `/api/studios/${t.seed.studioId}`;

describe('fuzzed bodies', () => {
  it('never answer 5xx, and leave what was stored before in place', async () => {
    const rng = makeRng(SEED);
    const p = as.producer;
    const track = trackDetailSchema.parse(
      (await p.send('post', `${base()}/tracks`, { title: 'Static Noise', film: 'Undertow (fictional)' }))
        .body,
    );
    const good = uploadedTakeSchema.parse(
      (
        await p
          .raw('post', `${base()}/tracks/${track.id}/takes?fileName=good.csv`)
          .set('content-type', 'application/octet-stream')
          .send(Buffer.from(makeVehicleCsv({ duration_s: 3 })))
      ).body,
    );
    const [run] = runSummarySchema
      .array()
      .parse(
        (await p.send('post', `${base()}/takes/${good.id}/runs`, { venueIds: [t.seed.venueIds.dome] })).body,
      );
    await worker.waitForRun(run!.id);
    const list = (await as.engineer.get(`${base()}/profiles`).expect(200)).body as
      { id: string }[] | { profiles: { id: string }[] };
    const profileIds = (Array.isArray(list) ? list : list.profiles).map((x) => x.id);
    expect(profileIds.length).toBeGreaterThan(0);
    const profilesBefore = (await t.tdb.db.select({ n: count() }).from(profiles))[0]!.n;

    const answers: { what: string; status: number; error?: unknown }[] = [];
    const fire = async (who: Client, method: 'post' | 'put', path: string, what: string) => {
      const { type, body } = randomBody(rng);
      const r = await who.raw(method, path).set('content-type', type).send(body);
      answers.push({
        what: `${what} ${type} ${body.toString('utf8').slice(0, 120)}`,
        status: r.status,
        error: r.body?.error,
      });
    };
    let uploaded = 0;
    for (let k = 0; k < ROUNDS; k++) {
      const names = [
        'take.csv',
        'take.csv.gz',
        'bad name.txt',
        '../x.csv',
        '\u0000.csv',
        'a'.repeat(300) + '.csv',
      ];
      const fileName = encodeURIComponent(names[Math.floor(rng() * names.length)]!);
      const up = await p
        .raw('post', `${base()}/tracks/${track.id}/takes?fileName=${fileName}`)
        .set('content-type', rng() < 0.8 ? 'application/octet-stream' : 'text/csv')
        .send(randomTake(rng));
      if (up.status === 201) uploaded++;
      answers.push({ what: `upload ${fileName}`, status: up.status, error: up.body?.error });
      await fire(as.engineer, 'post', `${base()}/profiles`, 'new profile');
      await fire(
        as.engineer,
        'post',
        `${base()}/profiles/${profileIds[k % profileIds.length]}/versions`,
        'new version',
      );
      await fire(as.reviewer, 'post', `${base()}/runs/${run!.id}/review`, 'review');
      await fire(as.engineer, 'put', `${base()}/venues/${t.seed.venueIds.dome}/base`, 'venue base');
      await fire(as.engineer, 'put', `${base()}/venues/${t.seed.venueIds.arcade}/settings`, 'venue settings');
    }
    const server = answers.filter((a) => a.status >= 500 || a.status < 200);
    expect(server, JSON.stringify(server.slice(0, 5), null, 1)).toEqual([]);
    expect(uploaded).toBeGreaterThan(0);
    expect(answers.filter((a) => a.status === 400).length).toBeGreaterThan(ROUNDS);
    // Every refusal says what was wrong.
    for (const a of answers.filter((x) => x.status >= 400)) expect(typeof a.error, a.what).toBe('string');
    // The take stored before the fuzzing is still there, with exactly the takes that were accepted.
    const n = (await t.tdb.db.select({ n: count() }).from(takes).where(eq(takes.trackId, track.id)))[0]!.n;
    expect(n).toBe(1 + uploaded);
    expect((await p.get(`${base()}/tracks/${track.id}`).expect(200)).body.takes.length).toBe(1 + uploaded);
    expect((await t.tdb.db.select({ n: count() }).from(profiles))[0]!.n).toBeGreaterThanOrEqual(
      profilesBefore,
    );
    // Still answering normally.
    await as.producer.get(`${base()}/runs/${run!.id}`).expect(200);
  }, 240_000);
});
