// Band-limited decimation and derivatives (shared/motion/band-limit.ts) against closed forms: the
// derivatives of A sin(w t + p) are A w cos(w t + p) and -A w^2 sin(w t + p) (calculus); a tone above
// the controller band must be removed, not folded (Nyquist-Shannon sampling theorem); a Kaiser-windowed
// sinc's response is checked by evaluating its DTFT directly.
import { describe, expect, it } from 'vitest';
import {
  antiAliasTaps,
  bandLimitedDerivative,
  bandLimitedDerivatives3Into,
  besselI0,
  derivativeTaps,
  differentiator,
  extendByPrediction,
  twoStageDecimation,
} from '../../../shared/motion/band-limit';
import { resampleAntiAlias } from '../../../shared/motion/resample';
import type { Track } from '../../../shared/motion/track-reader';

const tone = (n: number, rate: number, f: number, ph: number) =>
  Float64Array.from({ length: n }, (_, i) => Math.sin(2 * Math.PI * f * (i / rate) + ph));

describe('band-limited derivatives', () => {
  it('I0 matches its tabulated values (Abramowitz and Stegun, table 9.8, from memory: I0(1) = 1.266066, I0(5) = 27.239872)', () => {
    expect(besselI0(0)).toBe(1);
    expect(besselI0(1)).toBeCloseTo(1.266066, 6);
    expect(besselI0(5)).toBeCloseTo(27.239872, 5);
  });

  it('the taps respond as j w and -w^2 within 0.01 % from 0 to 0.4 x the rate (DTFT evaluated directly)', () => {
    const { d1, d2 } = derivativeTaps();
    const M = (d1.length - 1) / 2;
    for (let f = 0.002; f <= 0.4; f += 0.002) {
      const w = 2 * Math.PI * f;
      let im = 0;
      let re = 0;
      for (let k = -M; k <= M; k++) {
        im += (d1[k + M] as number) * Math.sin(w * k);
        re += (d2[k + M] as number) * Math.cos(w * k);
      }
      expect(Math.abs(im / w - 1)).toBeLessThan(1e-4);
      expect(Math.abs(-re / (w * w) - 1)).toBeLessThan(1e-4);
    }
  });

  it('reads a parabola true to 1e-6, ends included (the taps are exact on it; the ends rest on the prediction)', () => {
    const D = differentiator(100);
    const p = Float64Array.from({ length: 300 }, (_, i) => 0.3 + 0.5 * (i / 100) - 2 * (i / 100) ** 2);
    const v = bandLimitedDerivative(D, 1, p);
    const a = bandLimitedDerivative(D, 2, p);
    v.forEach((x, i) => expect(x).toBeCloseTo(0.5 - 4 * (i / 100), 6));
    a.forEach((x) => expect(x).toBeCloseTo(-4, 5));
  });

  it('sinusoids up to 0.35 x the rate: first and second derivatives within 3 % at every sample, both ends included', () => {
    // Closed form: x = sin(w t + p), x' = w cos(w t + p), x'' = -w^2 sin(w t + p).
    const rate = 100;
    const D = differentiator(rate);
    for (const f of [0.5, 5, 10, 20, 31.5, 35]) {
      for (const ph of [0, 1.1]) {
        const x = tone(400, rate, f, ph);
        const w = 2 * Math.PI * f;
        const v = bandLimitedDerivative(D, 1, x);
        const a = bandLimitedDerivative(D, 2, x);
        for (let i = 0; i < x.length; i++) {
          const t = i / rate;
          expect(Math.abs((v[i] as number) - w * Math.cos(w * t + ph))).toBeLessThan(0.03 * w);
          expect(Math.abs((a[i] as number) + w * w * Math.sin(w * t + ph))).toBeLessThan(0.03 * w * w);
        }
      }
    }
  });

  it('the first-derivative taps are odd and the second-derivative taps even, exactly (as the derivatives of the sinc are)', () => {
    // Source: sinc is even, so its first derivative is odd and its second even (calculus); the
    // filters fold each pair of taps on this.
    const { d1, d2 } = derivativeTaps();
    const M = (d1.length - 1) / 2;
    expect(d1[M]).toBe(0);
    for (let k = 1; k <= M; k++) {
      expect(d1[M - k]).toBe(-d1[M + k]!);
      expect(d2[M - k]).toBe(d2[M + k]);
    }
  });

  it('the folded filters equal the plain 49-tap convolution of the extended track', () => {
    // Independent computation: the convolution written out directly over every tap.
    const rate = 100;
    const x = Float64Array.from({ length: 500 }, (_, i) => Math.sin(i * 0.07) + 0.2 * Math.cos(i * 0.9) + 3);
    const D = differentiator(rate);
    for (const order of [1, 2] as const) {
      const taps = order === 1 ? D.d1 : D.d2;
      const M = (taps.length - 1) / 2;
      const ext = extendByPrediction(x, M);
      const got = bandLimitedDerivative(D, order, x);
      for (let i = 0; i < x.length; i++) {
        let s = 0;
        for (let k = 0; k < taps.length; k++) s += taps[k]! * ext[i + k]!;
        expect(Math.abs(got[i]! - s)).toBeLessThan(1e-12 * rate ** order);
      }
    }
  });

  it('three signals at once, interleaved, give the single-signal derivatives to the bit, and the closed forms', () => {
    // Closed form as above (x = sin(w t + p): x' = w cos, x'' = -w^2 sin), and the one-signal filter.
    const rate = 100;
    const D = differentiator(rate);
    const n = 300;
    const w = [2 * Math.PI * 0.7, 2 * Math.PI * 12, 2 * Math.PI * 30];
    const sig = w.map((wj, j) => Float64Array.from({ length: n }, (_, i) => Math.sin((wj * i) / rate + j)));
    const [a, b, c] = sig as [Float64Array, Float64Array, Float64Array];
    const both1 = new Float64Array(3 * n);
    const both2 = new Float64Array(3 * n);
    const only1 = new Float64Array(3 * n);
    const only2 = new Float64Array(3 * n);
    bandLimitedDerivatives3Into(D, a, b, c, both1, both2);
    bandLimitedDerivatives3Into(D, a, b, c, only1, null);
    bandLimitedDerivatives3Into(D, a, b, c, null, only2);
    sig.forEach((x, j) => {
      const v = bandLimitedDerivative(D, 1, x);
      const acc = bandLimitedDerivative(D, 2, x);
      const wj = w[j]!;
      for (let i = 0; i < n; i++) {
        expect(both1[3 * i + j]).toBe(v[i]);
        expect(only1[3 * i + j]).toBe(v[i]);
        expect(both2[3 * i + j]).toBe(acc[i]);
        expect(only2[3 * i + j]).toBe(acc[i]);
        const t = i / rate;
        expect(Math.abs(v[i]! - wj * Math.cos(wj * t + j))).toBeLessThan(0.03 * wj);
        expect(Math.abs(acc[i]! + wj * wj * Math.sin(wj * t + j))).toBeLessThan(0.03 * wj * wj);
      }
    });
    expect(() => bandLimitedDerivatives3Into(D, a, b, c.subarray(1), both1, both2)).toThrow(/must agree/);
  });

  it('continues a track at rest as a track at rest', () => {
    const x = new Float64Array(50).fill(0.25);
    const e = extendByPrediction(x, 30);
    e.forEach((v) => expect(v).toBeCloseTo(0.25, 12));
  });
});

