// Pose and legs tracks reach the controller rate on a smooth (C1 cubic Hermite) curve, so the checked
// accelerations are the motion's own and not artefacts of straight segments between samples.
import { describe, expect, it } from 'vitest';
import { processTrack } from '../../../shared/motion/process';
import { resampleHermite } from '../../../shared/motion/resample';
import type { Track } from '../../../shared/motion/track-reader';
import { demoHexapodInput } from '../../../shared/schemas/motion-base';
import { makeHexapodBase } from '../../factories/motion';
import { makePoseTrackFrom } from './track-builders';

describe('Hermite resampling', () => {
  it('reproduces a quadratic exactly on an uneven grid (three-point slopes are exact for quadratics)', () => {
    const times = [0, 0.013, 0.02, 0.041, 0.05, 0.077, 0.1];
    const q = (t: number) => 0.3 - 2 * t + 17 * t * t;
    const track: Track = {
      kind: 'legs',
      layout: 'planar3',
      length: times.length,
      time_s: Float64Array.from(times),
      names: ['leg1_m', 'leg2_m', 'leg3_m'],
      columns: [Float64Array.from(times, q), Float64Array.from(times, q), Float64Array.from(times, q)],
    };
    const r = resampleHermite(track, 1000);
    expect(r.length).toBe(101);
    r.time_s.forEach((t, k) => expect(r.columns[0]?.[k]).toBeCloseTo(q(t), 12));
  });

  it('a 60 Hz heave checked at a 1 kHz controller gives the closed-form peak leg acceleration', () => {
    // Pure heave z = A sin(wt) on the symmetric demo hexapod: every leg has l^2 = c + (h0 + z)^2 with
    // c = Rb^2 + Rp^2 - 2 Rb Rp cos d (plane geometry, law of cosines), so
    // l'' = (z'^2 + (h0 + z) z'') / l - ((h0 + z) z')^2 / l^3.
    const A = 0.1;
    const w = 2 * Math.PI * 1.2;
    const p = demoHexapodInput;
    const d = ((60 - p.baseHalfAngle_deg - p.platformHalfAngle_deg) * Math.PI) / 180;
    const c =
      p.baseRadius_m ** 2 + p.platformRadius_m ** 2 - 2 * p.baseRadius_m * p.platformRadius_m * Math.cos(d);
    let peak = 0;
    for (let t = 0; t < 10; t += 1e-4) {
      const h = p.neutralHeight_m + A * Math.sin(w * t);
      const z1 = A * w * Math.cos(w * t);
      const z2 = -A * w * w * Math.sin(w * t);
      const l = Math.sqrt(c + h * h);
      peak = Math.max(peak, Math.abs((z1 * z1 + h * z2) / l - (h * z1) ** 2 / l ** 3));
    }
    const track = makePoseTrackFrom(60, 10, (t) => [0, 0, A * Math.sin(w * t), 0, 0, 0]);
    const base = makeHexapodBase({ controllerRate_hz: 1000 });
    const r = processTrack({ track, base });
    const use = Math.max(...r.check.uses.filter((u) => u.check === 'legAccel').map((u) => u.ratio));
    expect(Math.abs((use * base.leg.accelMax_mps2) / peak - 1)).toBeLessThan(0.02);
  });
});
