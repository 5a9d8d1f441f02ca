import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { CueingProfile } from '../../../shared/schemas/cueing-profile';
import { defaultCueingProfile } from '../../../shared/schemas/cueing-profile';
import type { VehicleTrack } from '../../../shared/motion/washout';
import { CueingError, cueClassical, softLimit } from '../../../shared/motion/washout';
import { G0_MPS2, RAD_PER_DEG } from '../../../shared/motion/units';

type Column = 'fx_mps2' | 'fy_mps2' | 'fz_mps2' | 'wx_radps' | 'wy_radps' | 'wz_radps';

/** A level vehicle at rest, optionally with one column replaced from t_on onward. */
function vehicle(
  rate_hz: number,
  duration_s: number,
  set?: { column: Column; value: number; from_s: number },
): VehicleTrack {
  const n = Math.round(rate_hz * duration_s);
  const v: VehicleTrack = {
    rate_hz,
    fx_mps2: new Float64Array(n),
    fy_mps2: new Float64Array(n),
    fz_mps2: new Float64Array(n).fill(G0_MPS2),
    wx_radps: new Float64Array(n),
    wy_radps: new Float64Array(n),
    wz_radps: new Float64Array(n),
  };
  if (set) v[set.column].fill(set.value, Math.round(set.from_s * rate_hz));
  return v;
}

const poseKeys = ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const;

describe('a level vehicle at rest', () => {
  it('stays exactly at neutral and the rider feels exactly (0, 0, g0)', () => {
    // docs/motion-conventions.md section 4: a level vehicle at rest (f = (0, 0, g0), w = 0) stays exactly at neutral.
    const r = cueClassical(vehicle(100, 30), defaultCueingProfile());
    for (const k of poseKeys) expect(r.pose[k].every((v) => v === 0)).toBe(true);
    expect(r.diagnostics.riderForce_mps2.x.every((v) => v === 0)).toBe(true);
    expect(r.diagnostics.riderForce_mps2.z.every((v) => v === G0_MPS2)).toBe(true);
  });
});

describe('sustained forward specific force', () => {
  const profile = defaultCueingProfile();
  const rate = 100;
  const fx = 1.2;
  const r = cueClassical(vehicle(rate, 60, { column: 'fx_mps2', value: fx, from_s: 1 }), profile);
  const scaled = profile.scale.surge * fx;
  const last = r.pose.pitch_rad.length - 1;

  it('becomes a nose-up tilt (negative pitch) whose gravity component gives the rider the scaled force', () => {
    // Tilt coordination (Reid and Nahon 1985): g0 sin(-pitch) = f_x,lp in steady state, within the tilt limit.
    const pitch = r.pose.pitch_rad[last]!;
    expect(pitch).toBeLessThan(0);
    expect(Math.abs(-pitch) * (1 / RAD_PER_DEG)).toBeLessThan(profile.tilt.angleLimit_deg);
    expect(G0_MPS2 * Math.sin(-pitch)).toBeCloseTo(scaled, 6);
    // Seat force R^T (-g) of a pitched, still platform: the felt surge equals the scaled cue.
    expect(r.diagnostics.riderForce_mps2.x[last]).toBeCloseTo(scaled, 4);
  });

  it('never tilts faster than the 3 deg/s rate limit', () => {
    // Groen and Bles 2004: tilt below about 3 deg/s goes unnoticed (J. Vestib. Res. 14(5)).
    const maxStep = 3 * RAD_PER_DEG * (1 / rate);
    let seenLimit = false;
    for (let i = 1; i <= last; i++) {
      const step = Math.abs(r.pose.pitch_rad[i]! - r.pose.pitch_rad[i - 1]!);
      expect(step).toBeLessThanOrEqual(maxStep * (1 + 1e-12));
      if (step > 0.99 * maxStep) seenLimit = true;
    }
    // The onset demands a faster tilt than allowed, so the limiter must have been active.
    expect(seenLimit).toBe(true);
  });

  it('first moves the platform forward, then the third-order high-pass returns it to neutral', () => {
    // Final-value theorem: s * s^3/((s^2+2 zeta wn s+wn^2)(s+wb)) / s^2 * a/s -> 0 as s -> 0.
    const x = r.pose.x_m;
    expect(x[Math.round(1.5 * rate)]!).toBeGreaterThan(0);
    expect(Math.abs(x[last]!)).toBeLessThan(1e-6);
  });

  it('with a second-order high-pass the platform settles at a / wn^2 instead', () => {
    // Final-value theorem on s^2/(s^2+2 zeta wn s+wn^2) / s^2 * a/s: x(inf) = a / wn^2.
    const p2: CueingProfile = {
      ...profile,
      translational: { ...profile.translational, x: { order: 2, naturalFrequency_radps: 3, damping: 1 } },
    };
    const r2 = cueClassical(vehicle(rate, 30, { column: 'fx_mps2', value: 0.5, from_s: 1 }), p2);
    // Pre-warping the filter at wn while the integrators are plain trapezoids scales the digital DC
    // gain by (tan(wn T/2) / (wn T/2))^-2, 1.5e-4 relative here, hence 4 decimals.
    const expected = (profile.scale.surge * 0.5) / 9;
    expect(r2.pose.x_m[r2.pose.x_m.length - 1]).toBeCloseTo(expected, 4);
  });
});

