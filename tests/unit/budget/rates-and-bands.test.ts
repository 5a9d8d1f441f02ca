// What riders and actuators are checked on does not depend on the controller rate: closed forms for
// sinusoids up to 0.35 x the rate, and one take processed at 100, 250 and 1000 Hz.
import { describe, expect, it } from 'vitest';
import { processTrack } from '../../../shared/motion/process';
import { seatSpecificForce } from '../../../shared/motion/seat-force';
import { weightingMagnitude } from '../../../shared/motion/iso2631';
import { parseTrackText } from '../../../shared/motion/track-reader';
import { G0_MPS2 } from '../../../shared/motion/units';
import { demoRideCsv } from '../../../shared/demo-ride';
import { demoHexapodInput } from '../../../shared/schemas/motion-base';
import { makeHexapodBase } from '../../factories/motion';
import { makeBudget, makePoseTrackFrom, smoothStep } from './track-builders';

describe('sinusoids up to 0.35 x the controller rate', () => {
  // Pure heave z = A s(t) sin(w t), faded in and out over 1 s so the track starts and ends at rest,
  // on the symmetric demo hexapod. Closed forms (calculus and plane geometry):
  //   seat specific force f_z = g0 + z'' at every seat (no rotation);
  //   weighted r.m.s. = |Wk(f)| x r.m.s. of z'' (ISO 2631-1 Annex A analytic weighting);
  //   every leg: l^2 = c + (h0 + z)^2, c = Rb^2 + Rp^2 - 2 Rb Rp cos d, so
  //   l' = (h0 + z) z' / l and l'' = (z'^2 + (h0 + z) z'') / l - ((h0 + z) z')^2 / l^3.
  const p = demoHexapodInput;
  const d = ((60 - p.baseHalfAngle_deg - p.platformHalfAngle_deg) * Math.PI) / 180;
  const c =
    p.baseRadius_m ** 2 + p.platformRadius_m ** 2 - 2 * p.baseRadius_m * p.platformRadius_m * Math.cos(d);
  const T = 6;
  const motion = (A: number, w: number, t: number) => {
    // s(t) = smoothStep(0.5, 1.5) - smoothStep(T - 1.5, T - 0.5); derivatives by hand.
    const k = Math.PI;
    let s = 0;
    let s1 = 0;
    let s2 = 0;
    if (t > 0.5 && t < 1.5) {
      s = 0.5 - 0.5 * Math.cos(k * (t - 0.5));
      s1 = 0.5 * k * Math.sin(k * (t - 0.5));
      s2 = 0.5 * k * k * Math.cos(k * (t - 0.5));
    } else if (t >= 1.5 && t <= T - 1.5) s = 1;
    else if (t > T - 1.5 && t < T - 0.5) {
      s = 0.5 + 0.5 * Math.cos(k * (t - (T - 1.5)));
      s1 = -0.5 * k * Math.sin(k * (t - (T - 1.5)));
      s2 = -0.5 * k * k * Math.cos(k * (t - (T - 1.5)));
    }
    const sn = Math.sin(w * t);
    const cs = Math.cos(w * t);
    const z = A * s * sn;
    const z1 = A * (s1 * sn + s * w * cs);
    const z2 = A * (s2 * sn + 2 * s1 * w * cs - s * w * w * sn);
    return { z, z1, z2 };
  };

  for (const rate of [100, 250]) {
    for (const ratio of [0.05, 0.2, 0.35]) {
      it(`${rate} Hz controller, heave at ${ratio} x the rate: seat force, weighted r.m.s., leg speed and acceleration within 3 %`, () => {
        const f = ratio * rate;
        const w = 2 * Math.PI * f;
        const A = 0.02 / (w * w); // 0.02 m/s^2 of heave acceleration
        const track = makePoseTrackFrom(2000, T, (t) => [0, 0, motion(A, w, t).z, 0, 0, 0]);
        const base = makeHexapodBase({ controllerRate_hz: rate });
        const r = processTrack({ track, base, budget: makeBudget({}) });
        const aPeak = A * w * w;
        // Seat acceleration at every controller sample, ends included.
        const fz = seatSpecificForce(
          { rate_hz: rate, ...r.pose },
          base.seats_m[0] as [number, number, number],
        ).z;
        let legV = 0;
        let legA = 0;
        let sumZ2 = 0;
        r.time_s.forEach((t, k) => {
          const m = motion(A, w, t);
          expect(Math.abs((fz[k] as number) - (G0_MPS2 + m.z2))).toBeLessThan(0.03 * aPeak);
          sumZ2 += m.z2 * m.z2;
          const h = p.neutralHeight_m + m.z;
          const l = Math.sqrt(c + h * h);
          legV = Math.max(legV, Math.abs((h * m.z1) / l));
          legA = Math.max(legA, Math.abs((m.z1 * m.z1 + h * m.z2) / l - (h * m.z1) ** 2 / l ** 3));
        });
        const use = (check: string) =>
          Math.max(...r.check.uses.filter((u) => u.check === check).map((u) => u.ratio));
        expect(Math.abs((use('legSpeed') * base.leg.speedMax_mps) / legV - 1)).toBeLessThan(0.03);
        expect(Math.abs((use('legAccel') * base.leg.accelMax_mps2) / legA - 1)).toBeLessThan(0.03);
        const wrms = Math.sqrt(sumZ2 / r.time_s.length) * weightingMagnitude('Wk', f);
        expect(Math.abs((r.check.comfort?.wrms_mps2.z ?? 0) / wrms - 1)).toBeLessThan(0.03);
        // Nothing of the heave was above the band: nothing reported removed.
        expect(use('outOfBand')).toBeLessThan(0.2);
      });
    }
  }
});

