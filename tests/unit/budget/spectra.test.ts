import { describe, expect, it } from 'vitest';
import {
  SICKNESS_BAND_HZ,
  bandPower,
  peakFrequency,
  totalPower,
  welchPsd,
  welchSegmentLength,
} from '../../../shared/motion/spectra';

/** Deterministic uniform noise in [-1, 1) (a 32-bit LCG, Numerical Recipes constants). */
function noise(n: number, seed = 12345): Float64Array {
  const out = new Float64Array(n);
  let s = seed >>> 0;
  for (let i = 0; i < n; i++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    out[i] = s / 2 ** 31 - 1;
  }
  return out;
}

/** Welch PSD by a direct O(N^2) DFT, written independently of fft.js (same window and scaling). */
function directWelch(x: Float64Array, N: number, rate: number): Float64Array {
  const w = Array.from({ length: N }, (_, k) => 0.5 - 0.5 * Math.cos((2 * Math.PI * k) / N));
  const wp = w.reduce((a, b) => a + b * b, 0);
  const psd = new Float64Array(N / 2 + 1);
  let segs = 0;
  for (let start = 0; start + N <= x.length; start += N / 2) {
    const seg = Array.from(x.subarray(start, start + N));
    const mean = seg.reduce((a, b) => a + b, 0) / N;
    for (let k = 0; k <= N / 2; k++) {
      let re = 0;
      let im = 0;
      for (let t = 0; t < N; t++) {
        const v = ((seg[t] as number) - mean) * (w[t] as number);
        re += v * Math.cos((2 * Math.PI * k * t) / N);
        im -= v * Math.sin((2 * Math.PI * k * t) / N);
      }
      psd[k] = (psd[k] as number) + (re * re + im * im) * (k === 0 || k === N / 2 ? 1 : 2);
    }
    segs++;
  }
  for (let k = 0; k <= N / 2; k++) psd[k] = (psd[k] as number) / (segs * rate * wp);
  return psd;
}

describe('Welch PSD', () => {
  it('matches a direct DFT bin by bin', () => {
    const x = noise(1024);
    const p = welchPsd(x, 0, 1, x.length, 50, 256);
    const ref = directWelch(x, 256, 50);
    expect(p.segments).toBe(7);
    for (let k = 0; k < ref.length; k++) expect(p.psd[k]).toBeCloseTo(ref[k] as number, 12);
  });

  it('obeys Parseval on one segment: the PSD integral equals the windowed power over the window power', () => {
    // Parseval's theorem for the DFT: sum |X_k|^2 = N sum |x_t|^2, exactly.
    const N = 512;
    const x = noise(N, 7);
    let mean = 0;
    for (const v of x) mean += v / N;
    let num = 0;
    let den = 0;
    for (let t = 0; t < N; t++) {
      const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * t) / N);
      num += ((x[t] as number) - mean) ** 2 * w * w;
      den += w * w;
    }
    expect(totalPower(welchPsd(x, 0, 1, N, 100, N))).toBeCloseTo(num / den, 12);
  });

  it('integrates to the variance of a long white-noise record (Parseval, within 2 %)', () => {
    const x = noise(200_000, 99);
    const mean = x.reduce((a, b) => a + b, 0) / x.length;
    const variance = x.reduce((a, b) => a + (b - mean) ** 2, 0) / x.length;
    // Uniform on [-1, 1): variance 1/3 (textbook).
    expect(variance).toBeCloseTo(1 / 3, 2);
    expect(totalPower(welchPsd(x, 0, 1, x.length, 100, 1024)) / variance).toBeCloseTo(1, 1);
    expect(Math.abs(totalPower(welchPsd(x, 0, 1, x.length, 100, 1024)) / variance - 1)).toBeLessThan(0.02);
  });

  it('puts a 0.3 Hz sinusoid at its frequency, with its power A^2/2 inside the 0.1-0.5 Hz band', () => {
    const rate = 100;
    const n = 300 * rate;
    const A = 2;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = 9.80665 + A * Math.sin(2 * Math.PI * 0.3 * (i / rate));
    const N = welchSegmentLength(n, rate);
    expect(N).toBe(4096);
    const p = welchPsd(x, 0, 1, n, rate);
    expect(Math.abs(peakFrequency(p) - 0.3)).toBeLessThanOrEqual(p.df_hz / 2);
    // Mean square of A sin(wt) is A^2/2 (textbook); the Hann main lobe (+-2 bins) stays inside the band.
    expect(bandPower(p, SICKNESS_BAND_HZ.low, SICKNESS_BAND_HZ.high) / ((A * A) / 2)).toBeCloseTo(1, 2);
  });

  it('reads an interleaved signal the same as a contiguous one', () => {
    const x = noise(4096, 3);
    const inter = new Float64Array(3 * x.length);
    for (let i = 0; i < x.length; i++) inter[3 * i + 1] = x[i] as number;
    const a = welchPsd(x, 0, 1, x.length, 100, 512);
    const b = welchPsd(inter, 1, 3, x.length, 100, 512);
    expect(Array.from(b.psd)).toEqual(Array.from(a.psd));
  });

  it('picks a shorter segment for a short track and none for a tiny one', () => {
    expect(welchSegmentLength(3000, 100)).toBe(1024);
    expect(welchSegmentLength(20, 100)).toBe(0);
  });
});
