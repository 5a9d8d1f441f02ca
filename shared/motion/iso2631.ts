// ISO 2631-1:1997 frequency weightings from the standard's analytic definition (Annex A), discretised
// by the bilinear transform with pre-warping (shared/motion/filters.ts). The band-limiting low-pass of
// Wk, Wd and We sits at 100 Hz, above the Nyquist frequency of a 100 Hz controller rate, so signals at
// too low a rate are band-limited-interpolated up to at least 8 x f2 before filtering and the
// weighted signal is read back at the input instants; nothing of the definition is left out.

import type { AnalogSection, FilterCascade } from './filters';
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

/** Upsampling factor that lifts rate_hz to at least MIN_RATE_OVER_F2 x f2 of the weighting. */
export function upsamplingFactor(w: Weighting, rate_hz: number): number {
  const needed = MIN_RATE_OVER_F2 * WEIGHTING_PARAMETERS[w].f2;
  return rate_hz >= needed ? 1 : Math.ceil(needed / rate_hz);
}

/** The digital weighting filter at the internal rate used for input at rate_hz. */
export function weightingCascade(w: Weighting, rate_hz: number): FilterCascade {
  return cascadeFromAnalog(weightingSections(w), rate_hz * upsamplingFactor(w, rate_hz));
}

// Half-width (input samples) of the windowed-sinc interpolator. With a Blackman window the
// passband is flat to about 0.4 x the input rate; content closer to Nyquist is attenuated.
const INTERP_HALF_WIDTH = 16;

/** Polyphase taps: row p (0..L-1) holds 2H taps for the instant i + p/L from x[i-H+1 .. i+H]. */
function interpolationTaps(L: number): Float64Array {
  const H = INTERP_HALF_WIDTH;
  const taps = new Float64Array(L * 2 * H);
  for (let p = 0; p < L; p++) {
    const frac = p / L;
    let sum = 0;
    for (let j = 0; j < 2 * H; j++) {
      const d = frac - (j - H + 1); // distance from sample i - H + 1 + j, in input samples
      const u = d / H;
      const win = Math.abs(u) >= 1 ? 0 : 0.42 + 0.5 * Math.cos(Math.PI * u) + 0.08 * Math.cos(TWO_PI * u);
      const sinc = d === 0 ? 1 : Math.sin(Math.PI * d) / (Math.PI * d);
      const t = sinc * win;
      taps[p * 2 * H + j] = t;
      sum += t;
    }
    // Unity gain at DC for every phase so a constant stays constant.
    for (let j = 0; j < 2 * H; j++) taps[p * 2 * H + j] = (taps[p * 2 * H + j] as number) / sum;
  }
  return taps;
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

/**
 * Frequency-weighted signal (same unit, same instants as `signal` at rate_hz). The filter starts in
 * steady state at the first sample, so a constant offset such as gravity on z causes no start-up transient.
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
  const H = INTERP_HALF_WIDTH;
  const W = 2 * H;
  const taps = interpolationTaps(L);
  const last = n - 1;
  // The cascade runs inline on local state (the same operations as filterSample, in the same order).
  const c = cascade.coefficients;
  const sections = c.length / 5;
  for (let i = 0; i < n; i++) {
    out[i] = cascadeStep(c, sections, state, signal[i] as number);
    const from = i - H + 1;
    const inside = from >= 0 && from + W - 1 <= last;
    for (let p = 1; p < L; p++) {
      const row = p * W;
      let u = 0;
      if (inside) {
        for (let j = 0; j < W; j++) u += (taps[row + j] as number) * (signal[from + j] as number);
      } else {
        for (let j = 0; j < W; j++) {
          let k = from + j;
          k = k < 0 ? 0 : k > last ? last : k; // constant extension beyond the ends
          u += (taps[row + j] as number) * (signal[k] as number);
        }
      }
      cascadeStep(c, sections, state, u);
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
