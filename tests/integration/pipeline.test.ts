// The pipeline against the real services: upload to the S3 fake, a cue run on the pg-boss queue with
// the real worker handler, artifacts in storage and rows in PostgreSQL.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { gzipSync } from 'node:zlib';
import { DeleteObjectCommand, ListObjectsV2Command } from '@aws-sdk/client-s3';
import { count, desc, eq } from 'drizzle-orm';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { auditEvents, cueRuns, takes, venues } from '../../server/db/schema';
import { startCueWorker } from './support/cue-worker';
import type { CueWorker } from './support/cue-worker';
import { makeVehicleCsv } from '../factories/takes';
import { demoHexapodInput } from '../../shared/schemas/motion-base';
import {
  runDetailSchema,
  runSummarySchema,
  trackDetailSchema,
  uploadedTakeSchema,
} from '../../shared/schemas/pipeline';

import type { TrackDetail } from '../../shared/schemas/pipeline';
import { runSeriesSchema } from '../../shared/schemas/run-series';

// Every answer is parsed with the schema the client parses it with, so a drift fails here.
const runSummaryList = runSummarySchema.array();

let t: TestApp;
let producer: Client;
let worker: CueWorker;
const sha = (b: string | Buffer) => createHash('sha256').update(b).digest('hex');

beforeAll(async () => {
  t = await startTestApp({
    queue: true,
    env: { CUE_RUN_RETRY_LIMIT: '2', CUE_RUN_RETRY_DELAY_S: '1', LOGIN_RATE_LIMIT: '1000' },
  });
  worker = await startCueWorker(t);
  producer = new Client(t.app);
  await producer.signIn('pia.producer@lanternfish.example');
}, 60_000);
afterAll(async () => {
  worker.close();
  await t.close();
});

const base = () => `/api/studios/${t.seed.studioId}`;

async function newTrack(title = 'Kelp Forest Descent'): Promise<TrackDetail> {
  const r = await producer.send('post', `${base()}/tracks`, { title, film: 'Undertow (fictional)' });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return trackDetailSchema.parse(r.body);
}

async function upload(trackId: string, fileName: string, body: string | Buffer, c: Client = producer) {
  return c
    .raw('post', `${base()}/tracks/${trackId}/takes?fileName=${encodeURIComponent(fileName)}`)
    .set('content-type', 'application/octet-stream')
    .send(Buffer.isBuffer(body) ? body : Buffer.from(body));
}

