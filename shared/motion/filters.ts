// Continuous filters discretised by the bilinear (Tustin) transform with pre-warping at each section's
// corner (docs/motion-conventions.md section 4). A filter is a cascade of biquad sections; first-order sections are
// biquads with b2 = a2 = 0. Sections run in direct form II transposed over whole Float64Arrays.

/** One analog section (b2 s^2 + b1 s + b0) / (a2 s^2 + a1 s + a0), s in rad/s, pre-warped at warp_hz. */
export interface AnalogSection {
  readonly b: readonly [number, number, number];
  readonly a: readonly [number, number, number];
  readonly warp_hz: number;
}

/** A cascade of digital biquads at rate_hz, with the analog sections it was made from. */
export interface FilterCascade {
  readonly rate_hz: number;
  /** Five coefficients per section, normalised to a0 = 1: b0, b1, b2, a1, a2. */
  readonly coefficients: Float64Array;
  readonly analog: readonly AnalogSection[];
}

/** Normalised digital biquad coefficients (a0 = 1). */
export interface DigitalBiquad {
  b0: number;
  b1: number;
  b2: number;
  a1: number;
  a2: number;
}

/** Error thrown for filter parameters that cannot be realised at the given rate. */
export class FilterDesignError extends Error {
  override name = 'FilterDesignError';
}

/** Bilinear constant K (1/s) that maps warp_hz exactly: s = K (1 - z^-1) / (1 + z^-1). */
export function prewarpConstant(warp_hz: number, rate_hz: number): number {
  if (!(rate_hz > 0) || !Number.isFinite(rate_hz)) {
    throw new FilterDesignError(`sample rate must be a positive number of Hz, got ${rate_hz}`);
  }
  if (!(warp_hz > 0) || !(warp_hz < rate_hz / 2)) {
    throw new FilterDesignError(
      `corner frequency ${warp_hz} Hz must lie between 0 and the Nyquist frequency ${rate_hz / 2} Hz`,
    );
  }
  const w = 2 * Math.PI * warp_hz;
  return w / Math.tan(w / rate_hz / 2);
}

/** Analog biquad (b2 s^2 + b1 s + b0)/(a2 s^2 + a1 s + a0) (s in rad/s) to a digital biquad at rate_hz, pre-warped at warp_hz. */
export function analogToDigitalBiquad(section: AnalogSection, rate_hz: number): DigitalBiquad {
  const K = prewarpConstant(section.warp_hz, rate_hz);
  const [b0, b1, b2] = section.b;
  const [a0, a1, a2] = section.a;
  const K2 = K * K;
  if (a2 === 0 && b2 === 0) {
    // First order: the common factor (1 + z^-1) cancels, leaving a first-order digital section.
    const d0 = a1 * K + a0;
    if (d0 === 0) throw new FilterDesignError('analog section has a pole at s = -K');
    return { b0: (b1 * K + b0) / d0, b1: (b0 - b1 * K) / d0, b2: 0, a1: (a0 - a1 * K) / d0, a2: 0 };
  }
  const d0 = a2 * K2 + a1 * K + a0;
  if (d0 === 0) throw new FilterDesignError('analog section maps to a zero leading denominator');
  return {
    b0: (b2 * K2 + b1 * K + b0) / d0,
    b1: (2 * b0 - 2 * b2 * K2) / d0,
    b2: (b2 * K2 - b1 * K + b0) / d0,
    a1: (2 * a0 - 2 * a2 * K2) / d0,
    a2: (a2 * K2 - a1 * K + a0) / d0,
  };
}

/** Builds a digital cascade at rate_hz from analog sections (each pre-warped at its own corner). */
export function cascadeFromAnalog(sections: readonly AnalogSection[], rate_hz: number): FilterCascade {
  const coefficients = new Float64Array(5 * sections.length);
  sections.forEach((s, k) => {
    const d = analogToDigitalBiquad(s, rate_hz);
    coefficients.set([d.b0, d.b1, d.b2, d.a1, d.a2], 5 * k);
  });
  return { rate_hz, coefficients, analog: sections };
}

const TWO_PI = 2 * Math.PI;

/** Analog first-order high-pass s / (s + wc), corner f_hz. */
export function analogHighPass1(f_hz: number): AnalogSection {
  const w = TWO_PI * f_hz;
  return { b: [0, 1, 0], a: [w, 1, 0], warp_hz: f_hz };
}

