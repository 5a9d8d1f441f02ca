// A run's touch-up over HTTP: carried by the run request, checked against the take (400 naming the
// field), recorded in the run's parameters as part of its identity, applied by the worker exactly as
// `legwork process --touchup` applies it (same package bytes), and charted before and after.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { createHash } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { cueRuns, profileVersions, venues } from '../../server/db/schema';
import { startCueWorker } from './support/cue-worker';
import type { CueWorker } from './support/cue-worker';
import { makeVehicleCsv } from '../factories/takes';
import { cliSandbox } from '../factories/cli';
import {
  runDetailSchema,
  runSummarySchema,
  trackDetailSchema,
  uploadedTakeSchema,
} from '../../shared/schemas/pipeline';
import { runSeriesSchema } from '../../shared/schemas/run-series';

let t: TestApp;
let producer: Client;
let worker: CueWorker;
const cli = cliSandbox('legwork-touchup-run-');
const sha = (b: string | Buffer) => createHash('sha256').update(b).digest('hex');

beforeAll(async () => {
  t = await startTestApp({
    queue: true,
    env: { CUE_RUN_RETRY_LIMIT: '1', CUE_RUN_RETRY_DELAY_S: '1', LOGIN_RATE_LIMIT: '1000' },
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
const CSV = makeVehicleCsv({ duration_s: 8 });
// Halve the surge, smooth the yaw rate, cut the first second and fade in and out.
const TOUCHUP = { gain: { fx: 0.5 }, smoothing_hz: { wz: 2 }, trimIn_s: 1, fadeIn_s: 0.5, fadeOut_s: 1 };

async function newTake(title: string) {
  const tr = trackDetailSchema.parse(
    (await producer.send('post', `${base()}/tracks`, { title, film: 'Glasswing (fictional)' })).body,
  );
  const r = await producer
    .raw('post', `${base()}/tracks/${tr.id}/takes?fileName=reed.csv`)
    .set('content-type', 'application/octet-stream')
    .send(Buffer.from(CSV));
  return uploadedTakeSchema.parse(r.body);
}

async function ask(takeId: string, body: object) {
  const r = await producer.send('post', `${base()}/takes/${takeId}/runs`, {
    venueIds: [t.seed.venueIds.dome],
    ...body,
  });
  return r;
}

describe('touch-up on a run request', () => {
  it('is recorded in the run parameters and counts in the run identity', async () => {
    const take = await newTake('Reed Bed Glide');
    const plain = runSummarySchema.array().parse((await ask(take.id, {})).body)[0]!;
    const touched = await ask(take.id, { touchup: TOUCHUP });
    expect(touched.status, JSON.stringify(touched.body)).toBe(201);
    const run = runSummarySchema.array().parse(touched.body)[0]!;
    expect(run.id).not.toBe(plain.id);
    // The same touch-up again (keys in another order) is the same run.
    const again = await ask(take.id, {
      touchup: { fadeOut_s: 1, fadeIn_s: 0.5, trimIn_s: 1, smoothing_hz: { wz: 2 }, gain: { fx: 0.5 } },
    });
    expect(runSummarySchema.array().parse(again.body)[0]!.id).toBe(run.id);
    // A touch-up that changes nothing is no touch-up: the plain run.
    const identity = await ask(take.id, { touchup: { gain: { fx: 1 } } });
    expect(runSummarySchema.array().parse(identity.body)[0]!.id).toBe(plain.id);
    const [row] = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.id, run.id));
    const [venueRow] = await t.tdb.db.select().from(venues).where(eq(venues.id, row!.venueId));
    expect(row!.params).toEqual({
      controller: venueRow!.controller,
      touchup: {
        offset_s: 0,
        trimIn_s: 1,
        gain: { fx: 0.5 },
        smoothing_hz: { wz: 2 },
        fadeIn_s: 0.5,
        fadeOut_s: 1,
      },
    });
    const d = runDetailSchema.parse((await producer.get(`${base()}/runs/${run.id}`)).body);
    expect(d.params.touchup?.gain).toEqual({ fx: 0.5 });
  });

  it('refuses a touch-up that does not fit the take, naming the field, and makes no run', async () => {
    const take = await newTake('Reed Bed Stall');
    const cases: [object, string][] = [
      [{ gain: { x: 0.5 } }, 'touchup.gain.x'],
      [{ smoothing_hz: { roll: 2 } }, 'touchup.smoothing_hz.roll'],
      [{ trimIn_s: 4, trimOut_s: 2 }, 'touchup.trimOut_s'],
      [{ gain: { fx: -1 } }, 'touchup.gain.fx'],
      [{ fadeIn_s: 'soon' }, 'touchup.fadeIn_s'],
      [{ stretch: 2 }, 'touchup'],
    ];
    for (const [touchup, path] of cases) {
      const r = await ask(take.id, { touchup });
      expect(r.status, JSON.stringify(touchup)).toBe(400);
      const issues = (r.body as { issues: { path: string }[] }).issues;
      expect(
        issues.map((i) => i.path),
        JSON.stringify(touchup),
      ).toContain(path);
    }
    expect(await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.takeId, take.id))).toEqual([]);
  });

  it('the worker applies it as `legwork process --touchup` does: the same package files', async () => {
    const take = await newTake('Reed Bed Landing');
    const run = runSummarySchema.array().parse((await ask(take.id, { touchup: TOUCHUP })).body)[0]!;
    const row = await worker.waitForRun(run.id);
    expect(['awaiting_review', 'held_by_budget']).toContain(row.state);

    // The same inputs through the command: the venue's base, cueing and budget versions, the take.
    const [venue] = await t.tdb.db.select().from(venues).where(eq(venues.id, row.venueId));
    const version = async (id: string) =>
      (await t.tdb.db.select().from(profileVersions).where(eq(profileVersions.id, id)))[0]!.params;
    const out = join(cli.dir, 'reed-landing');
    const r = await cli.run(
      'process',
      '--base',
      cli.file('base.json', JSON.stringify(venue!.base)),
      '--profile',
      cli.file('profile.json', JSON.stringify(await version(row.cueingVersionId!))),
      '--budget',
      cli.file('budget.json', JSON.stringify(await version(row.budgetVersionId))),
      '--touchup',
      cli.file('touchup.json', JSON.stringify(TOUCHUP)),
      '--controller',
      cli.file('controller.json', JSON.stringify(venue!.controller)),
      '--in',
      cli.file('reed.csv', CSV),
      '--out',
      out,
    );
    expect(r.err).toBe('');
    for (const name of ['legs.csv', 'pose.csv', 'findings.json', 'spectra.json']) {
      expect(sha(await worker.stored(`${row.artifactPrefix}${name}`)), name).toBe(
        sha(readFileSync(join(out, name))),
      );
    }
    const manifest = JSON.parse((await worker.stored(`${row.artifactPrefix}manifest.json`)).toString()) as {
      touchup: { parameters: { gain: Record<string, number> } } | null;
    };
    expect(manifest.touchup?.parameters.gain).toEqual({ fx: 0.5 });

    // The chart series carry every column of the take before and after the touch-up.
    const series = runSeriesSchema.parse((await producer.get(`${base()}/runs/${run.id}/series`)).body);
    const cols = series.touchup!.columns;
    expect(cols.map((c) => c.name)).toEqual([
      'fx_mps2',
      'fy_mps2',
      'fz_mps2',
      'wx_radps',
      'wy_radps',
      'wz_radps',
    ]);
    // The trim: the show starts at 1 s of the take (touch-up definition, shared/schemas/touchup.ts),
    // after the venue's ramp from neutral.
    expect(series.time_s[0]).toBeCloseTo(1 - venue!.controller.ramp.duration_s, 6);
    // The fades: the take after the touch-up starts and ends at rest (fx = 0, fz = g0).
    const fx = cols[0]!;
    const last = series.time_s.length - 1;
    expect(Math.abs(fx.after.max[0]!)).toBeLessThan(1e-9);
    expect(Math.abs(fx.after.max[last]!)).toBeLessThan(1e-9);
    expect(cols[2]!.after.max[last]).toBeCloseTo(9.80665, 5);
    // The gain: away from the fades, surge after is half of surge before (departure from rest 0).
    const mid = series.time_s.findIndex((s) => s > 3);
    for (let i = mid; i < mid + 100; i++) {
      expect(fx.after.max[i]).toBeCloseTo(0.5 * fx.before.max[i]!, 4);
    }
  });
});
