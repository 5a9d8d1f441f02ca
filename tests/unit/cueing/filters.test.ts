import { complex, abs, divide, add, multiply } from 'mathjs';
import { describe, expect, it } from 'vitest';
import type { AnalogSection, FilterCascade } from '../../../shared/motion/filters';
import {
  analogMagnitude,
  digitalMagnitude,
  filterInto,
  filterSample,
  filterSignal,
  highPass1,
  highPass2,
  highPass3,
  lowPass1,
  lowPass2,
  lowPass3,
  prewarpedAnalogMagnitude,
  steadyState,
  FilterDesignError,
} from '../../../shared/motion/filters';

/** Audio EQ Cookbook (R. Bristow-Johnson, W3C Working Group Note 2021) biquads, normalised to a0 = 1. */
function cookbook(kind: 'lp' | 'hp', f0: number, fs: number, Q: number): number[] {
  const w0 = (2 * Math.PI * f0) / fs;
  const alpha = Math.sin(w0) / (2 * Q);
  const c = Math.cos(w0);
  const b = kind === 'lp' ? [(1 - c) / 2, 1 - c, (1 - c) / 2] : [(1 + c) / 2, -(1 + c), (1 + c) / 2];
  const a0 = 1 + alpha;
  return [b[0]! / a0, b[1]! / a0, b[2]! / a0, (-2 * c) / a0, (1 - alpha) / a0];
}

/** |H(jw)| of analog sections evaluated with mathjs complex arithmetic, independently of analogMagnitude. */
function mathjsMagnitude(sections: readonly AnalogSection[], f_hz: number): number {
  const s = complex(0, 2 * Math.PI * f_hz);
  let h = complex(1, 0);
  for (const sec of sections) {
    const num = add(add(multiply(sec.b[2], multiply(s, s)), multiply(sec.b[1], s)), sec.b[0]);
    const den = add(add(multiply(sec.a[2], multiply(s, s)), multiply(sec.a[1], s)), sec.a[0]);
    h = multiply(h, divide(num, den)) as typeof h;
  }
  return abs(h) as unknown as number;
}

/** Magnitude at f of the filter's impulse response by a direct DFT (an independent check of the runner). */
function impulseDftMagnitude(cascade: FilterCascade, f_hz: number, length: number): number {
  const x = new Float64Array(length);
  x[0] = 1;
  const h = filterSignal(cascade, x);
  let re = 0;
  let im = 0;
  for (let n = 0; n < length; n++) {
    const ph = (-2 * Math.PI * f_hz * n) / cascade.rate_hz;
    re += h[n]! * Math.cos(ph);
    im += h[n]! * Math.sin(ph);
  }
  return Math.hypot(re, im);
}

const SQRT1_2 = Math.SQRT1_2;

describe('second-order coefficients', () => {
  it('low-pass Fs 100 Hz, f0 1 Hz, Q 1/sqrt2 matches the worked example', () => {
    // Computed from the Audio EQ Cookbook formulas (R. Bristow-Johnson; W3C Working Group Note 2021).
    const c = lowPass2(1, SQRT1_2, 100).coefficients;
    const expected = [0.000945, 0.001889, 0.000945, -1.911197, 0.914976];
    expected.forEach((e, i) => expect(c[i]).toBeCloseTo(e, 6));
  });

  it('low-pass and high-pass equal the Audio EQ Cookbook biquads for several corners and Q', () => {
    // Audio EQ Cookbook: damping zeta = 1 / (2 Q).
    for (const [f0, fs, Q] of [
      [1, 100, SQRT1_2],
      [0.3, 50, 0.5],
      [12, 1000, 2],
      [40, 200, 0.9],
    ] as const) {
      const lp = lowPass2(f0, 1 / (2 * Q), fs).coefficients;
      const hp = highPass2(f0, 1 / (2 * Q), fs).coefficients;
      cookbook('lp', f0, fs, Q).forEach((e, i) => expect(lp[i]).toBeCloseTo(e, 12));
      cookbook('hp', f0, fs, Q).forEach((e, i) => expect(hp[i]).toBeCloseTo(e, 12));
    }
  });

  it('has |H(f0)| = 0.70711 at the corner', () => {
    // Audio EQ Cookbook: |H(f0)| = 0.70711 for the cookbook low-pass with Q = 1/sqrt2.
    expect(digitalMagnitude(lowPass2(1, SQRT1_2, 100), 1)).toBeCloseTo(0.70711, 5);
    expect(digitalMagnitude(highPass2(1, SQRT1_2, 100), 1)).toBeCloseTo(0.70711, 5);
  });
});

const rate = 100;
const designs: [string, FilterCascade][] = [
  ['HP1', highPass1(0.5, rate)],
  ['LP1', lowPass1(0.5, rate)],
  ['HP2', highPass2(0.8, 0.7, rate)],
  ['LP2', lowPass2(0.8, 1, rate)],
  ['HP3', highPass3(0.4, 1, 0.08, rate)],
  ['LP3', lowPass3(1, 0.5, 0.3, rate)],
];