describe('onset cues', () => {
  const profile = defaultCueingProfile();
  const cases: [Column, number, (typeof poseKeys)[number], number][] = [
    // column, step, pose offset that must move first, expected sign
    ['fx_mps2', 1, 'x_m', +1], // surge: forward force, platform moves forward
    ['fy_mps2', 1, 'y_m', +1], // sway: leftward force, platform moves left
    ['fz_mps2', G0_MPS2 + 1, 'z_m', +1], // heave: more than 1 g, platform rises
    ['fx_mps2', -1, 'x_m', -1],
    ['wx_radps', 0.2, 'roll_rad', +1],
    ['wy_radps', 0.2, 'pitch_rad', +1],
    ['wz_radps', 0.2, 'yaw_rad', +1],
    ['wz_radps', -0.2, 'yaw_rad', -1],
  ];
  it.each(cases)('a step in %s to %f moves %s with sign %i first', (column, value, key, sign) => {
    // Physics of the cue: the onset is reproduced by platform motion in the same direction (Reid and Nahon).
    const r = cueClassical(vehicle(100, 5, { column, value, from_s: 1 }), profile);
    const v = r.pose[key][Math.round(1.3 * 100)]!;
    expect(Math.sign(v)).toBe(sign);
    expect(Math.abs(v)).toBeGreaterThan(1e-4);
  });
});

describe('rotational washout', () => {
  it('a step in yaw rate washes out: the platform stops turning and returns to neutral (second order)', () => {
    // Final-value theorem: s^2/(s^2+2 zeta w s+w^2) / s * W/s has a zero limit.
    const r = cueClassical(
      vehicle(100, 40, { column: 'wz_radps', value: 0.3, from_s: 1 }),
      defaultCueingProfile(),
    );
    const yaw = r.pose.yaw_rad;
    const n = yaw.length;
    expect(Math.max(...yaw)).toBeGreaterThan(0.01);
    expect(Math.abs(yaw[n - 1]!)).toBeLessThan(1e-5);
    expect(Math.abs(yaw[n - 1]! - yaw[n - 2]!) * 100).toBeLessThan(1e-5);
  });

  it('with a first-order high-pass the yaw rate washes out and the angle settles at W / w', () => {
    // Closed form: integral of W e^(-w t) dt = W / w.
    const base = defaultCueingProfile();
    const p: CueingProfile = {
      ...base,
      rotational: { ...base.rotational, z: { order: 1, frequency_radps: 0.8 } },
      poseLimit: { ...base.poseLimit, yaw_deg: 60 },
    };
    const W = 0.1;
    const r = cueClassical(vehicle(100, 40, { column: 'wz_radps', value: W / base.scale.yaw, from_s: 1 }), p);
    const yaw = r.pose.yaw_rad;
    expect(yaw[yaw.length - 1]).toBeCloseTo(W / 0.8, 4);
  });
});

describe('limits and bad input', () => {
  it('the soft limiter is linear below the knee, continuous, monotone and bounded', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -100, max: 100, noNaN: true }),
        fc.double({ min: 0, max: 0.99, noNaN: true }),
        (x, knee) => {
          const y = softLimit(x, 2, knee);
          expect(Math.abs(y)).toBeLessThanOrEqual(2);
          if (Math.abs(x) <= knee * 2) expect(y).toBe(x);
          expect(softLimit(x + 1e-3, 2, knee)).toBeGreaterThanOrEqual(y);
          expect(Math.abs(softLimit(x + 1e-9, 2, knee) - y)).toBeLessThan(1e-8);
        },
      ),
    );
  });

  it('names the profile field whose corner is above the Nyquist frequency', () => {
    const base = defaultCueingProfile();
    const p: CueingProfile = { ...base, tilt: { ...base.tilt, lowPassFrequency_radps: 40 } };
    expect(() => cueClassical(vehicle(10, 2), p)).toThrow(CueingError);
    expect(() => cueClassical(vehicle(10, 2), p)).toThrow(/tilt\.lowPassFrequency_radps/);
  });

  it('names the column and sample of a non-finite input', () => {
    const v = vehicle(100, 1);
    v.wy_radps[42] = Number.POSITIVE_INFINITY;
    expect(() => cueClassical(v, defaultCueingProfile())).toThrow(/wy_radps, sample 42/);
  });
});

// Random vehicle tracks: piecewise-constant segments with violent values, far beyond the input limits.
const segment = fc.record({
  length: fc.integer({ min: 1, max: 300 }),
  fx: fc.double({ min: -30, max: 30, noNaN: true }),
  fy: fc.double({ min: -30, max: 30, noNaN: true }),
  fz: fc.double({ min: -20, max: 40, noNaN: true }),
  wx: fc.double({ min: -5, max: 5, noNaN: true }),
  wy: fc.double({ min: -5, max: 5, noNaN: true }),
  wz: fc.double({ min: -5, max: 5, noNaN: true }),
});
const randomTrack = fc.array(segment, { minLength: 1, maxLength: 12 }).map((segs) => {
  const n = segs.reduce((a, s) => a + s.length, 0);
  const v = vehicle(100, n / 100);
  let i = 0;
  for (const s of segs) {
    for (let k = 0; k < s.length; k++, i++) {
      v.fx_mps2[i] = s.fx;
      v.fy_mps2[i] = s.fy;
      v.fz_mps2[i] = s.fz;
      v.wx_radps[i] = s.wx;
      v.wy_radps[i] = s.wy;
      v.wz_radps[i] = s.wz;
    }
  }
  return v;
});