describe('anti-alias decimation', () => {
  const track = (rate: number, seconds: number, f: (t: number) => number): Track => {
    const n = Math.round(rate * seconds) + 1;
    const time_s = Float64Array.from({ length: n }, (_, i) => i / rate);
    return {
      kind: 'pose',
      layout: 'planar3',
      length: n,
      time_s,
      names: ['x_m', 'y_m', 'yaw_rad'],
      columns: [Float64Array.from(time_s, f), new Float64Array(n), new Float64Array(n)],
    };
  };

  it('the low-pass: flat within 0.1 % to 0.35 x, half amplitude at 0.4 x, 60 dB down from 0.45 x the controller rate', () => {
    for (const m of [1, 4, 20]) {
      const taps = antiAliasTaps(m);
      const H = (taps.length - 1) / 2;
      const resp = (f: number) => {
        let s = 0;
        for (let i = -H; i <= H; i++) s += (taps[i + H] as number) * Math.cos(((2 * Math.PI * f) / m) * i);
        return s;
      };
      for (let f = 0; f <= 0.35; f += 0.01) expect(Math.abs(resp(f) - 1)).toBeLessThan(1e-3);
      expect(resp(0.4)).toBeCloseTo(0.5, 2);
      if (m > 1) for (let f = 0.45; f < m / 2; f += 0.05) expect(Math.abs(resp(f))).toBeLessThan(1e-3);
    }
  });

  it('a 70 Hz tone from a 2 kHz track is removed at a 100 Hz controller and reported, never folded to 30 Hz', () => {
    // Without a low-pass, sampling 70 Hz at 100 Hz gives a 30 Hz alias at full amplitude (sampling theorem).
    const r = resampleAntiAlias(
      track(2000, 10, (t) => 1e-3 * Math.sin(2 * Math.PI * 70 * t)),
      100,
    );
    const x = r.track.columns[0] as Float64Array;
    let peak = 0;
    for (const v of x) peak = Math.max(peak, Math.abs(v));
    expect(peak).toBeLessThan(1e-3 * 1e-3);
    const removed = r.removed[0];
    expect((removed?.removedRms ?? 0) / (1e-3 / Math.SQRT2)).toBeCloseTo(1, 2);
  });

  it('a tone inside the band passes within 0.1 % and nothing is reported removed', () => {
    const r = resampleAntiAlias(
      track(2000, 10, (t) => 1e-2 * Math.sin(2 * Math.PI * 30 * t + 0.3)),
      100,
    );
    const x = r.track.columns[0] as Float64Array;
    x.forEach((v, k) => {
      expect(Math.abs(v - 1e-2 * Math.sin(2 * Math.PI * 30 * (k / 100) + 0.3))).toBeLessThan(1e-5);
    });
    expect((r.removed[0]?.removedRms ?? 1) / (r.removed[0]?.totalRms ?? 1)).toBeLessThan(1e-3);
  });
});