describe('takes', () => {
  it('streams an upload to storage, records size and SHA-256, and the stored bytes match', async () => {
    const track = await newTrack();
    const csv = makeVehicleCsv({ duration_s: 12 });
    const r = await upload(track.id, 'descent-take1.csv', csv);
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    const take = uploadedTakeSchema.parse(r.body);
    expect(take).toMatchObject({
      number: 1,
      kind: 'vehicle',
      sizeBytes: Buffer.byteLength(csv),
      sha256: sha(csv),
      samples: 1201,
    });
    const [row] = await t.tdb.db.select().from(takes).where(eq(takes.id, take.id));
    // The stored object is byte for byte what was sent (the S3 fake corrupts streamed bodies under some SDK settings).
    expect(sha(await worker.stored(row!.storageKey))).toBe(sha(csv));
  });

  it('accepts a gzipped take', async () => {
    const track = await newTrack('Gzip Gulch');
    const gz = gzipSync(makeVehicleCsv({ duration_s: 3 }));
    const r = await upload(track.id, 'gulch.csv.gz', gz);
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(uploadedTakeSchema.parse(r.body).sha256).toBe(sha(gz));
  });

  it('refuses a bad file with its line and column, and stores nothing', async () => {
    const track = await newTrack('Broken Reef');
    const good = await upload(track.id, 'reef.csv', makeVehicleCsv({ duration_s: 2 }));
    expect(good.status).toBe(201);
    const before = await t.tdb.db.select({ n: count() }).from(takes);
    const list = await worker.storage.client.send(
      new ListObjectsV2Command({
        Bucket: worker.storage.bucket,
        Prefix: `studios/${t.seed.studioId}/takes/`,
      }),
    );
    const bad = makeVehicleCsv({ duration_s: 2 }).replace(/\n0\.0300,[^,]*,/, '\n0.0300,abc,');
    const r = await upload(track.id, 'reef-bad.csv', bad);
    expect(r.status).toBe(400);
    expect(r.body.error).toBe('reef-bad.csv line 5, column 2 (fx_mps2): not a number: "abc"');
    const after = await t.tdb.db.select({ n: count() }).from(takes);
    expect(after[0]!.n).toBe(before[0]!.n);
    const list2 = await worker.storage.client.send(
      new ListObjectsV2Command({
        Bucket: worker.storage.bucket,
        Prefix: `studios/${t.seed.studioId}/takes/`,
      }),
    );
    expect(list2.KeyCount).toBe(list.KeyCount);
    // The good take is still there, unchanged.
    const detail = await producer.get(`${base()}/tracks/${track.id}`).expect(200);
    expect(trackDetailSchema.parse(detail.body).takes.map((x) => x.fileName)).toEqual(['reef.csv']);
  });

  it('refuses a take no ride can be (1e300 m/s^2, a 5-hour span) with its line, and stores nothing', async () => {
    // The issue seen before: such a take was cued and read "within budget, 0 findings".
    const track = await newTrack('Wild Numbers');
    const before = await t.tdb.db.select({ n: count() }).from(takes);
    const huge = makeVehicleCsv({ duration_s: 2 }).replace(/\n0\.0300,[^,]*,/, '\n0.0300,1e300,');
    const r = await upload(track.id, 'wild.csv', huge);
    expect(r.status).toBe(400);
    expect(r.body.error).toMatch(
      /^wild\.csv line 5, column 2 \(fx_mps2\): implausible value 1e\+300 for fx_mps2/,
    );
    const header = 'time_s,fx_mps2,fy_mps2,fz_mps2,wx_radps,wy_radps,wz_radps';
    const span = `${header}\n0,0,0,9.80665,0,0,0\n18000,0,0,9.80665,0,0,0\n`;
    const r2 = await upload(track.id, 'span.csv', span);
    expect(r2.status).toBe(400);
    expect(r2.body.error).toMatch(/^span\.csv line 3, column 1 \(time_s\): take too long/);
    const after = await t.tdb.db.select({ n: count() }).from(takes);
    expect(after[0]!.n).toBe(before[0]!.n);
  });

  it('refuses a file over the size limit', async () => {
    const small = await startTestApp({ env: { UPLOAD_MAX_BYTES: '1000' } });
    try {
      const c = new Client(small.app);
      await c.signIn('pia.producer@lanternfish.example');
      const tr = await c.send('post', `/api/studios/${small.seed.studioId}/tracks`, { title: 'Too Long' });
      const r = await c
        .raw('post', `/api/studios/${small.seed.studioId}/tracks/${tr.body.id}/takes?fileName=long.csv`)
        .set('content-type', 'application/octet-stream')
        .send(Buffer.from(makeVehicleCsv({ duration_s: 5 })));
      expect(r.status).toBe(413);
      expect(r.body.error).toMatch(/larger than the limit of 1000 bytes/);
    } finally {
      await small.close();
    }
  });

  it('takes pushes from a pipeline with a per-studio API token, and refuses it elsewhere', async () => {
    const admin = new Client(t.app);
    await admin.signIn('ada.admin@lanternfish.example');
    const made = await admin.send('post', `${base()}/tokens`, { name: 'render farm' });
    expect(made.status).toBe(201);
    const token = made.body.token as string;
    const track = await newTrack('Token Trench');
    const r = await (
      await import('supertest')
    )
      .default(t.app)
      .post(`${base()}/tracks/${track.id}/takes?fileName=farm.csv`)
      .set('authorization', `Bearer ${token}`)
      .set('content-type', 'application/octet-stream')
      .send(Buffer.from(makeVehicleCsv({ duration_s: 2 })));
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body.uploadedVia).toBe('token');
    const other = await (
      await import('supertest')
    )
      .default(t.app)
      .get(`/api/studios/${t.seed.secondStudioId}/tracks`)
      .set('authorization', `Bearer ${token}`);
    expect(other.status).toBe(404);
    // A token may push takes but not read members.
    const members = await (
      await import('supertest')
    )
      .default(t.app)
      .get(`${base()}/members`)
      .set('authorization', `Bearer ${token}`);
    expect(members.status).toBe(403);
    expect((await admin.send('delete', `${base()}/tokens/${made.body.id}`)).status).toBe(204);
    const revoked = await (
      await import('supertest')
    )
      .default(t.app)
      .get(`${base()}/tracks`)
      .set('authorization', `Bearer ${token}`);
    expect(revoked.status).toBe(401);
  });
});