describe('properties over random tracks', () => {
  it('the cued pose never leaves the profile limits and is always finite', () => {
    // Property of the design: poseLimit is a soft limit the output cannot cross.
    const profile = defaultCueingProfile();
    const L = profile.poseLimit;
    const bounds: Record<(typeof poseKeys)[number], number> = {
      x_m: L.x_m,
      y_m: L.y_m,
      z_m: L.z_m,
      roll_rad: L.roll_deg * RAD_PER_DEG,
      pitch_rad: L.pitch_deg * RAD_PER_DEG,
      yaw_rad: L.yaw_deg * RAD_PER_DEG,
    };
    let engaged = 0;
    fc.assert(
      fc.property(randomTrack, (v) => {
        const r = cueClassical(v, profile);
        for (const k of poseKeys) {
          // NaN fails the comparison, so one worst-case check covers finiteness too.
          let worst = 0;
          for (const value of r.pose[k])
            worst = Math.abs(value) > worst || Number.isNaN(value) ? Math.abs(value) : worst;
          expect(worst).toBeLessThanOrEqual(bounds[k]);
          if (worst > L.knee * bounds[k]) engaged++;
        }
        expect(r.diagnostics.riderForce_mps2.z.every(Number.isFinite)).toBe(true);
      }),
      { numRuns: 60 },
    );
    // The tracks are violent enough that the soft limit is really exercised.
    expect(engaged).toBeGreaterThan(0);
  });

  it('is deterministic: the same track and profile give bit-identical poses', () => {
    fc.assert(
      fc.property(randomTrack, (v) => {
        const a = cueClassical(v, defaultCueingProfile());
        const b = cueClassical(v, defaultCueingProfile());
        for (const k of poseKeys)
          expect(a.pose[k].every((value, i) => Object.is(value, b.pose[k][i]))).toBe(true);
      }),
      { numRuns: 30 },
    );
  });
});

describe('step responses against closed forms', () => {
  const rate = 1000;
  const t0 = 1;

  it('surge: the default third-order channel follows x(t) = a [e^(-b t) - e^(-w t)] / (w - b)^2 - a t e^(-w t) / (w - b)', () => {
    // Inverse Laplace transform of a / ((s + w)^2 (s + b)): the third-order high-pass (zeta = 1)
    // times 1/s^2 applied to a step a/s, by partial fractions.
    const profile = defaultCueingProfile();
    const hp = profile.translational.x;
    if (hp.order !== 3 || hp.damping !== 1)
      throw new Error('default surge high-pass changed; update this check');
    const w = hp.naturalFrequency_radps;
    const b = hp.breakFrequency_radps;
    const a = profile.scale.surge * 1.0;
    const r = cueClassical(vehicle(rate, 20, { column: 'fx_mps2', value: 1.0, from_s: t0 }), profile);
    const closed = (t: number) =>
      (a * (Math.exp(-b * t) - Math.exp(-w * t))) / (w - b) ** 2 - (a * t * Math.exp(-w * t)) / (w - b);
    let peak = 0;
    for (let t = 0; t < 19; t += 0.01) peak = Math.max(peak, Math.abs(closed(t)));
    // Stays in the limiter's linear range, so the closed form applies throughout.
    expect(peak).toBeLessThan(profile.poseLimit.knee * profile.poseLimit.x_m);
    for (const t of [0.2, 0.5, 1, 2, 4, 8, 15]) {
      const i = Math.round((t0 + t) * rate);
      expect(Math.abs(r.pose.x_m[i]! - closed(t))).toBeLessThan(0.005 * peak);
    }
  });

  it('yaw: the default second-order channel gives yaw(t) = W t e^(-w t)', () => {
    // Inverse Laplace transform of W / (s + w)^2: second-order high-pass (zeta = 1) of a rate step, integrated once.
    const profile = defaultCueingProfile();
    const hp = profile.rotational.z;
    if (hp.order !== 2 || hp.damping !== 1)
      throw new Error('default yaw high-pass changed; update this check');
    const w = hp.frequency_radps;
    const W = profile.scale.yaw * 0.2;
    const r = cueClassical(vehicle(rate, 15, { column: 'wz_radps', value: 0.2, from_s: t0 }), profile);
    const peak = W / (w * Math.E);
    for (const t of [0.3, 1, 2, 5, 10]) {
      const i = Math.round((t0 + t) * rate);
      expect(Math.abs(r.pose.yaw_rad[i]! - W * t * Math.exp(-w * t))).toBeLessThan(0.005 * peak);
    }
  });
});