describe('anti-alias decimation in two stages', () => {
  const vehicle = (rate: number, seconds: number, f: (t: number) => number): Track => {
    const n = Math.round(rate * seconds) + 1;
    const time_s = Float64Array.from({ length: n }, (_, i) => i / rate);
    const cols = Array.from({ length: 6 }, () => new Float64Array(n));
    cols[0] = Float64Array.from(time_s, f);
    return {
      kind: 'vehicle',
      layout: 'hexapod',
      length: n,
      time_s,
      names: ['fx_mps2', 'fy_mps2', 'fz_mps2', 'wx_radps', 'wy_radps', 'wz_radps'],
      columns: cols,
    };
  };

  it('is planned for 1 kHz to 100 Hz (m = 10) and not for a prime m', () => {
    expect(twoStageDecimation(10)).toMatchObject({ m1: 5, m2: 2 });
    expect(twoStageDecimation(9)).toMatchObject({ m1: 3, m2: 3 });
    expect(twoStageDecimation(7)).toBeUndefined();
    expect(twoStageDecimation(2)).toBeUndefined();
  });

  it.each([5, 20, 30, 34])('passes a %f Hz tone from a 1 kHz track within 0.1 %% at 100 Hz', (f) => {
    // Sampling theorem: a tone below 0.35 x the controller rate must come through unchanged.
    const r = resampleAntiAlias(
      vehicle(1000, 8, (t) => Math.sin(2 * Math.PI * f * t + 0.2)),
      100,
    );
    const x = r.track.columns[0] as Float64Array;
    x.forEach((v, k) => expect(Math.abs(v - Math.sin(2 * Math.PI * f * (k / 100) + 0.2))).toBeLessThan(1e-3));
  });

  it.each([46, 60, 130, 155, 170, 230, 370, 480])(
    'removes a %f Hz tone from a 1 kHz track at 100 Hz (60 dB) instead of folding it into the band',
    (f) => {
      // Without a low-pass each of these would fold to |f - k 100| Hz at full amplitude (sampling
      // theorem); 155 to 245 Hz is where a weak first stage would let content fold through the second.
      const r = resampleAntiAlias(
        vehicle(1000, 8, (t) => Math.sin(2 * Math.PI * f * t)),
        100,
      );
      const x = r.track.columns[0] as Float64Array;
      let peak = 0;
      for (const v of x) peak = Math.max(peak, Math.abs(v));
      expect(peak).toBeLessThan(1e-3);
      // Reported as removed: the r.m.s. of the tone, 1/sqrt(2), within the probes' 2 % sampling error.
      expect(Math.abs((r.removed[0]?.removedRms ?? 0) / Math.SQRT1_2 - 1)).toBeLessThan(0.02);
    },
  );
});