describe('cue runs', () => {
  it('queues one run per venue, and the worker leaves artifacts in storage and a summary in the database', async () => {
    const track = await newTrack('Lantern Drop');
    const up = await upload(track.id, 'drop.csv', makeVehicleCsv({ duration_s: 15 }));
    const take = uploadedTakeSchema.parse(up.body);
    const q = await producer.send('post', `${base()}/takes/${take.id}/runs`, {
      venueIds: [t.seed.venueIds.dome, t.seed.venueIds.arcade],
    });
    expect(q.status, JSON.stringify(q.body)).toBe(201);
    const runs = runSummaryList.parse(q.body);
    expect(runs.map((r) => r.venueName).sort()).toEqual(['Harbour Lights Dome', 'Tidewater Arcade']);
    for (const run of runs) {
      const row = await worker.waitForRun(run.id, (s) => s !== 'queued' && s !== 'cueing');
      expect(['awaiting_review', 'held_by_budget']).toContain(row.state);
      expect(row.progress).toBe(100);
      const manifest = JSON.parse((await worker.stored(`${row.artifactPrefix}manifest.json`)).toString()) as {
        files: { name: string; sha256: string }[];
        input: { sha256: string };
      };
      expect(manifest.input.sha256).toBe(take.sha256);
      for (const f of manifest.files)
        expect(sha(await worker.stored(`${row.artifactPrefix}${f.name}`)), f.name).toBe(f.sha256);
      expect(manifest.files.map((f) => f.name).sort()).toEqual([
        'findings.json',
        'legs.csv',
        'pose.csv',
        'report.txt',
        'seat_force.csv',
        'spectra.json',
      ]);
      const d = runDetailSchema.parse((await producer.get(`${base()}/runs/${run.id}`).expect(200)).body);
      expect(d.result?.uses.length).toBeGreaterThan(0);
      expect(d.state).toBe(row.state);
      // The package report names the cueing profile as the run page does (name and version).
      const report = (await worker.stored(`${row.artifactPrefix}report.txt`)).toString();
      if (d.cueingVersion) {
        expect(report).toContain(`profile "${d.cueingVersion.name} v${d.cueingVersion.version}"`);
      }
      // The state follows the findings: held by budget exactly when a finding is at or over a limit.
      expect(d.state === 'held_by_budget').toBe((d.result?.findings.length ?? 0) > 0);
      // Parsed with the client's own schema, which refuses a band off the time axis' length.
      const series = runSeriesSchema.parse(
        (await producer.get(`${base()}/runs/${run.id}/series`).expect(200)).body,
      );
      expect(series.legs.length).toBe(run.venueName === 'Harbour Lights Dome' ? 6 : 3);
      const n = series.time_s.length;
      const bands = [
        ...series.legs,
        ...Object.values(series.pose),
        ...(['x', 'y', 'z'] as const).flatMap((a) => [series.force[a].cued, series.force[a].input!]),
      ];
      for (const b of bands) {
        expect(b.min.length).toBe(n);
        expect(b.max.length).toBe(n);
      }
      // The trace keeps the take's own times, 15 s from t = 0 (makeVehicleCsv), with the venue's ramps
      // from neutral before it and back to neutral after it, at the controller grid.
      const [venue] = await t.tdb.db.select().from(venues).where(eq(venues.id, row.venueId));
      const ramp_s = venue!.controller.ramp.duration_s;
      expect(ramp_s).toBeGreaterThan(0);
      expect(d.ramp).toEqual({ in_s: ramp_s, out_s: ramp_s, profile: venue!.controller.ramp.profile });
      expect(series.time_s[n - 1]).toBeCloseTo(take.duration_s + ramp_s, 6);
      expect(series.time_s[0]).toBeCloseTo(-ramp_s, 6);
      const legs = await producer.get(`${base()}/runs/${run.id}/files/legs.csv`).expect(200);
      expect(legs.text.split('\n')[0]).toMatch(/^time_s,leg1_m/);
    }
    // Profile versions used by a run are frozen.
    const profs = await producer.get(`${base()}/profiles?kind=budget`).expect(200);
    expect(profs.body[0].versions[0].used).toBe(true);
  });

  it('asking again for the same take and venue returns the same run; a repeated delivery changes nothing', async () => {
    const track = await newTrack('Echo Chamber');
    const take = uploadedTakeSchema.parse(
      (await upload(track.id, 'echo.csv', makeVehicleCsv({ duration_s: 5 }))).body,
    );
    const first = runSummaryList.parse(
      (await producer.send('post', `${base()}/takes/${take.id}/runs`, { venueIds: [t.seed.venueIds.dome] }))
        .body,
    );
    const done = await worker.waitForRun(first[0]!.id, (s) => s !== 'queued' && s !== 'cueing');
    const again = runSummaryList.parse(
      (await producer.send('post', `${base()}/takes/${take.id}/runs`, { venueIds: [t.seed.venueIds.dome] }))
        .body,
    );
    expect(again[0]!.id).toBe(first[0]!.id);
    await worker.handle({
      id: first[0]!.id,
      data: { runId: first[0]!.id, studioId: t.seed.studioId },
      retryCount: 0,
      retryLimit: 2,
    });
    const [after] = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.id, first[0]!.id));
    expect(after!.finishedAt?.getTime()).toBe(done.finishedAt?.getTime());
    expect(after!.attempts).toBe(done.attempts);
    const all = await t.tdb.db.select({ n: count() }).from(cueRuns).where(eq(cueRuns.takeId, take.id));
    expect(all[0]!.n).toBe(1);
  });

  it('a run left half-done by a worker that died is done again, once', async () => {
    const track = await newTrack('Stalled Lift');
    const take = uploadedTakeSchema.parse(
      (await upload(track.id, 'lift.csv', makeVehicleCsv({ duration_s: 5 }))).body,
    );
    const [run] = runSummaryList.parse(
      (await producer.send('post', `${base()}/takes/${take.id}/runs`, { venueIds: [t.seed.venueIds.arcade] }))
        .body,
    );
    await worker.waitForRun(run!.id, (s) => s !== 'queued' && s !== 'cueing');
    // What a killed worker leaves: state cueing, partial progress, no summary.
    await t.tdb.db
      .update(cueRuns)
      .set({ state: 'cueing', progress: 40, summary: null, finishedAt: null })
      .where(eq(cueRuns.id, run!.id));
    await worker.handle({
      id: run!.id,
      data: { runId: run!.id, studioId: t.seed.studioId },
      retryCount: 1,
      retryLimit: 2,
    });
    const [row] = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.id, run!.id));
    expect(['awaiting_review', 'held_by_budget']).toContain(row!.state);
    expect(row!.summary).not.toBeNull();
    expect(row!.progress).toBe(100);
  });

  it('a job that throws is retried and ends failed with its reason', async () => {
    const track = await newTrack('Vanishing Act');
    const take = uploadedTakeSchema.parse(
      (await upload(track.id, 'vanish.csv', makeVehicleCsv({ duration_s: 3 }))).body,
    );
    const [row] = await t.tdb.db.select().from(takes).where(eq(takes.id, take.id));
    await worker.storage.client.send(
      new DeleteObjectCommand({ Bucket: worker.storage.bucket, Key: row!.storageKey }),
    );
    const [run] = runSummaryList.parse(
      (await producer.send('post', `${base()}/takes/${take.id}/runs`, { venueIds: [t.seed.venueIds.dome] }))
        .body,
    );
    const failed = await worker.waitForRun(run!.id, (s) => s === 'failed', 90_000);
    // Retry limit 2 in this file: three attempts in all.
    expect(failed.attempts).toBe(3);
    expect(failed.failureReason).toMatch(/^Gave up after 3 attempt\(s\): /);
    const d = runDetailSchema.parse((await producer.get(`${base()}/runs/${run!.id}`).expect(200)).body);
    expect(d.failureReason).toBe(failed.failureReason);
  });

  it('a take that does not fit the venue is refused before any run is made', async () => {
    const track = await newTrack('Flat Pose');
    const pose = 'time_s,x_m,y_m,yaw_rad\n0,0,0,0\n0.1,0.01,0,0\n0.2,0.02,0,0\n0.3,0.03,0,0\n';
    const take = uploadedTakeSchema.parse((await upload(track.id, 'flat.csv', pose)).body);
    expect(take.layout).toBe('planar3');
    const r = await producer.send('post', `${base()}/takes/${take.id}/runs`, {
      venueIds: [t.seed.venueIds.dome],
    });
    expect(r.status).toBe(400);
    expect(r.body.error).toMatch(/Harbour Lights Dome is a hexapod base/);
  });
});