describe.each(designs)('%s frequency response', (_name, cascade) => {
  const freqs = Array.from({ length: 200 }, (_, k) => ((k + 0.5) / 200) * (rate / 4));

  it('analytic |H(jw)| agrees with a mathjs complex evaluation of the same transfer function', () => {
    // mathjs complex arithmetic as an independent evaluator.
    for (const f of [0.01, 0.1, 0.5, 1, 3, 10, 24]) {
      expect(analogMagnitude(cascade.analog, f)).toBeCloseTo(mathjsMagnitude(cascade.analog, f), 12);
    }
  });

  it('digital response equals the analytic response at the pre-warped bilinear frequency, everywhere below fs/4', () => {
    // The bilinear transform maps digital f to analog K tan(pi f / fs) / (2 pi), K pre-warped at each
    // section's corner (docs/motion-conventions.md section 4); that is the comparison the documented discretisation implies.
    for (const f of freqs) {
      const d = digitalMagnitude(cascade, f);
      const a = prewarpedAnalogMagnitude(cascade.analog, f, rate);
      expect(Math.abs(d - a)).toBeLessThanOrEqual(1e-9 * Math.max(a, 1e-6));
    }
  });

  it('digital response is within 0.5 % of the unwarped analytic response below fs/50', () => {
    // Pre-warping makes the match exact at each corner; below fs/50 the frequency warp
    // tan(pi f / fs) / (pi f / fs) - 1 stays under 0.14 %, so even a third-order slope stays under
    // 0.5 %. Closer to fs/4 only the pre-warped comparison above holds (a warp of 27 % at fs/4).
    for (const f of freqs.filter((g) => g <= rate / 50)) {
      const d = digitalMagnitude(cascade, f);
      const a = analogMagnitude(cascade.analog, f);
      expect(Math.abs(d / a - 1)).toBeLessThan(0.005);
    }
  });

  it('the DF2T runner realises that response (direct DFT of the impulse response)', () => {
    // A direct DFT of 2^16 samples of the impulse response (decayed to nothing by then).
    for (const f of [0.1, 0.5, 1, 5, 20]) {
      expect(impulseDftMagnitude(cascade, f, 1 << 16)).toBeCloseTo(digitalMagnitude(cascade, f), 8);
    }
  });
});

describe('pre-warping', () => {
  it('matches the analytic magnitude exactly at the corner of a single section', () => {
    // Definition of frequency pre-warping: the analog corner maps onto the digital corner.
    for (const c of [highPass1(3, 50), lowPass1(3, 50), highPass2(3, 0.4, 50), lowPass2(3, 0.4, 50)]) {
      expect(digitalMagnitude(c, 3)).toBeCloseTo(analogMagnitude(c.analog, 3), 12);
    }
  });

  it('refuses a corner at or above the Nyquist frequency', () => {
    expect(() => lowPass2(50, 0.7, 100)).toThrow(FilterDesignError);
    expect(() => highPass1(0, 100)).toThrow(/between 0 and the Nyquist/);
  });
});

describe('running over arrays', () => {
  it('starting in steady state holds a constant input with no transient', () => {
    const x = new Float64Array(500).fill(2.5);
    const lp = filterSignal(lowPass3(1, 0.7, 0.5, 100), x, 'steady');
    const hp = filterSignal(highPass3(1, 0.7, 0.5, 100), x, 'steady');
    for (let i = 0; i < x.length; i++) {
      expect(lp[i]).toBeCloseTo(2.5, 12);
      expect(Math.abs(hp[i]!)).toBeLessThan(1e-12);
    }
  });

  it('carries state across pieces: two halves equal one pass', () => {
    const c = highPass3(0.7, 0.9, 0.2, 100);
    const x = Float64Array.from({ length: 1000 }, (_, i) => Math.sin(i / 7) + 0.3 * Math.cos(i / 31));
    const whole = filterSignal(c, x);
    const state = steadyState(c, 0);
    const a = new Float64Array(400);
    const b = new Float64Array(600);
    filterInto(c, x.subarray(0, 400), a, state);
    filterInto(c, x.subarray(400), b, state);
    for (let i = 0; i < 400; i++) expect(a[i]).toBe(whole[i]);
    for (let i = 0; i < 600; i++) expect(b[i]).toBe(whole[400 + i]);
  });

  it('one sample at a time gives the same output as a whole-array pass', () => {
    const c = lowPass3(2, 0.6, 1, 100);
    const x = Float64Array.from({ length: 300 }, (_, i) => Math.sin(i / 5));
    const whole = filterSignal(c, x);
    const state = steadyState(c, 0);
    for (let i = 0; i < x.length; i++) expect(filterSample(c, state, x[i]!)).toBe(whole[i]);
  });
});
