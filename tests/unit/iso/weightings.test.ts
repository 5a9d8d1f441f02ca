import { abs, add, complex, divide, multiply } from 'mathjs';
import { describe, expect, it } from 'vitest';
import type { Weighting } from '../../../shared/motion/iso2631';
import {
  crestFactor,
  msdv,
  msdvZ,
  rms,
  upsamplingFactor,
  vdv,
  vomitingShare_percent,
  weight,
  weightedRms,
  weightingMagnitude,
} from '../../../shared/motion/iso2631';
import { G0_MPS2 } from '../../../shared/motion/units';

// Weighting factors from memory of the ISO 2631-1:1997 tables.
const TABLE: [Weighting, number, number][] = [
  ['Wk', 1, 0.482],
  ['Wk', 2, 0.531],
  ['Wk', 8, 1.036],
  ['Wd', 1, 1.011],
  ['Wd', 4, 0.512],
  ['Wf', 0.16, 1.006],
  ['Wf', 0.25, 0.854],
];

/**
 * The Annex A formula of ISO 2631-1 (the standard's analytic weighting definitions), evaluated with mathjs
 * complex numbers at s = j 2 pi f: an independent restatement of the same definition.
 */
function annexA(p: {
  f1: number;
  f2: number;
  f3: number;
  f4: number;
  Q4: number;
  f5?: number;
  Q5?: number;
  f6?: number;
  Q6?: number;
}): (f: number) => number {
  return (f) => {
    const s = complex(0, 2 * Math.PI * f);
    const s2 = multiply(s, s);
    const w = (x: number) => 2 * Math.PI * x;
    const Q = Math.SQRT1_2;
    const hp = divide(s2, add(add(s2, multiply(w(p.f1) / Q, s)), w(p.f1) ** 2));
    const lp = divide(w(p.f2) ** 2, add(add(s2, multiply(w(p.f2) / Q, s)), w(p.f2) ** 2));
    const num = Number.isFinite(p.f3) ? add(1, divide(s, w(p.f3))) : complex(1, 0);
    const den = add(add(1, divide(s, p.Q4 * w(p.f4))), divide(s2, w(p.f4) ** 2));
    let h = multiply(multiply(hp, lp), divide(num, den));
    if (p.f5 !== undefined && p.f6 !== undefined && p.Q5 !== undefined && p.Q6 !== undefined) {
      const up = add(add(s2, multiply(w(p.f5) / p.Q5, s)), w(p.f5) ** 2);
      const dn = add(add(s2, multiply(w(p.f6) / p.Q6, s)), w(p.f6) ** 2);
      h = multiply(h, divide(up, dn));
    }
    return abs(h as never) as unknown as number;
  };
}

const annex: Record<Weighting, (f: number) => number> = {
  Wk: annexA({ f1: 0.4, f2: 100, f3: 12.5, f4: 12.5, Q4: 0.63, f5: 2.37, Q5: 0.91, f6: 3.35, Q6: 0.91 }),
  Wd: annexA({ f1: 0.4, f2: 100, f3: 2, f4: 2, Q4: 0.63 }),
  We: annexA({ f1: 0.4, f2: 100, f3: 1, f4: 1, Q4: 0.63 }),
  Wf: annexA({ f1: 0.08, f2: 0.63, f3: Infinity, f4: 0.25, Q4: 0.86, f5: 0.0625, Q5: 0.8, f6: 0.1, Q6: 0.8 }),
};

/** A sine of amplitude A at f_hz sampled at rate_hz for duration_s. */
function sine(A: number, f_hz: number, rate_hz: number, duration_s: number, offset = 0): Float64Array {
  const n = Math.round(duration_s * rate_hz);
  return Float64Array.from(
    { length: n },
    (_, i) => offset + A * Math.sin((2 * Math.PI * f_hz * i) / rate_hz),
  );
}

describe('analytic weightings', () => {
  it.each(TABLE)('%s at %f Hz is within 2 %% of the tabulated factor %f', (w, f, expected) => {
    // From memory of the standard's tables.
    expect(Math.abs(weightingMagnitude(w, f) / expected - 1)).toBeLessThan(0.02);
  });

  it.each(['Wk', 'Wd', 'We', 'Wf'] as const)('%s equals a mathjs evaluation of the Annex A formula', (w) => {
    // mathjs complex arithmetic on the Annex A formula.
    for (const f of [0.02, 0.1, 0.315, 1, 3.15, 10, 31.5, 80]) {
      expect(weightingMagnitude(w, f)).toBeCloseTo(annex[w](f), 12);
    }
  });
});

