// Ramps from and to neutral in a run: the pipeline adds the venue controller's ramps after cueing and
// before kinematics, so the first and last frames are the legs of the neutral pose (inverse kinematics
// of the zero offset) and the ramps are checked with the show. The peak speed of the minimum-jerk
// quintic 10u^3 - 15u^4 + 6u^5 over a ramp of d seconds to an offset P is 15P/(8d) (its derivative
// 30u^2(1 - u)^2 peaks at u = 1/2: textbook calculus).
import { describe, expect, it } from 'vitest';
import { demoRideCsv } from '../../../shared/demo-ride';
import { hexapodGeometry, hexapodInverse } from '../../../shared/motion/hexapod';
import { processTrack } from '../../../shared/motion/process';
import { parseTrackText } from '../../../shared/motion/track-reader';
import { demoHexapodBase } from '../../../shared/schemas/motion-base';
import { makeBudget, makePoseTrackFrom, smoothStep } from '../budget/track-builders';

const base = demoHexapodBase;
const RATE = base.controllerRate_hz;
const ramp = { duration_s: 3, profile: 'quintic' as const };

const neutralLegs = () => {
  const one = () => Float64Array.of(0);
  const legs = hexapodInverse(hexapodGeometry(base), {
    x_m: one(),
    y_m: one(),
    z_m: one(),
    roll_rad: one(),
    pitch_rad: one(),
    yaw_rad: one(),
  });
  return legs.map((l) => l[0] as number);
};

describe('ramps in a run', () => {
  // A pose take that starts held at 0.2 m surge and returns to neutral by 6 s.
  const offsetStart = () =>
    makePoseTrackFrom(RATE, 10, (t) => [0.2 * (1 - smoothStep(t, 2, 6)), 0, 0, 0, 0, 0]);

  it('a take starting off neutral has a start finding without ramps and none with them', () => {
    const without = processTrack({ track: offsetStart(), base, budget: makeBudget({}) });
    expect(without.check.findings.filter((f) => f.check === 'startEnd').map((f) => f.subject)).toEqual([
      'start',
    ]);
    expect(without.ramp).toBeNull();
    const withRamps = processTrack({ track: offsetStart(), base, budget: makeBudget({}), ramp });
    expect(withRamps.check.findings.filter((f) => f.check === 'startEnd')).toEqual([]);
    expect(withRamps.ramp).toEqual({ in_s: 3, out_s: 3, profile: 'quintic' });
    expect(withRamps.notes.some((n) => n.startsWith('Ramps of 3 s'))).toBe(true);
  });

  it('first and last legs are the neutral legs, the show keeps its times, the ramp speed is 15P/(8d)', () => {
    const r = processTrack({ track: offsetStart(), base, budget: makeBudget({}), ramp });
    const neutral = neutralLegs();
    const last = r.time_s.length - 1;
    r.legs.forEach((leg, j) => {
      expect(leg[0]).toBeCloseTo(neutral[j] as number, 9);
      expect(leg[last]).toBeCloseTo(neutral[j] as number, 9);
    });
    expect(r.time_s[0]).toBeCloseTo(-3, 9);
    expect(r.time_s[3 * RATE]).toBeCloseTo(0, 9);
    expect(r.time_s[last]).toBeCloseTo(13, 6);
    // Peak surge speed in the ramp in, by central differences of the pose.
    const x = r.pose.x_m;
    let peak = 0;
    for (let k = 1; k < 3 * RATE; k++) {
      peak = Math.max(peak, Math.abs(((x[k + 1] as number) - (x[k - 1] as number)) * (RATE / 2)));
    }
    expect(peak).toBeCloseTo((15 * 0.2) / (8 * 3), 3);
  });

  it("the demo studio's gentle take has no findings, with ramps as without", () => {
    const track = parseTrackText(demoRideCsv({ duration_s: 60, rate_hz: 100 }), { file: 'gentle.csv' });
    const without = processTrack({ track, base });
    const withRamps = processTrack({ track, base, ramp });
    expect(without.check.findings).toEqual([]);
    expect(withRamps.check.findings).toEqual([]);
    expect(withRamps.time_s.length).toBe(without.time_s.length + 2 * 3 * RATE);
  });

  it('a ramp of 0 s adds nothing', () => {
    const r = processTrack({
      track: offsetStart(),
      base,
      budget: makeBudget({}),
      ramp: { duration_s: 0, profile: 'quintic' },
    });
    expect(r.ramp).toBeNull();
    expect(r.time_s[0]).toBe(0);
  });
});
