// ISO 2631-1 figures through the whole chain: a pose track -> specific force at the seat -> frequency
// weighting -> r.m.s., VDV and MSDV, checked against the standard's weighting factors and the closed
// forms for a sinusoid.
import { describe, expect, it } from 'vitest';
import { processTrack } from '../../../shared/motion/process';
import { crestFactor, msdv, rms, vdv, weight } from '../../../shared/motion/iso2631';
import { seatSpecificForce } from '../../../shared/motion/seat-force';
import { G0_MPS2 } from '../../../shared/motion/units';
import { makeHexapodBase } from '../../factories/motion';
import { makePoseTrackFrom } from './track-builders';

const ONE_SEAT = [[0, 0, 0.9]] as [number, number, number][];

/** Comfort figures of a sinusoidal platform acceleration a sin(2 pi f t) (m/s^2) on x or z. */
function comfortOfSine(axis: 'x' | 'z', f_hz: number, a_mps2: number, rate_hz: number, duration_s: number) {
  const w = 2 * Math.PI * f_hz;
  const amp_m = a_mps2 / (w * w);
  // Position -A sin(wt) has acceleration +a sin(wt).
  const track = makePoseTrackFrom(rate_hz, duration_s, (t) => {
    const s = -amp_m * Math.sin(w * t);
    return axis === 'x' ? [s, 0, 0, 0, 0, 0] : [0, 0, s, 0, 0, 0];
  });
  const base = makeHexapodBase({ controllerRate_hz: rate_hz, seats_m: ONE_SEAT });
  const r = processTrack({ track, base });
  const c = r.check.comfort;
  if (!c) throw new Error('no comfort figures');
  return c;
}

describe('ISO 2631-1 weighting factors through seat force, weighting and r.m.s. (within 2 %)', () => {
  // Weighting factors from memory of the standard's tables.
  const cases: { axis: 'x' | 'z'; weighting: string; f_hz: number; factor: number }[] = [
    { axis: 'z', weighting: 'Wk', f_hz: 1, factor: 0.482 },
    { axis: 'z', weighting: 'Wk', f_hz: 2, factor: 0.531 },
    { axis: 'z', weighting: 'Wk', f_hz: 8, factor: 1.036 },
    { axis: 'x', weighting: 'Wd', f_hz: 1, factor: 1.011 },
    { axis: 'x', weighting: 'Wd', f_hz: 4, factor: 0.512 },
  ];
  for (const k of cases) {
    it(`${k.weighting} at ${k.f_hz} Hz: a_w / a_rms = ${k.factor} (ISO 2631-1 table, from memory)`, () => {
      const a = 1;
      // 1 kHz keeps the second difference of the pose within 0.03 % of the true acceleration at 8 Hz.
      const c = comfortOfSine(k.axis, k.f_hz, a, 1000, 40);
      // r.m.s. of a sin(wt) is a / sqrt(2) (textbook).
      const factor = c.wrms_mps2[k.axis] / (a / Math.SQRT2);
      expect(Math.abs(factor / k.factor - 1)).toBeLessThan(0.02);
    });
  }

  it('VDV of a weighted sinusoid: (integral (W a sin wt)^4 dt)^(1/4) = W a (3T/8)^(1/4)', () => {
    // Closed form: the mean of sin^4 over whole periods is 3/8 (textbook).
    const a = 1;
    const T = 40;
    const c = comfortOfSine('z', 8, a, 1000, T);
    const expected = 1.036 * a * Math.pow((3 * T) / 8, 0.25); // Wk(8 Hz) = 1.036, ISO 2631-1, from memory
    expect(Math.abs(c.vdv_mps1_75.z / expected - 1)).toBeLessThan(0.02);
  });

  for (const [f_hz, factor] of [
    [0.16, 1.006],
    [0.25, 0.854],
  ] as const) {
    it(`MSDV_z of a ${f_hz} Hz heave: Wf a sqrt(T/2) with Wf = ${factor} (ISO 2631-1 table, from memory)`, () => {
      // Closed form: integral of (W a sin wt)^2 over whole periods = W^2 a^2 T / 2 (textbook).
      const a = 0.2;
      const T = 600; // 96 and 150 whole periods
      const c = comfortOfSine('z', f_hz, a, 100, T);
      expect(Math.abs(c.msdvZ_mps1_5 / (factor * a * Math.sqrt(T / 2)) - 1)).toBeLessThan(0.02);
      // Share who may vomit: Km MSDV_z with Km = 1/3 (ISO 2631-1 Annex D, from memory).
      expect(c.vomitShare_pct).toBeCloseTo(c.msdvZ_mps1_5 / 3, 12);
    });
  }

  it('r.m.s. and crest factor of a sine at the seat: a / sqrt(2) and sqrt(2) after weighting', () => {
    const rate = 1000;
    const f = 8;
    const a = 1;
    const w = 2 * Math.PI * f;
    const track = makePoseTrackFrom(rate, 20, (t) => [0, 0, (-a / (w * w)) * Math.sin(w * t), 0, 0, 0]);
    const [, , z_m] = track.columns as [Float64Array, Float64Array, Float64Array];
    const zero = new Float64Array(track.length);
    const force = seatSpecificForce(
      { rate_hz: rate, x_m: zero, y_m: zero, z_m, roll_rad: zero, pitch_rad: zero, yaw_rad: zero },
      [0.3, -0.2, 0.9],
    );
    // Seat force minus gravity is the sinusoid itself (docs/motion-conventions.md section 5 with no rotation).
    const settled = force.z.subarray(5 * rate).map((v) => v - G0_MPS2);
    let sumSq = 0;
    for (const v of settled) sumSq += v * v;
    expect(Math.sqrt(sumSq / settled.length)).toBeCloseTo(a / Math.SQRT2, 3);
    const weighted = weight(force.z, rate, 'Wk').subarray(5 * rate);
    expect(crestFactor(weighted)).toBeCloseTo(Math.SQRT2, 2); // crest factor of a sine (textbook)
  });
});

