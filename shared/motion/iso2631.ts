// ISO 2631-1:1997 frequency weightings from the standard's analytic definition (Annex A), discretised
// by the bilinear transform with pre-warping (shared/motion/filters.ts). The band-limiting low-pass of
// Wk, Wd and We sits at 100 Hz, above the Nyquist frequency of a 100 Hz controller rate, so signals at
// too low a rate are band-limited-interpolated up to at least 8 x f2 before filtering and the
// weighted signal is read back at the input instants; nothing of the definition is left out.

import type { AnalogSection, FilterCascade } from './filters';
import { kaiser } from './band-limit';
import {
  analogHighPass2,
  analogLowPass2,
  analogMagnitude,
  cascadeFromAnalog,
  filterInto,
  steadyState,
} from './filters';

/** The frequency weightings of ISO 2631-1:1997 this module implements. */
export type Weighting = 'Wk' | 'Wd' | 'We' | 'Wf';

/** Parameters of one weighting in Hz (Q dimensionless); f3 = Infinity means no transition zero. */
export interface WeightingParameters {
  f1: number;
  f2: number;
  f3: number;
  f4: number;
  Q4: number;
  /** Upward step; absent for Wd and We. */
  step?: { f5: number; Q5: number; f6: number; Q6: number };
}

/** Table A.1 of ISO 2631-1:1997 (Hz), from memory of the standard and as transcribed in public code; checked against the standard's weighting factors in tests/unit/iso. */
export const WEIGHTING_PARAMETERS: Readonly<Record<Weighting, WeightingParameters>> = {
  Wk: { f1: 0.4, f2: 100, f3: 12.5, f4: 12.5, Q4: 0.63, step: { f5: 2.37, Q5: 0.91, f6: 3.35, Q6: 0.91 } },
  Wd: { f1: 0.4, f2: 100, f3: 2.0, f4: 2.0, Q4: 0.63 },
  We: { f1: 0.4, f2: 100, f3: 1.0, f4: 1.0, Q4: 0.63 },
  Wf: {
    f1: 0.08,
    f2: 0.63,
    f3: Infinity,
    f4: 0.25,
    Q4: 0.86,
    step: { f5: 0.0625, Q5: 0.8, f6: 0.1, Q6: 0.8 },
  },
};

/** Share of people who may vomit per m/s^1.5 of MSDV_z, in percent (ISO 2631-1 Annex D, from memory). */
export const KM_PERCENT_PER_MSDV = 1 / 3;

/** The lowest processing rate, as a multiple of f2, at which the weighting filters run. */
export const MIN_RATE_OVER_F2 = 8;

const TWO_PI = 2 * Math.PI;
const BUTTERWORTH_DAMPING = Math.SQRT1_2; // Q = 1/sqrt(2) <=> zeta = 1/(2Q) = 1/sqrt(2)

/** Analog sections (s in rad/s) of a weighting: band limit high-pass f1, low-pass f2, a-v transition, upward step. */
export function weightingSections(w: Weighting): AnalogSection[] {
  const p = WEIGHTING_PARAMETERS[w];
  const w3 = TWO_PI * p.f3;
  const w4 = TWO_PI * p.f4;
  // (1 + s/w3) / (1 + s/(Q4 w4) + s^2/w4^2), multiplied through by w4^2; w3 = inf drops the zero.
  const transition: AnalogSection = {
    b: [w4 * w4, Number.isFinite(w3) ? (w4 * w4) / w3 : 0, 0],
    a: [w4 * w4, w4 / p.Q4, 1],
    warp_hz: p.f4,
  };
  const sections = [
    analogHighPass2(p.f1, BUTTERWORTH_DAMPING),
    analogLowPass2(p.f2, BUTTERWORTH_DAMPING),
    transition,
  ];
  if (p.step) {
    const w5 = TWO_PI * p.step.f5;
    const w6 = TWO_PI * p.step.f6;
    // Unity gain at high frequency, (f5/f6)^2 at low frequency.
    sections.push({
      b: [w5 * w5, w5 / p.step.Q5, 1],
      a: [w6 * w6, w6 / p.step.Q6, 1],
      warp_hz: Math.sqrt(p.step.f5 * p.step.f6),
    });
  }
  return sections;
}

/** Analytic |W(j 2 pi f)| of a weighting at f_hz (dimensionless). */
export function weightingMagnitude(w: Weighting, f_hz: number): number {
  return analogMagnitude(weightingSections(w), f_hz);
}

/**
 * Upsampling factor that lifts rate_hz to at least MIN_RATE_OVER_F2 x f2 of the weighting: the
 * smallest power of two that does, since the interpolation doubles the rate stage by stage.
 */
export function upsamplingFactor(w: Weighting, rate_hz: number): number {
  const needed = MIN_RATE_OVER_F2 * WEIGHTING_PARAMETERS[w].f2;
  let L = 1;
  while (rate_hz * L < needed) L *= 2;
  return L;
}

