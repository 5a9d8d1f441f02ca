// Film sync over HTTP: the upload's optional frame rate, start timecode and offset (each bad field a
// 400 naming it, with nothing stored), and the producer's nudge of a run's offset, which makes a new
// run and leaves the old one as it was. The worker handler runs for real, so the manifest is read back.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { count, eq } from 'drizzle-orm';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { cueRuns, takes, venues } from '../../server/db/schema';
import { createBuildReleaseHandler } from '../../worker/jobs/build-release';
import { packageManifestSchema } from '../../shared/schemas/package-manifest';
import { releaseCreatedSchema } from '../../shared/schemas/release';
import { releases } from '../../server/db/schema';
import { unzip } from '../factories/zip';
import { makePoseTrackFrom, poseTrackCsv, smoothStep } from '../unit/budget/track-builders';
import { startCueWorker } from './support/cue-worker';
import type { CueWorker } from './support/cue-worker';
import { makeVehicleCsv } from '../factories/takes';
import {
  runDetailSchema,
  runSummarySchema,
  trackDetailSchema,
  uploadedTakeSchema,
} from '../../shared/schemas/pipeline';

let t: TestApp;
let producer: Client;
let engineer: Client;
let reviewer: Client;
let worker: CueWorker;

beforeAll(async () => {
  t = await startTestApp({
    queue: true,
    env: { CUE_RUN_RETRY_LIMIT: '1', CUE_RUN_RETRY_DELAY_S: '1', LOGIN_RATE_LIMIT: '1000' },
  });
  worker = await startCueWorker(t);
  producer = new Client(t.app);
  await producer.signIn('pia.producer@lanternfish.example');
  engineer = new Client(t.app);
  await engineer.signIn('eli.engineer@lanternfish.example');
  reviewer = new Client(t.app);
  await reviewer.signIn('rosa.reviewer@lanternfish.example');
}, 60_000);
afterAll(async () => {
  worker.close();
  await t.close();
});

const base = () => `/api/studios/${t.seed.studioId}`;

async function newTrack(title: string) {
  const r = await producer.send('post', `${base()}/tracks`, { title, film: 'Glasswing (fictional)' });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return trackDetailSchema.parse(r.body);
}

function upload(trackId: string, query: string, csv = makeVehicleCsv({ duration_s: 6 })) {
  return producer
    .raw('post', `${base()}/tracks/${trackId}/takes?fileName=glasswing.csv${query}`)
    .set('content-type', 'application/octet-stream')
    .send(Buffer.from(csv));
}

describe('film sync at upload', () => {
  it('stores the frame rate, start timecode and offset with the take and shows them on the track', async () => {
    const track = await newTrack('Glasswing Flight');
    const r = await upload(
      track.id,
      `&frameRate=29.97df&startTimecode=${encodeURIComponent('01:00:00;00')}&offset_frames=3`,
    );
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    const take = uploadedTakeSchema.parse(r.body);
    expect(take.filmSync).toEqual({ frameRate: '29.97df', startTimecode: '01:00:00;00', offset_frames: 3 });
    const detail = trackDetailSchema.parse((await producer.get(`${base()}/tracks/${track.id}`)).body);
    expect(detail.takes[0]!.filmSync).toEqual(take.filmSync);
    // A rate alone: the timecode starts at 00:00:00:00 and the offset is 0.
    const plain = uploadedTakeSchema.parse((await upload(track.id, '&frameRate=24')).body);
    expect(plain.filmSync).toEqual({ frameRate: '24', startTimecode: '00:00:00:00', offset_frames: 0 });
    // None of the fields: no film sync at all.
    const none = uploadedTakeSchema.parse((await upload(track.id, '')).body);
    expect(none.filmSync).toBeNull();
  });

  it('refuses each bad field with a 400 naming it, and stores no take', async () => {
    const track = await newTrack('Glasswing Stall');
    const before = (await t.tdb.db.select({ n: count() }).from(takes))[0]!.n;
    const cases: [string, string, RegExp][] = [
      ['&frameRate=48', 'frameRate', /expected one of/],
      // SMPTE ST 12-1 drop-frame: labels 00 and 01 do not exist at the start of minute 1.
      [`&frameRate=29.97df&startTimecode=${encodeURIComponent('00:01:00;00')}`, 'startTimecode', /skipped/],
      ['&frameRate=25&startTimecode=00:00:00:25', 'startTimecode', /00 to 24/],
      ['&frameRate=25&startTimecode=ten', 'startTimecode', /not a timecode/],
      ['&frameRate=25&offset_frames=1.5', 'offset_frames', /whole number of frames/],
      ['&frameRate=25&offset_frames=abc', 'offset_frames', /whole number of frames/],
      ['&startTimecode=01:00:00:00', 'frameRate', /required when startTimecode/],
      ['&offset_frames=2', 'frameRate', /required when offset_frames/],
    ];
    for (const [query, field, message] of cases) {
      const r = await upload(track.id, query);
      expect(r.status, query).toBe(400);
      const body = r.body as { error: string; issues: { path: string; message: string }[] };
      expect(
        body.issues.map((i) => i.path),
        query,
      ).toEqual([field]);
      expect(body.issues[0]!.message, query).toMatch(message);
      expect(body.error, query).toContain(field);
    }
    expect((await t.tdb.db.select({ n: count() }).from(takes))[0]!.n).toBe(before);
  });
});