/** Analog first-order low-pass wc / (s + wc), corner f_hz. */
export function analogLowPass1(f_hz: number): AnalogSection {
  const w = TWO_PI * f_hz;
  return { b: [w, 0, 0], a: [w, 1, 0], warp_hz: f_hz };
}

/** Analog second-order high-pass s^2 / (s^2 + 2 zeta wn s + wn^2), natural frequency f_hz. */
export function analogHighPass2(f_hz: number, damping: number): AnalogSection {
  const w = TWO_PI * f_hz;
  return { b: [0, 0, 1], a: [w * w, 2 * damping * w, 1], warp_hz: f_hz };
}

/** Analog second-order low-pass wn^2 / (s^2 + 2 zeta wn s + wn^2), natural frequency f_hz. */
export function analogLowPass2(f_hz: number, damping: number): AnalogSection {
  const w = TWO_PI * f_hz;
  return { b: [w * w, 0, 0], a: [w * w, 2 * damping * w, 1], warp_hz: f_hz };
}

/** First-order high-pass at rate_hz, corner f_hz. */
export function highPass1(f_hz: number, rate_hz: number): FilterCascade {
  return cascadeFromAnalog([analogHighPass1(f_hz)], rate_hz);
}

/** First-order low-pass at rate_hz, corner f_hz. */
export function lowPass1(f_hz: number, rate_hz: number): FilterCascade {
  return cascadeFromAnalog([analogLowPass1(f_hz)], rate_hz);
}

/** Second-order high-pass at rate_hz: natural frequency f_hz, damping ratio zeta (Q = 1 / (2 zeta)). */
export function highPass2(f_hz: number, damping: number, rate_hz: number): FilterCascade {
  return cascadeFromAnalog([analogHighPass2(f_hz, damping)], rate_hz);
}

/** Second-order low-pass at rate_hz: natural frequency f_hz, damping ratio zeta (Q = 1 / (2 zeta)). */
export function lowPass2(f_hz: number, damping: number, rate_hz: number): FilterCascade {
  return cascadeFromAnalog([analogLowPass2(f_hz, damping)], rate_hz);
}

/** Third-order high-pass (second-order at f_hz, zeta, times first-order at break_hz) at rate_hz. */
export function highPass3(f_hz: number, damping: number, break_hz: number, rate_hz: number): FilterCascade {
  return cascadeFromAnalog([analogHighPass2(f_hz, damping), analogHighPass1(break_hz)], rate_hz);
}

/** Third-order low-pass (second-order at f_hz, zeta, times first-order at break_hz) at rate_hz. */
export function lowPass3(f_hz: number, damping: number, break_hz: number, rate_hz: number): FilterCascade {
  return cascadeFromAnalog([analogLowPass2(f_hz, damping), analogLowPass1(break_hz)], rate_hz);
}

/** DC gain of one digital section (b0 + b1 + b2) / (1 + a1 + a2); 0 when the section blocks DC. */
function sectionDcGain(c: Float64Array, o: number): number {
  const num = (c[o] ?? 0) + (c[o + 1] ?? 0) + (c[o + 2] ?? 0);
  const den = 1 + (c[o + 3] ?? 0) + (c[o + 4] ?? 0);
  return num === 0 ? 0 : num / den;
}

/** DF2T state (two per section) that holds the cascade in steady state for a constant input x0. */
export function steadyState(cascade: FilterCascade, x0: number): Float64Array {
  const c = cascade.coefficients;
  const n = c.length / 5;
  const state = new Float64Array(2 * n);
  let x = x0;
  for (let k = 0; k < n; k++) {
    const o = 5 * k;
    const y = x * sectionDcGain(c, o);
    // In steady state y = b0 x + s1 and s2 = b2 x - a2 y.
    state[2 * k] = y - (c[o] ?? 0) * x;
    state[2 * k + 1] = (c[o + 2] ?? 0) * x - (c[o + 4] ?? 0) * y;
    x = y;
  }
  return state;
}

/** Fresh zero state for a cascade (filter at rest). */
export function zeroState(cascade: FilterCascade): Float64Array {
  return new Float64Array((2 * cascade.coefficients.length) / 5);
}

/**
 * Runs the cascade over `input` into `output` (may be the same array); `state` (two per section) is
 * read and updated, so a long signal can be filtered in pieces. Units pass through unchanged.
 */