/** The digital weighting filter at the internal rate used for input at rate_hz. */
export function weightingCascade(w: Weighting, rate_hz: number): FilterCascade {
  return cascadeFromAnalog(weightingSections(w), rate_hz * upsamplingFactor(w, rate_hz));
}

// Interpolation. The signals weighted here are band-limited at their rate r (everything at the
// controller rate has passed the anti-alias low-pass: flat to 0.35 r, half its amplitude at 0.4 r, 70
// dB down from 0.45 r). Each doubling stage keeps its input samples and adds the midpoints from a
// Kaiser-windowed half-band sinc (Oppenheim and Schafer, "Discrete-Time Signal Processing", 7.6,
// Kaiser's design rule). The band kept is 0.4 r whatever the stage, so at stage s (input rate
// 2^(s-1) r) the transition runs from 0.4 r to the first image at 2^(s-1) r - 0.4 r: sharp at the first
// stage, wide and cheap after it. Each stage is flat to about 0.01 % over the band and puts the images
// of that band 80 dB down (tests/unit/iso measures the whole chain against the analytic weighting).
const INTERP_PASS_EDGE = 0.4;
const INTERP_ATTENUATION_DB = 80;

/** Symmetric midpoint taps of doubling stage s (1-based): 2H taps for the instant i + 1/2 from x[i-H+1 .. i+H]. */
function halfBandTaps(stage: number): Float64Array {
  const rate = 2 ** (stage - 1); // stage input rate in units of the signal's own rate
  const width = (rate - 2 * INTERP_PASS_EDGE) / rate; // transition, cycles per stage-input sample
  const beta = 0.1102 * (INTERP_ATTENUATION_DB - 8.7);
  // Kaiser's length rule N - 1 = (A - 8) / (2.285 * 2 pi * width), N = 2H even.
  const H = Math.max(2, Math.ceil(((INTERP_ATTENUATION_DB - 8) / (2.285 * 2 * Math.PI * width) + 1) / 2));
  const taps = new Float64Array(2 * H);
  let sum = 0;
  for (let j = 0; j < 2 * H; j++) {
    const d = 0.5 - (j - H + 1); // distance from sample i - H + 1 + j, in stage-input samples
    const t = (Math.sin(Math.PI * d) / (Math.PI * d)) * kaiser(d / (H + 0.5), beta);
    taps[j] = t;
    sum += t;
  }
  // Unity gain at DC so a constant stays constant.
  for (let j = 0; j < 2 * H; j++) taps[j] = (taps[j] as number) / sum;
  return taps;
}

/**
 * Doubles the rate of u[0..m): v[2t] = u[t + H - 1] and v[2t + 1] the midpoint after it, for every t
 * whose window lies inside u; returns the count of v written (2 (m - 2H + 1), or 0).
 */
function doubleRate(u: Float64Array, m: number, taps: Float64Array, v: Float64Array): number {
  const H = taps.length / 2;
  const count = m - 2 * H + 1;
  if (count <= 0) return 0;
  for (let t = 0; t < count; t++) {
    // Symmetric taps: fold the window, half the multiplications.
    let mid = 0;
    for (let j = 0; j < H; j++)
      mid += (taps[j] as number) * ((u[t + j] as number) + (u[t + 2 * H - 1 - j] as number));
    v[2 * t] = u[t + H - 1] as number;
    v[2 * t + 1] = mid;
  }
  return 2 * count;
}

function assertSignal(signal: Float64Array, rate_hz: number, what: string): void {
  if (!(rate_hz > 0) || !Number.isFinite(rate_hz)) {
    throw new RangeError(`${what}: sample rate must be a positive number of Hz, got ${rate_hz}`);
  }
  for (let i = 0; i < signal.length; i++) {
    if (!Number.isFinite(signal[i])) {
      throw new RangeError(`${what}: sample ${i} is not a finite number (${signal[i]})`);
    }
  }
}

const BLOCK = 4096;

/**
 * Frequency-weighted signal (same unit, same instants as `signal` at rate_hz). The filter starts in
 * steady state at the first sample, so a constant offset such as gravity on z causes no start-up
 * transient. Below MIN_RATE_OVER_F2 x f2 the signal is interpolated up (see above, constant beyond its
 * ends) in blocks, the filter runs at the higher rate and is read back at the input instants.
 */