describe('nudging the film offset of a run', () => {
  it('makes a new run with the new offset, never rewrites the old one, and the same offset finds its run', async () => {
    const track = await newTrack('Glasswing Landing');
    const take = uploadedTakeSchema.parse(
      (await upload(track.id, '&frameRate=25&startTimecode=10:00:00:00&offset_frames=3')).body,
    );
    const asked = await producer.send('post', `${base()}/takes/${take.id}/runs`, {
      venueIds: [t.seed.venueIds.dome],
    });
    expect(asked.status, JSON.stringify(asked.body)).toBe(201);
    const first = runSummarySchema.array().parse(asked.body)[0]!;
    const firstRow = await worker.waitForRun(first.id);
    const firstDetail = runDetailSchema.parse((await producer.get(`${base()}/runs/${first.id}`)).body);
    // The venue's controller settings are recorded with the run when it is queued.
    const [dome] = await t.tdb.db.select().from(venues).where(eq(venues.id, t.seed.venueIds.dome));
    const controller = dome!.controller;
    expect(firstDetail.params).toEqual({ filmOffset_frames: 3, controller });
    expect(firstDetail.filmSync).toEqual({ frameRate: '25', startTimecode: '10:00:00:00', offset_frames: 3 });

    const nudged = await producer.send('post', `${base()}/runs/${first.id}/film-offset`, {
      offset_frames: 5,
    });
    expect(nudged.status, JSON.stringify(nudged.body)).toBe(201);
    const second = runSummarySchema.parse(nudged.body);
    expect(second.id).not.toBe(first.id);
    expect(second).toMatchObject({ takeId: take.id, venueId: t.seed.venueIds.dome, state: 'queued' });
    const secondRow = await worker.waitForRun(second.id);
    // The same profile versions as the run it came from; only the offset differs.
    expect(secondRow.cueingVersionId).toBe(firstRow.cueingVersionId);
    expect(secondRow.budgetVersionId).toBe(firstRow.budgetVersionId);
    expect(secondRow.params).toEqual({ filmOffset_frames: 5, controller });

    // The old run is untouched: same parameters, state, summary and files.
    const [oldNow] = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.id, first.id));
    expect(oldNow!.params).toEqual({ filmOffset_frames: 3, controller });
    expect(oldNow!.state).toBe(firstRow.state);
    expect(oldNow!.summary).toEqual(firstRow.summary);

    // Each run's manifest carries its own offset; the motion itself is the same.
    const m1 = await worker.storedJson(`${firstRow.artifactPrefix}manifest.json`);
    const m2 = await worker.storedJson(`${secondRow.artifactPrefix}manifest.json`);
    expect(m1.filmSync).toMatchObject({ frameRate: '25', startTimecode: '10:00:00:00', offset_frames: 3 });
    // 5 frames at 25 fps are 0.2 s (frames x den / num).
    expect(m2.filmSync).toMatchObject({ offset_frames: 5, frameRate_num: 25, frameRate_den: 1 });
    expect((m2.filmSync as { offset_s: number }).offset_s).toBeCloseTo(0.2, 12);
    const legsSha = (m: Record<string, unknown>) =>
      (m.files as { name: string; sha256: string }[]).find((f) => f.name === 'legs.csv')!.sha256;
    expect(legsSha(m2)).toBe(legsSha(m1));

    // Asking again for an offset a run already has returns that run (200), old or new.
    const again = await producer.send('post', `${base()}/runs/${first.id}/film-offset`, { offset_frames: 5 });
    expect(again.status).toBe(200);
    expect(runSummarySchema.parse(again.body).id).toBe(second.id);
    const back = await producer.send('post', `${base()}/runs/${second.id}/film-offset`, { offset_frames: 3 });
    expect(back.status).toBe(200);
    expect(runSummarySchema.parse(back.body).id).toBe(first.id);
    // Asking for runs of the take again finds the run with the take's own offset.
    const rerequest = await producer.send('post', `${base()}/takes/${take.id}/runs`, {
      venueIds: [t.seed.venueIds.dome],
    });
    expect(runSummarySchema.array().parse(rerequest.body)[0]!.id).toBe(first.id);
  });

  it('refuses a bad offset (400 naming it), a take without film sync (409) and a role other than producer (403)', async () => {
    const track = await newTrack('Glasswing Taxi');
    const take = uploadedTakeSchema.parse((await upload(track.id, '')).body);
    const asked = await producer.send('post', `${base()}/takes/${take.id}/runs`, {
      venueIds: [t.seed.venueIds.dome],
    });
    const run = runSummarySchema.array().parse(asked.body)[0]!;
    await worker.waitForRun(run.id);
    const path = `${base()}/runs/${run.id}/film-offset`;
    for (const body of [{ offset_frames: 1.5 }, { offset_frames: 'two' }, {}, { offset_frames: 1e9 }]) {
      const r = await producer.send('post', path, body);
      expect(r.status, JSON.stringify(body)).toBe(400);
      expect((r.body as { issues: { path: string }[] }).issues[0]!.path).toBe('offset_frames');
    }
    const noSync = await producer.send('post', path, { offset_frames: 1 });
    expect(noSync.status).toBe(409);
    expect((noSync.body as { error: string }).error).toMatch(/no film sync/);
    expect((await engineer.send('post', path, { offset_frames: 1 })).status).toBe(403);
    const runsNow = await t.tdb.db.select({ n: count() }).from(cueRuns).where(eq(cueRuns.takeId, take.id));
    expect(runsNow[0]!.n).toBe(1);
  });
});