describe('venues', () => {
  it('refuses an impossible motion base with every problem and its path, and keeps the old one', async () => {
    const eng = new Client(t.app);
    await eng.signIn('eli.engineer@lanternfish.example');
    const before = await eng.get(`${base()}/venues/${t.seed.venueIds.dome}`).expect(200);
    // Stroke minimum above its maximum, and a joint moved onto its neighbour (coincident joints).
    const bad = structuredClone(before.body.base) as {
      leg: { min_m: number; max_m: number };
      baseJoints_m: number[][];
    };
    bad.leg.min_m = bad.leg.max_m + 0.1;
    bad.baseJoints_m[1] = [...bad.baseJoints_m[0]!];
    const r = await eng.send('put', `${base()}/venues/${t.seed.venueIds.dome}/base`, { base: bad });
    expect(r.status).toBe(400);
    const paths = (r.body.issues as { path: string }[]).map((i) => i.path);
    expect(paths.some((p) => p.startsWith('leg'))).toBe(true);
    expect(paths.some((p) => p.startsWith('baseJoints_m'))).toBe(true);
    const after = await eng.get(`${base()}/venues/${t.seed.venueIds.dome}`).expect(200);
    expect(after.body.base).toEqual(before.body.base);
  });

  it('saves controller settings with an audit record, refuses bad ones by field and keeps the old ones', async () => {
    const eng = new Client(t.app);
    await eng.signIn('eli.engineer@lanternfish.example');
    const url = `${base()}/venues/${t.seed.venueIds.arcade}/controller`;
    const before = await eng.get(`${base()}/venues/${t.seed.venueIds.arcade}`).expect(200);
    const cases: [object, string][] = [
      [{ ramp: { duration_s: -1 } }, 'ramp.duration_s'],
      [{ ramp: { duration_s: 2, profile: 'linear' } }, 'ramp.profile'],
      [{ encoder: { countsPerMm: 0 } }, 'encoder.countsPerMm'],
      [{ encoder: { countsPerMm: 10, zeroOffset_counts: 0.5 } }, 'encoder.zeroOffset_counts'],
      // An unknown key is a problem of the whole body, named in the message.
      [{ rampe: { duration_s: 2 } }, '(body)'],
    ];
    for (const [body, path] of cases) {
      const r = await eng.send('put', url, body);
      expect(r.status, JSON.stringify(body)).toBe(400);
      const paths = (r.body.issues as { path: string }[]).map((i) => i.path);
      expect(paths, JSON.stringify(body)).toContain(path);
      if (path === '(body)') expect(JSON.stringify(r.body.issues)).toContain('rampe');
    }
    const unchanged = await eng.get(`${base()}/venues/${t.seed.venueIds.arcade}`).expect(200);
    expect(unchanged.body.controller).toEqual(before.body.controller);

    const next = {
      ramp: { duration_s: 1.5, profile: 'raisedCosine' },
      encoder: { countsPerMm: 200, zeroOffset_counts: 12 },
    };
    const ok = await eng.send('put', url, next);
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(ok.body.controller).toEqual(next);
    const [event] = await t.tdb.db
      .select()
      .from(auditEvents)
      .where(eq(auditEvents.action, 'venue.controller_changed'))
      .orderBy(desc(auditEvents.id))
      .limit(1);
    expect(event?.subjectId).toBe(t.seed.venueIds.arcade);
    expect(event?.detail).toEqual({ from: before.body.controller, to: next, venueName: 'Tidewater Arcade' });
    // Put back the seeded settings for the other tests.
    await eng.send('put', url, before.body.controller);
  });

  it('lets an admin create a venue whose base is given in the parametric form, stored in joint form', async () => {
    const admin = new Client(t.app);
    await admin.signIn('ada.admin@lanternfish.example');
    const r = await admin.send('post', `${base()}/venues`, {
      name: 'Driftwood Hall',
      site: 'Old ferry shed',
      timeZone: 'UTC',
      base: demoHexapodInput,
    });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body.base.baseJoints_m).toHaveLength(6);
  });
});

