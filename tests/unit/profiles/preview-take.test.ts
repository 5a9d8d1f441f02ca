// The preview's take from a run's chart series (series.json, the only form in which the browser can
// read a take's motion from the server): the series is made here by the worker's own code path
// (processTrack, then buildRunSeries as buildRunOutputs does) from a take whose samples are known, so
// what trackFromRunSeries returns can be compared with the take itself.
import { describe, expect, it } from 'vitest';
import { demoRideSamples } from '../../../shared/demo-ride';
import { DEMO_BUDGET } from '../../../shared/schemas/budget';
import { demoHexapodBase } from '../../../shared/schemas/motion-base';
import { processTrack } from '../../../shared/motion/process';
import { buildRunSeries } from '../../../shared/motion/run-series';
import type { Track } from '../../../shared/motion/track-reader';
import { trackFromRunSeries } from '../../../src/features/profiles/components/preview-take';

function demoTake(): Track {
  const { time_s, samples } = demoRideSamples({ duration_s: 60, rate_hz: 100 });
  return {
    kind: 'vehicle',
    layout: 'vehicle',
    length: time_s.length,
    time_s: Float64Array.from(time_s),
    names: ['fx_mps2', 'fy_mps2', 'fz_mps2', 'wx_radps', 'wy_radps', 'wz_radps'],
    columns: Array.from({ length: 6 }, (_, c) => Float64Array.from(samples, (s) => s[c] as number)),
  };
}

/** The take's column at time t by linear interpolation (a plain search, not the motion core's). */
function at(track: Track, c: number, t: number): number {
  const ts = track.time_s;
  let i = 0;
  while (i < ts.length - 2 && (ts[i + 1] as number) <= t) i++;
  const a = track.columns[c]![i]!;
  const b = track.columns[c]![i + 1]!;
  return a + ((b - a) * (t - ts[i]!)) / (ts[i + 1]! - ts[i]!);
}

describe('trackFromRunSeries', () => {
  const track = demoTake();
  const ramp = { duration_s: 3, profile: 'quintic' as const };
  const result = processTrack({ track, base: demoHexapodBase, budget: DEMO_BUDGET, ramp });
  const series = buildRunSeries(result, track, demoHexapodBase);
  const detail = {
    venueName: 'Harbour Lights Dome',
    ramp: result.ramp,
    take: { kind: 'vehicle' as const, number: 1, samples: track.length },
  };

  it('drops the ramps the run added and keeps the take span', () => {
    expect(series.time_s[0]).toBeLessThan(-2.9); // the run's series starts with the 3 s ramp in
    const data = trackFromRunSeries(series, detail)!;
    const t = data.track.time_s;
    expect(t[0]).toBeGreaterThanOrEqual(-1e-6);
    expect(t[t.length - 1]).toBeLessThanOrEqual(60 + 1e-6);
    for (let i = 1; i < t.length; i++) expect(t[i]!).toBeGreaterThan(t[i - 1]!);
    expect(data.fullRate).toBe(false);
    expect(data.source).toMatch(/no angular rates/);
  });

  it('gives the specific force within each bucket of the take, and no angular rates', () => {
    const data = trackFromRunSeries(series, detail)!;
    const t = data.track.time_s;
    // A bucket holds about 60 s * 100 Hz / 2,000 = 3 samples, so its mid-range lies within the
    // take's change over a few samples of the bucket's start.
    for (let i = 0; i < t.length; i += 37) {
      for (let c = 0; c < 3; c++) {
        const lo = Math.min(at(track, c, t[i]!), at(track, c, t[i]! + 0.05));
        const hi = Math.max(at(track, c, t[i]!), at(track, c, t[i]! + 0.05));
        const v = data.track.columns[c]![i]!;
        expect(v).toBeGreaterThanOrEqual(lo - 0.05 - 1e-3);
        expect(v).toBeLessThanOrEqual(hi + 0.05 + 1e-3);
      }
    }
    for (let c = 3; c < 6; c++) expect(data.track.columns[c]!.every((v) => v === 0)).toBe(true);
  });

  it('is null for a pose take, which no cueing profile changes', () => {
    expect(trackFromRunSeries(series, { ...detail, take: { ...detail.take, kind: 'pose' } })).toBeNull();
  });
});