/** One entry's bytes by name, read with a general-purpose zip library. */
async function zipEntry(zip: Buffer, name: string): Promise<Buffer> {
  const found = (await unzip(zip)).get(name);
  if (!found) throw new Error(`${name} is not in the zip`);
  return found;
}

describe('film sync in the release package', () => {
  it("carries the take's frame rate and start timecode with the released run's own (nudged) offset", async () => {
    const track = await newTrack('Glasswing Release');
    // A gentle pose take (a 5 mm heave, at rest at both ends), well inside any budget.
    const gentle = poseTrackCsv(
      makePoseTrackFrom(100, 8, (t) => [0, 0, 0.005 * (smoothStep(t, 1, 3) - smoothStep(t, 5, 7)), 0, 0, 0]),
    );
    const take = uploadedTakeSchema.parse(
      (
        await upload(
          track.id,
          `&frameRate=29.97df&startTimecode=${encodeURIComponent('00:59:50;00')}&offset_frames=-2`,
          gentle,
        )
      ).body,
    );
    const asked = await producer.send('post', `${base()}/takes/${take.id}/runs`, {
      venueIds: [t.seed.venueIds.dome],
    });
    const first = runSummarySchema.array().parse(asked.body)[0]!;
    await worker.waitForRun(first.id);
    const nudged = runSummarySchema.parse(
      (await producer.send('post', `${base()}/runs/${first.id}/film-offset`, { offset_frames: 4 })).body,
    );
    const row = await worker.waitForRun(nudged.id);
    expect(row.state, 'the take must be clean for this test to release it').toBe('awaiting_review');
    const cleared = await reviewer.send('post', `${base()}/runs/${nudged.id}/review`, {
      decision: 'clear',
      reason: 'Checked against the venue budget; accepted.',
    });
    expect(cleared.status, JSON.stringify(cleared.body)).toBe(200);
    const rel = await producer.send('post', `${base()}/runs/${nudged.id}/release`, {});
    expect(rel.status, JSON.stringify(rel.body)).toBe(201);
    const releaseId = releaseCreatedSchema.parse(rel.body).id;
    const build = createBuildReleaseHandler({
      db: t.tdb.db,
      storage: worker.storage,
      log: () => undefined,
      now: () => new Date(),
    });
    await build({ id: releaseId, data: { releaseId, studioId: t.seed.studioId } });
    const [built] = await t.tdb.db.select().from(releases).where(eq(releases.id, releaseId));
    expect(built!.state, built!.failureReason ?? '').toBe('ready');
    const zip = await worker.stored(built!.packageKey!);
    const manifest = packageManifestSchema.parse(
      JSON.parse((await zipEntry(zip, 'manifest.json')).toString('utf8')),
    );
    expect(manifest.filmSync).toMatchObject({
      frameRate: '29.97df',
      dropFrame: true,
      startTimecode: '00:59:50;00',
      offset_frames: 4,
      frameRate_num: 30_000,
      frameRate_den: 1001,
    });
    // 4 frames at 30000/1001 fps are 4 x 1001 / 30000 s (SMPTE ST 12-1 rate of 29.97 fps).
    expect(manifest.filmSync!.offset_s).toBeCloseTo((4 * 1001) / 30_000, 12);
    const report = (await zipEntry(zip, 'report.html')).toString('utf8');
    expect(report).toContain('29.97 fps drop-frame, picture starts 00:59:50;00, motion +4 frame(s)');
  });
});