describe('tenancy of the pipeline', () => {
  it('answers 404 to a producer of another studio on every pipeline route', async () => {
    const track = await newTrack('Private Current');
    const take = uploadedTakeSchema.parse(
      (await upload(track.id, 'current.csv', makeVehicleCsv({ duration_s: 2 }))).body,
    );
    const [run] = runSummaryList.parse(
      (await producer.send('post', `${base()}/takes/${take.id}/runs`, { venueIds: [t.seed.venueIds.dome] }))
        .body,
    );
    // Ada produces for Quarry Hill; through Quarry Hill's paths, Lanternfish's things do not exist.
    const other = new Client(t.app);
    await other.signIn('ada.admin@lanternfish.example');
    const q = `/api/studios/${t.seed.secondStudioId}`;
    expect((await other.get(`${q}/tracks/${track.id}`)).status).toBe(404);
    const push = await other
      .raw('post', `${q}/tracks/${track.id}/takes?fileName=x.csv`)
      .set('content-type', 'application/octet-stream')
      .send(Buffer.from(makeVehicleCsv({ duration_s: 1 })));
    expect(push.status).toBe(404);
    expect(
      (await other.send('post', `${q}/takes/${take.id}/runs`, { venueIds: [t.seed.venueIds.dome] })).status,
    ).toBe(404);
    expect((await other.get(`${q}/runs/${run!.id}`)).status).toBe(404);
    expect((await other.get(`${q}/runs/${run!.id}/series`)).status).toBe(404);
    expect((await other.get(`${q}/runs/${run!.id}/files/legs.csv`)).status).toBe(404);
    expect((await other.get(`${q}/venues/${t.seed.venueIds.dome}`)).status).toBe(404);
    const list = await other.get(`${q}/tracks`).expect(200);
    expect(list.body.total).toBe(0);
  });
});