export function weight(signal: Float64Array, rate_hz: number, w: Weighting): Float64Array {
  assertSignal(signal, rate_hz, `${w} weighting`);
  const n = signal.length;
  const out = new Float64Array(n);
  if (n === 0) return out;
  const L = upsamplingFactor(w, rate_hz);
  const cascade = cascadeFromAnalog(weightingSections(w), rate_hz * L);
  const state = steadyState(cascade, signal[0] as number);
  if (L === 1) {
    filterInto(cascade, signal, out, state);
    return out;
  }
  const stages: Float64Array[] = [];
  for (let s = 1; 2 ** (s - 1) < L; s++) stages.push(halfBandTaps(s));
  // Each stage loses H - 1 samples of its input before the block and H after it; at the signal's rate
  // that is at most H / 2^(s-1) on either side.
  let margin = 1;
  stages.forEach((taps, k) => (margin += Math.ceil(taps.length / 2 / 2 ** k)));
  const extLen = BLOCK + 2 * margin;
  let a = new Float64Array(extLen * L);
  let b = new Float64Array(extLen * L);
  const c = cascade.coefficients;
  const sections = c.length / 5;
  const last = n - 1;
  for (let from = 0; from < n; from += BLOCK) {
    const to = Math.min(n, from + BLOCK);
    // Block with its margins, constant beyond the ends; a[0] is signal index `start`.
    const start = from - margin;
    const len = to - from + 2 * margin;
    for (let k = 0; k < len; k++) {
      const i = start + k;
      a[k] = signal[i < 0 ? 0 : i > last ? last : i] as number;
    }
    // first: index of a[0] on the grid of the current rate (signal index x current factor).
    let first = start;
    let m = len;
    let factor = 1;
    for (const taps of stages) {
      const H = taps.length / 2;
      m = doubleRate(a, m, taps, b);
      first = 2 * (first + H - 1);
      factor *= 2;
      const t = a;
      a = b;
      b = t;
    }
    // Fine samples of the block's own instants: from * L .. to * L - 1.
    let j = from * factor - first;
    for (let i = from; i < to; i++) {
      out[i] = cascadeStep(c, sections, state, a[j] as number);
      j++;
      for (let p = 1; p < L; p++, j++) cascadeStep(c, sections, state, a[j] as number);
    }
  }
  return out;
}

/** filterSample on bare coefficients (five per section) and state (two per section). */
function cascadeStep(c: Float64Array, sections: number, state: Float64Array, x0: number): number {
  let x = x0;
  for (let k = 0, o = 0, s = 0; k < sections; k++, o += 5, s += 2) {
    const y = (c[o] as number) * x + (state[s] as number);
    state[s] = (c[o + 1] as number) * x - (c[o + 3] as number) * y + (state[s + 1] as number);
    state[s + 1] = (c[o + 2] as number) * x - (c[o + 4] as number) * y;
    x = y;
  }
  return x;
}

/** Root mean square of a signal (its unit); 0 for an empty signal. */
export function rms(signal: Float64Array): number {
  const n = signal.length;
  if (n === 0) return 0;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const a = signal[i] as number;
    sum += a * a;
  }
  // Scan for the culprit only when something is wrong, so the normal path pays nothing.
  if (!Number.isFinite(sum)) assertSignal(signal, 1, 'r.m.s.');
  return Math.sqrt(sum / n);
}

/** Frequency-weighted r.m.s. a_w (m/s^2 for accelerations in m/s^2) of a signal at rate_hz. */
export function weightedRms(signal: Float64Array, rate_hz: number, w: Weighting): number {
  return rms(weight(signal, rate_hz, w));
}

/** Vibration dose value (integral a^4 dt)^(1/4) of an already weighted signal: m/s^1.75 for m/s^2. */
export function vdv(weighted: Float64Array, rate_hz: number): number {
  assertSignal(weighted, rate_hz, 'VDV');
  let sum = 0;
  for (let i = 0; i < weighted.length; i++) {
    const a2 = (weighted[i] as number) * (weighted[i] as number);
    sum += a2 * a2;
  }
  return Math.pow(sum / rate_hz, 0.25);
}

/** Motion sickness dose value (integral a^2 dt)^(1/2) of an already Wf-weighted signal: m/s^1.5 for m/s^2. */
export function msdv(weighted: Float64Array, rate_hz: number): number {
  assertSignal(weighted, rate_hz, 'MSDV');
  let sum = 0;
  for (let i = 0; i < weighted.length; i++) sum += (weighted[i] as number) * (weighted[i] as number);
  return Math.sqrt(sum / rate_hz);
}

/** MSDV_z (m/s^1.5) of a vertical specific force or acceleration (m/s^2) at rate_hz, Wf-weighted. */
export function msdvZ(z: Float64Array, rate_hz: number): number {
  return msdv(weight(z, rate_hz, 'Wf'), rate_hz);
}

/** Share of people who may vomit, in percent, from MSDV_z in m/s^1.5 (Km = 1/3, ISO 2631-1 Annex D). */
export function vomitingShare_percent(msdvZ_mps1_5: number): number {
  return KM_PERCENT_PER_MSDV * msdvZ_mps1_5;
}

/** Crest factor: peak |a| over r.m.s. (dimensionless); 0 for a zero signal. */
export function crestFactor(signal: Float64Array): number {
  const r = rms(signal); // throws on a non-finite sample
  if (r === 0) return 0;
  let peak = 0;
  for (let i = 0; i < signal.length; i++) {
    const a = Math.abs(signal[i] as number);
    if (a > peak) peak = a;
  }
  return peak / r;
}