export function filterInto(
  cascade: FilterCascade,
  input: Float64Array,
  output: Float64Array,
  state: Float64Array = zeroState(cascade),
): void {
  const c = cascade.coefficients;
  const sections = c.length / 5;
  const n = input.length;
  if (output.length < n) throw new RangeError('output is shorter than input');
  if (output !== input) output.set(input);
  for (let k = 0; k < sections; k++) {
    const o = 5 * k;
    const b0 = c[o] as number;
    const b1 = c[o + 1] as number;
    const b2 = c[o + 2] as number;
    const a1 = c[o + 3] as number;
    const a2 = c[o + 4] as number;
    let s1 = state[2 * k] as number;
    let s2 = state[2 * k + 1] as number;
    for (let i = 0; i < n; i++) {
      const x = output[i] as number;
      const y = b0 * x + s1;
      s1 = b1 * x - a1 * y + s2;
      s2 = b2 * x - a2 * y;
      output[i] = y;
    }
    state[2 * k] = s1;
    state[2 * k + 1] = s2;
  }
}

/** One sample through the cascade (DF2T), updating `state`; for streams produced sample by sample. Unit of x. */
export function filterSample(cascade: FilterCascade, state: Float64Array, x0: number): number {
  const c = cascade.coefficients;
  const sections = c.length / 5;
  let x = x0;
  for (let k = 0; k < sections; k++) {
    const o = 5 * k;
    const s = 2 * k;
    const y = (c[o] as number) * x + (state[s] as number);
    state[s] = (c[o + 1] as number) * x - (c[o + 3] as number) * y + (state[s + 1] as number);
    state[s + 1] = (c[o + 2] as number) * x - (c[o + 4] as number) * y;
    x = y;
  }
  return x;
}

/** Filters a whole signal into a new array; `initial: 'steady'` starts as if the first sample had always been there. */
export function filterSignal(
  cascade: FilterCascade,
  input: Float64Array,
  initial: 'rest' | 'steady' = 'rest',
): Float64Array {
  const out = new Float64Array(input.length);
  const state =
    initial === 'steady' && input.length > 0 ? steadyState(cascade, input[0] as number) : undefined;
  filterInto(cascade, input, out, state);
  return out;
}

/** |H(e^jw)| of the digital cascade at f_hz (w = 2 pi f / rate). */
export function digitalMagnitude(cascade: FilterCascade, f_hz: number): number {
  const w = (TWO_PI * f_hz) / cascade.rate_hz;
  const c1 = Math.cos(w);
  const s1 = -Math.sin(w);
  const c2 = Math.cos(2 * w);
  const s2 = -Math.sin(2 * w);
  const c = cascade.coefficients;
  let mag = 1;
  for (let o = 0; o < c.length; o += 5) {
    const b0 = c[o] as number;
    const b1 = c[o + 1] as number;
    const b2 = c[o + 2] as number;
    const a1 = c[o + 3] as number;
    const a2 = c[o + 4] as number;
    const nr = b0 + b1 * c1 + b2 * c2;
    const ni = b1 * s1 + b2 * s2;
    const dr = 1 + a1 * c1 + a2 * c2;
    const di = a1 * s1 + a2 * s2;
    mag *= Math.hypot(nr, ni) / Math.hypot(dr, di);
  }
  return mag;
}

/** |H(jw)| of analog sections at f_hz (w = 2 pi f rad/s). */
export function analogMagnitude(sections: readonly AnalogSection[], f_hz: number): number {
  const w = TWO_PI * f_hz;
  let mag = 1;
  for (const s of sections) {
    const [b0, b1, b2] = s.b;
    const [a0, a1, a2] = s.a;
    mag *= Math.hypot(b0 - b2 * w * w, b1 * w) / Math.hypot(a0 - a2 * w * w, a1 * w);
  }
  return mag;
}

/**
 * Analog frequency (Hz) that the bilinear transform pre-warped at warp_hz maps onto digital f_hz:
 * the digital response at f_hz equals the analog response at this frequency.
 */
export function bilinearAnalogFrequency(f_hz: number, warp_hz: number, rate_hz: number): number {
  return (prewarpConstant(warp_hz, rate_hz) * Math.tan((Math.PI * f_hz) / rate_hz)) / TWO_PI;
}

/** |H| of analog sections with each section evaluated where its own pre-warped bilinear map sends digital f_hz. */
export function prewarpedAnalogMagnitude(
  sections: readonly AnalogSection[],
  f_hz: number,
  rate_hz: number,
): number {
  let mag = 1;
  for (const s of sections) {
    mag *= analogMagnitude([s], bilinearAnalogFrequency(f_hz, s.warp_hz, rate_hz));
  }
  return mag;
}