describe('the same take at 100, 250 and 1000 Hz', () => {
  it('gets the same verdict and every use ratio within 5 % (ratios under 0.01 of a limit count as equal)', () => {
    // The demo ride (a vehicle track) cued by the default profile for the demo hexapod at three rates.
    const track = parseTrackText(demoRideCsv(), { file: 'demo-ride.csv' });
    const runs = [100, 250, 1000].map((rate) =>
      processTrack({ track, base: makeHexapodBase({ controllerRate_hz: rate }) }),
    );
    const key = (u: { check: string; subject: string }) => `${u.check}/${u.subject}`;
    const [ref, ...others] = runs as [ReturnType<typeof processTrack>, ...ReturnType<typeof processTrack>[]];
    for (const r of others) {
      expect(r.exitCode).toBe(ref.exitCode);
      expect(r.check.within).toBe(ref.check.within);
      const byKey = new Map(r.check.uses.map((u) => [key(u), u.ratio]));
      for (const u of ref.check.uses) {
        const v = byKey.get(key(u));
        expect(v, key(u)).toBeDefined();
        const big = Math.max(u.ratio, v ?? 0);
        if (big >= 0.01) expect(Math.abs((v ?? 0) - u.ratio) / big, key(u)).toBeLessThan(0.05);
      }
    }
  });

  it('a gentle pose take at 100, 250 and 1000 Hz: same verdict, uses within 5 %', () => {
    const track = makePoseTrackFrom(200, 20, (t) => {
      const s = smoothStep(t, 1, 3) - smoothStep(t, 16, 18);
      return [
        0.05 * s * Math.sin(1.1 * t),
        0.04 * s * Math.sin(0.7 * t),
        0.03 * s * Math.sin(2.3 * t),
        0.03 * s * Math.sin(0.9 * t),
        0.02 * s * Math.sin(1.7 * t),
        0.04 * s * Math.sin(0.5 * t),
      ];
    });
    const runs = [100, 250, 1000].map((rate) =>
      processTrack({ track, base: makeHexapodBase({ controllerRate_hz: rate }) }),
    );
    const ref = runs[0] as ReturnType<typeof processTrack>;
    for (const r of runs.slice(1)) {
      expect(r.exitCode).toBe(ref.exitCode);
      const byKey = new Map(r.check.uses.map((u) => [`${u.check}/${u.subject}`, u.ratio]));
      for (const u of ref.check.uses) {
        const v = byKey.get(`${u.check}/${u.subject}`) ?? NaN;
        const big = Math.max(u.ratio, v);
        if (big >= 0.01) expect(Math.abs(v - u.ratio) / big, `${u.check}/${u.subject}`).toBeLessThan(0.05);
      }
    }
  });
});