describe('discrete weighting filters', () => {
  // Steady-state r.m.s. ratio of output to input for a sinusoid, against the tabulated factor.
  const cases: [Weighting, number, number, number][] = TABLE.flatMap(([w, f, e]) => [
    [w, f, e, 100] as [Weighting, number, number, number],
    [w, f, e, 1000] as [Weighting, number, number, number],
  ]);

  it.each(cases)('%s at %f Hz passes a sine with gain %f (2 %%) at %i Hz', (w, f, expected, rate) => {
    // Tabulated factors from memory of the standard; whole periods after the start-up transient.
    const periods = w === 'Wf' ? 12 : 40;
    const settle_s = w === 'Wf' ? 120 : 20;
    const x = sine(1, f, rate, settle_s + periods / f);
    const y = weight(x, rate, w);
    const start = Math.round(settle_s * rate);
    const ratio = rms(y.subarray(start)) / rms(x.subarray(start));
    expect(Math.abs(ratio / expected - 1)).toBeLessThan(0.02);
  });

  it('follows the analytic weighting to 1 % up to 0.4 of a 100 Hz input rate, through the upsampled filter', () => {
    // The analytic |W| (checked above against mathjs) as the reference; 100 Hz input needs upsampling.
    expect(upsamplingFactor('Wk', 100)).toBeGreaterThan(1);
    for (const f of [16, 25, 31.5, 40]) {
      const x = sine(1, f, 100, 20);
      const y = weight(x, 100, 'Wk');
      const ratio = rms(y.subarray(1000)) / rms(x.subarray(1000));
      expect(Math.abs(ratio / weightingMagnitude('Wk', f) - 1)).toBeLessThan(0.01);
    }
  });

  it('starts in steady state: gravity on z causes no start-up transient', () => {
    // Every weighting has a high-pass band limit, so a constant (1 g) weights to zero.
    const z = new Float64Array(5000).fill(G0_MPS2);
    for (const w of ['Wk', 'Wf'] as const) {
      const y = weight(z, 100, w);
      expect(Math.max(...Array.from(y, Math.abs))).toBeLessThan(1e-9);
    }
  });

  it('names the bad sample', () => {
    const x = new Float64Array(10);
    x[7] = Number.NaN;
    expect(() => weight(x, 100, 'Wk')).toThrow(/sample 7 is not a finite number/);
    expect(() => weight(new Float64Array(4), 0, 'Wd')).toThrow(/positive number of Hz/);
  });
});

describe('dose values and statistics', () => {
  const A = 0.8;
  const f = 2;
  const rate = 200;
  const T = 30; // whole periods
  const x = sine(A, f, rate, T);

  it('r.m.s. of a sine is A / sqrt2 and its crest factor is sqrt2', () => {
    // Closed forms: mean of sin^2 over whole periods is 1/2; peak A.
    expect(rms(x)).toBeCloseTo(A / Math.SQRT2, 10);
    expect(crestFactor(x)).toBeCloseTo(Math.SQRT2, 6);
  });

  it('VDV of a sine is A (3T/8)^(1/4)', () => {
    // Closed form: integral of sin^4 over whole periods is 3T/8.
    expect(vdv(x, rate)).toBeCloseTo(A * Math.pow((3 * T) / 8, 0.25), 10);
  });

  it('MSDV of a sine is A sqrt(T/2)', () => {
    // Closed form: integral of sin^2 over whole periods is T/2.
    expect(msdv(x, rate)).toBeCloseTo(A * Math.sqrt(T / 2), 10);
  });

  it('MSDV_z of 1 g plus a 0.16 Hz heave is |Wf(0.16)| A sqrt(T/2), and Km = 1/3 gives the share who may vomit', () => {
    // Wf(0.16 Hz) = 1.006 from memory of the standard's table; Km = 1/3 from ISO 2631-1 Annex D (from memory).
    const z = sine(1, 0.16, 20, 2 * 60 * 60, G0_MPS2); // two hours, whole periods
    const m = msdvZ(z, 20);
    const expected = 1.006 * Math.sqrt((2 * 3600) / 2);
    expect(Math.abs(m / expected - 1)).toBeLessThan(0.02);
    expect(vomitingShare_percent(m)).toBeCloseTo(m / 3, 12);
  });

  it('weighted r.m.s. of a Wd-weighted 4 Hz sine is its factor times A / sqrt2', () => {
    // Wd 4 Hz = 0.512 from memory of the standard's table.
    const y = sine(1, 4, 400, 40);
    const wr = weightedRms(y, 400, 'Wd');
    expect(Math.abs(wr / (0.512 / Math.SQRT2) - 1)).toBeLessThan(0.02);
  });
});

describe('bad signals', () => {
  it('r.m.s. and crest factor name a non-finite sample instead of returning NaN', () => {
    const x = new Float64Array(20).fill(1);
    x[13] = Number.NaN;
    expect(() => rms(x)).toThrow(/sample 13/);
    expect(() => crestFactor(x)).toThrow(/sample 13/);
  });
});