describe('worst seat', () => {
  it('takes the seat that feels the most: a roll gives vertical acceleration only off the roll axis', () => {
    // Roll phi = P sin(wt) about x: a seat at lateral offset y feels alpha x r, a vertical
    // acceleration of amplitude P w^2 y (rigid-body kinematics); a seat on the axis feels almost none.
    const rate = 100;
    const f = 2;
    const w = 2 * Math.PI * f;
    const P = 0.02;
    const track = makePoseTrackFrom(rate, 30, (t) => [0, 0, 0, P * Math.sin(w * t), 0, 0]);
    const base = makeHexapodBase({
      controllerRate_hz: rate,
      seats_m: [
        [0, 0, 0.9],
        [0, 0.6, 0.9],
      ],
    });
    const c = processTrack({ track, base }).check.comfort;
    expect(c?.wrmsSeat.z).toBe('seat2');
    // Wk(2 Hz) = 0.531, ISO 2631-1 table, from memory; 3 % covers the small centripetal and gravity terms.
    const expected = (0.531 * P * w * w * 0.6) / Math.SQRT2;
    expect(Math.abs((c?.wrms_mps2.z ?? NaN) / expected - 1)).toBeLessThan(0.03);
  });
});

describe('many seats', () => {
  it('gives the same figures from the affine seat-force model as from weighting every seat', () => {
    // Linear filters commute with the sum f(r) = f(0) + sum_j r_j (f(e_j) - f(0)) (linear systems, textbook).
    const rate = 100;
    const track = makePoseTrackFrom(rate, 60, (t) => [
      0.05 * Math.sin(1.3 * t),
      0.04 * Math.sin(2.1 * t + 1),
      0.03 * Math.sin(3.7 * t),
      0.04 * Math.sin(1.1 * t),
      0.03 * Math.sin(0.9 * t + 2),
      0.05 * Math.sin(0.7 * t),
    ]);
    const seats: [number, number, number][] = [
      [0.3, 0.5, 0.9],
      [0.3, -0.5, 0.9],
      [-0.3, 0.5, 0.9],
      [-0.3, -0.5, 0.9],
      [0, 0.9, 1.1],
      [0.6, 0, 0.7],
    ];
    const base = makeHexapodBase({ controllerRate_hz: rate, seats_m: seats });
    const result = processTrack({ track, base });
    const c = result.check.comfort;
    // The pose the pipeline checked (after its anti-alias resampling), weighted seat by seat.
    const pose = { rate_hz: rate, ...result.pose };
    let best = { z: -1, seat: '' };
    let bestMsdv = { v: -1, seat: '' };
    let bestVdv = { v: -1, seat: '' };
    seats.forEach((r, s) => {
      const f = seatSpecificForce(pose, r);
      const wz = weight(f.z, rate, 'Wk');
      const rz = rms(wz);
      if (rz > best.z) best = { z: rz, seat: `seat${s + 1}` };
      const vz = vdv(wz, rate);
      if (vz > bestVdv.v) bestVdv = { v: vz, seat: `seat${s + 1}` };
      const m = msdv(weight(f.z, rate, 'Wf'), rate);
      if (m > bestMsdv.v) bestMsdv = { v: m, seat: `seat${s + 1}` };
    });
    expect(c?.wrmsSeat.z).toBe(best.seat);
    expect((c?.wrms_mps2.z ?? NaN) / best.z).toBeCloseTo(1, 9);
    // VDV at its own worst seat, which need not be the worst-r.m.s. seat.
    expect(c?.vdvSeat?.z).toBe(bestVdv.seat);
    expect((c?.vdv_mps1_75.z ?? NaN) / bestVdv.v).toBeCloseTo(1, 9);
    expect(c?.msdvSeat).toBe(bestMsdv.seat);
    expect((c?.msdvZ_mps1_5 ?? NaN) / bestMsdv.v).toBeCloseTo(1, 9);
  });
});
