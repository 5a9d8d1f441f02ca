// Band-limited motion at the controller rate: anti-alias decimation, and derivatives taken exactly on
// the band-limited interpolant.
//
// Decimation. A track is first interpolated onto a fine uniform grid at m x the controller rate (m
// whole, the fine grid at least as dense as the track itself, its points every m-th on the controller
// grid), then low-passed by a windowed-sinc FIR and read at the controller instants. Why a windowed
// sinc and not a Butterworth run forward and backward: the motion the controller can carry must pass
// unchanged up to 0.35 x the controller rate while the cut-off is at most 0.4 x the rate; a Butterworth
// of any practical order either bends the pass band by far more than 3 % at 0.35 or leaves the band
// above Nyquist barely touched. A Kaiser-windowed sinc (Kaiser and Schafer 1980; Oppenheim and
// Schafer, "Discrete-Time Signal Processing", 7.6) with its -6 dB point at 0.4 x the rate, 70 dB of
// stop band from 0.45 x the rate and 0.03 % pass-band ripple to 0.35 x the rate does both; it is
// symmetric, so zero-phase, and it is only evaluated where an output is needed (per input sample it
// costs about 44 multiply-adds, whatever m is). When m has a factor 2 or 3 the same specification is
// met in two stages (twoStageDecimation) at about a third of that.
//
// Derivatives. A signal band-limited below 0.4 x its rate equals its sinc interpolant, whose
// derivatives at the sample instants are convolutions with the derivatives of the sinc:
// x'(n) = sum_k x[n+k] (-(-1)^k / k), x''(n) = sum_k x[n+k] (-2 (-1)^k / k^2) with -pi^2/3 at k = 0
// (times rate and rate^2). Those taps are Kaiser-windowed (beta 14) to 24 each side and corrected to be
// exact on polynomials up to the second degree; the response is then within 0.01 % of j w and -w^2
// from 0 to 0.4 x the rate (tests/unit/motion/band-limit.test.ts measures it).
//
// Ends. Every filter here needs samples beyond both ends. The track is continued by linear prediction
// (Burg's maximum-entropy method, as in Press et al., "Numerical Recipes", 13.6, memcof/predic): an
// autoregressive model fitted to the samples next to each end extends the motion as it was going, so a
// sinusoid continues as a sinusoid and a track at rest stays at rest. A hold or a mirror would instead
// put a kink in the slope or the curvature at each end, which the derivatives would read as motion.

/** Cut-off (-6 dB) of the anti-alias low-pass, as a share of the controller rate (at most 0.4). */
export const ANTI_ALIAS_CUTOFF = 0.4;
/** Pass-band edge: content up to this share of the controller rate passes within the ripple. */
export const ANTI_ALIAS_PASS_EDGE = 0.35;
/** Stop-band edge (70 dB down) as a share of the controller rate. */
export const ANTI_ALIAS_STOP_EDGE = 0.45;
const ANTI_ALIAS_ATTENUATION_DB = 70;

/** Half-width of the derivative filters, controller samples. */
export const DERIVATIVE_HALF_WIDTH = 24;
const DERIVATIVE_KAISER_BETA = 14;

const PREDICTION_ORDER = 16;
const PREDICTION_MIN_FIT = 256;

/** Zeroth-order modified Bessel function of the first kind, by its power series (converges for all x). */
export function besselI0(x: number): number {
  const q = (x * x) / 4;
  let term = 1;
  let sum = 1;
  for (let k = 1; k < 200; k++) {
    term *= q / (k * k);
    sum += term;
    if (term < sum * 1e-17) break;
  }
  return sum;
}

/** Kaiser window at u in [-1, 1] (0 outside) with shape beta. */
export function kaiser(u: number, beta: number): number {
  if (u <= -1 || u >= 1) return 0;
  return besselI0(beta * Math.sqrt(1 - u * u)) / besselI0(beta);
}

/** Kaiser's design rule for a stop band attenuation of a dB: the window's beta. */
function kaiserBeta(a_db: number): number {
  if (a_db > 50) return 0.1102 * (a_db - 8.7);
  if (a_db >= 21) return 0.5842 * (a_db - 21) ** 0.4 + 0.07886 * (a_db - 21);
  return 0;
}

/**
 * Kaiser-windowed sinc low-pass: 2H+1 taps, centre at index H, unity DC gain, cut-off fc and
 * transition width `width` in cycles per sample, stop band a_db down (Kaiser's length rule).
 */
function kaiserLowPass(fc: number, width: number, a_db: number): Float64Array {
  // Kaiser's length rule: N - 1 = (A - 8) / (2.285 * 2 pi * width).
  const H = Math.ceil((a_db - 8) / (2.285 * 2 * Math.PI * width) / 2);
  const beta = kaiserBeta(a_db);
  const taps = new Float64Array(2 * H + 1);
  let sum = 0;
  for (let i = -H; i <= H; i++) {
    const x = 2 * Math.PI * fc * i;
    const sinc = i === 0 ? 1 : Math.sin(x) / x;
    const v = 2 * fc * sinc * kaiser(i / (H + 1), beta);
    taps[i + H] = v;
    sum += v;
  }
  for (let i = 0; i < taps.length; i++) taps[i] = (taps[i] as number) / sum;
  return taps;
}

/**
 * Anti-alias low-pass taps on the fine grid of m samples per controller sample: 2H+1 taps, centre at
 * index H, unity DC gain. The cut-off and edges are ANTI_ALIAS_* x the controller rate, all times
 * `scale` (at most 1) when the track itself is coarser than the controller.
 */
export function antiAliasTaps(m: number, scale = 1): Float64Array {
  return kaiserLowPass(
    (scale * ANTI_ALIAS_CUTOFF) / m,
    (scale * (ANTI_ALIAS_STOP_EDGE - ANTI_ALIAS_PASS_EDGE)) / m,
    ANTI_ALIAS_ATTENUATION_DB,
  );
}

/**
 * A decimation by m in two stages when m has a small factor m2 (2 or 3) with m / m2 >= 2: first a
 * short low-pass at the fine rate read every (m / m2)-th sample, to m2 x the controller rate, then the
 * sharp anti-alias low-pass of m2 fine samples per controller sample (antiAliasTaps(m2)). The first
 * stage keeps 0 to ANTI_ALIAS_PASS_EDGE x the controller rate and is 70 dB down from (m2 -
 * ANTI_ALIAS_STOP_EDGE) x the rate, the lowest content that would fold into the band the second stage
 * keeps; above ANTI_ALIAS_STOP_EDGE the second stage takes it. The two together meet the single
 * filter's specification at about a third of its multiply-adds (the classic multistage decimator:
 * Crochiere and Rabiner, "Multirate Digital Signal Processing", 1983, ch. 5).
 */
export interface TwoStageDecimation {
  m1: number;
  m2: number;
  stage1: Float64Array;
  stage2: Float64Array;
}

/** The two-stage plan for m fine samples per controller sample, or undefined when one stage is best. */
export function twoStageDecimation(m: number): TwoStageDecimation | undefined {
  const m2 = [2, 3].find((f) => m % f === 0 && m / f >= 2);
  if (m2 === undefined) return undefined;
  const pass = ANTI_ALIAS_PASS_EDGE / m; // cycles per fine sample
  const stop = (m2 - ANTI_ALIAS_STOP_EDGE) / m;
  return {
    m1: m / m2,
    m2,
    stage1: kaiserLowPass((pass + stop) / 2, stop - pass, ANTI_ALIAS_ATTENUATION_DB),
    stage2: antiAliasTaps(m2),
  };
}

/** Windowed taps c[-M..M] (index k + M) of the first and second derivative per sample (multiply by rate, rate^2). */
export function derivativeTaps(M = DERIVATIVE_HALF_WIDTH): { d1: Float64Array; d2: Float64Array } {
  const d1 = new Float64Array(2 * M + 1);
  const d2 = new Float64Array(2 * M + 1);
  for (let k = 1; k <= M; k++) {
    const w = kaiser(k / (M + 1), DERIVATIVE_KAISER_BETA);
    const sign = k % 2 === 0 ? 1 : -1; // (-1)^k
    d1[M + k] = (-sign * w) / k;
    d1[M - k] = (sign * w) / k;
    const c2 = (-2 * sign * w) / (k * k);
    d2[M + k] = c2;
    d2[M - k] = c2;
  }
  // Windowing leaves a small gain error near 0 Hz (a ramp's slope read 0.3 % off with a plain window).
  // A correction proportional to the window itself, which only acts at low frequencies, makes the
  // taps exact for polynomials: sum k c1_k = 1 (a ramp's slope, and by odd symmetry a parabola's) and
  // sum k^2 c2_k = 2 with sum c2_k = 0 (a parabola's curvature, and nothing for a constant). The ideal
  // centre tap of c2 would be -pi^2/3.
  let m1 = 0;
  let m2 = 0;
  let g2 = 0;
  for (let k = 1; k <= M; k++) {
    m1 += 2 * k * (d1[M + k] as number);
    m2 += 2 * k * k * (d2[M + k] as number);
    g2 += 2 * k * k * kaiser(k / (M + 1), DERIVATIVE_KAISER_BETA);
  }
  const lambda = (1 - m1) / g2;
  const mu = (2 - m2) / g2;
  let sum2c = 0;
  for (let k = 1; k <= M; k++) {
    const w = kaiser(k / (M + 1), DERIVATIVE_KAISER_BETA);
    d1[M + k] = (d1[M + k] as number) + lambda * k * w;
    d1[M - k] = (d1[M - k] as number) - lambda * k * w;
    d2[M + k] = (d2[M + k] as number) + mu * w;
    d2[M - k] = (d2[M - k] as number) + mu * w;
    sum2c += 2 * (d2[M + k] as number);
  }
  d2[M] = -sum2c;
  return { d1, d2 };
}

/**
 * Burg's method: coefficients d[0..p) of x[n] ~ sum_k d[k] x[n-1-k], fitted to x[from, from+len).
 * Stops early (remaining coefficients 0) when the residual vanishes, as it does for a constant.
 */
function burg(x: Float64Array, from: number, len: number, order: number): Float64Array {
  const d = new Float64Array(order);
  if (len < 3) return d;
  const wk1 = new Float64Array(len);
  const wk2 = new Float64Array(len);
  const wkm = new Float64Array(order);
  let power = 0;
  for (let j = 0; j < len; j++) power += (x[from + j] as number) ** 2;
  if (!(power > 0)) return d;
  for (let j = 0; j < len - 1; j++) {
    wk1[j] = x[from + j] as number;
    wk2[j] = x[from + j + 1] as number;
  }
  const p = Math.min(order, len - 2);
  for (let k = 1; k <= p; k++) {
    let num = 0;
    let den = 0;
    for (let j = 0; j < len - k; j++) {
      const a = wk1[j] as number;
      const b = wk2[j] as number;
      num += a * b;
      den += a * a + b * b;
    }
    if (!(den > power * 1e-24)) break;
    const dk = (2 * num) / den;
    d[k - 1] = dk;
    for (let i = 1; i < k; i++) d[i - 1] = (wkm[i - 1] as number) - dk * (wkm[k - i - 1] as number);
    if (k === p) break;
    for (let i = 1; i <= k; i++) wkm[i - 1] = d[i - 1] as number;
    for (let j = 0; j < len - k - 1; j++) {
      wk1[j] = (wk1[j] as number) - (wkm[k - 1] as number) * (wk2[j] as number);
      wk2[j] = (wk2[j + 1] as number) - (wkm[k - 1] as number) * (wk1[j + 1] as number);
    }
  }
  return d;
}

/**
 * Continues `count` samples past the end of x[0..n) by linear prediction into out[0..count): a Burg
 * model of order 16 on the last samples less their least-squares line (at least 256, or four times `count`).
 */
function predictForward(x: Float64Array, n: number, count: number, out: Float64Array): void {
  const fit = Math.min(n, Math.max(PREDICTION_MIN_FIT, 4 * count));
  const from = n - fit;
  // The least-squares line through the fitted samples is taken out first and extended as a line, so a
  // constant or a ramp continues exactly; the model then continues what is left.
  let st = 0;
  let sv = 0;
  for (let j = 0; j < fit; j++) {
    st += j;
    sv += x[from + j] as number;
  }
  const tm = st / fit;
  const vm = sv / fit;
  let stt = 0;
  let stv = 0;
  for (let j = 0; j < fit; j++) {
    const dt = j - tm;
    stt += dt * dt;
    stv += dt * ((x[from + j] as number) - vm);
  }
  const slope = stt > 0 ? stv / stt : 0;
  const line = (j: number) => vm + slope * (j - tm);
  const seg = new Float64Array(fit);
  for (let j = 0; j < fit; j++) seg[j] = (x[from + j] as number) - line(j);
  const order = fit >= 4 * PREDICTION_ORDER ? PREDICTION_ORDER : Math.max(0, Math.floor(fit / 4));
  const d = burg(seg, 0, fit, order);
  const p = d.length;
  // The last p values, newest first.
  const hist = new Float64Array(p);
  for (let k = 0; k < p; k++) hist[k] = k < fit ? (seg[fit - 1 - k] as number) : 0;
  for (let i = 0; i < count; i++) {
    let v = 0;
    for (let k = 0; k < p; k++) v += (d[k] as number) * (hist[k] as number);
    for (let k = p - 1; k > 0; k--) hist[k] = hist[k - 1] as number;
    if (p > 0) hist[0] = v;
    out[i] = v + line(fit + i);
  }
}

/** x[0..n) with `pad` predicted samples before and after (see the file comment): length n + 2 pad. */
export function extendByPrediction(x: Float64Array, pad: number): Float64Array {
  const n = x.length;
  const out = new Float64Array(n + 2 * pad);
  out.set(x, pad);
  if (pad === 0) return out;
  if (n === 0) return out;
  const tail = new Float64Array(pad);
  predictForward(x, n, pad, tail);
  out.set(tail, pad + n);
  // Backwards: the model is fitted to the first samples, reversed; only those the fit reads are copied.
  const fit = Math.min(n, Math.max(PREDICTION_MIN_FIT, 4 * pad));
  const rev = new Float64Array(fit);
  for (let i = 0; i < fit; i++) rev[i] = x[fit - 1 - i] as number;
  predictForward(rev, fit, pad, tail);
  for (let i = 0; i < pad; i++) out[pad - 1 - i] = tail[i] as number;
  return out;
}

/** Result of decimating one column. */
export interface DecimatedColumn {
  /** The band-limited column at the controller instants. */
  values: Float64Array;
  /** R.m.s. of the content the low-pass removed (unit of the column). */
  removedRms: number;
  /** R.m.s. of the column about its mean (unit of the column). */
  totalRms: number;
}

// Quasi-random fine offsets (golden-ratio sequence) at which the removed content is sampled, so a tone
// locked to the controller rate cannot hide in the same phase every sample.
const GOLDEN = 0.6180339887498949;
/** Probes of the removed content per column before they are spaced out (see decimateColumn). */
const PROBES_MAX = 8192;

/**
 * Low-passes a fine-grid column (m fine samples per controller sample, controller instant k at fine
 * index k m) and reads it at `count` controller instants; see the file comment. The removed share is
 * estimated from one quasi-randomly placed fine sample per controller interval (every fine sample when
 * m = 1), on a long column only in every stride-th interval.
 */
export function decimateColumn(
  fine: Float64Array,
  m: number,
  count: number,
  taps: Float64Array = antiAliasTaps(m),
  plan: TwoStageDecimation | undefined = undefined,
): DecimatedColumn {
  const H = (taps.length - 1) / 2;
  // The ends need H fine samples beyond them for the probe, and for two stages as many as the first
  // stage's half-width plus m1 x the second's.
  const H1 = plan ? (plan.stage1.length - 1) / 2 : 0;
  const H2 = plan ? (plan.stage2.length - 1) / 2 : 0;
  const pad = plan ? Math.max(H, H1 + plan.m1 * H2) : H;
  const ext = extendByPrediction(fine, pad);
  const values = plan ? twoStageValues(ext, pad, count, plan) : new Float64Array(count);
  // The taps are symmetric: fold the two halves, half the multiplications. half[i] = taps[H + i].
  const half = taps.slice(H);
  const centre = half[0] as number;
  let sx = 0;
  let sxx = 0;
  let srr = 0;
  let probes = 0;
  const nf = fine.length;
  // Every controller interval is probed up to PROBES_MAX intervals; a longer column is probed every
  // `stride`-th interval (at most 2 x PROBES_MAX probes, plenty for an r.m.s. share).
  const stride = Math.max(1, Math.floor(count / PROBES_MAX));
  for (let k = 0; k < count; k++) {
    let c = k * m + pad;
    let s = 0;
    if (!plan) {
      s = centre * (ext[c] as number);
      for (let i = 1; i <= H; i++)
        s += (half[i] as number) * ((ext[c - i] as number) + (ext[c + i] as number));
      values[k] = s;
    }
    if (k % stride !== 0) continue;
    const off = m === 1 ? 0 : Math.floor(((k * GOLDEN) % 1) * m);
    const j = Math.min(k * m + off, nf - 1);
    // The removed content is measured with the single-stage filter (the same specification).
    let y = s;
    if (plan || !(off === 0 && j === k * m)) {
      c = j + pad;
      y = centre * (ext[c] as number);
      for (let i = 1; i <= H; i++)
        y += (half[i] as number) * ((ext[c - i] as number) + (ext[c + i] as number));
    }
    const x = fine[j] as number;
    const r = x - y;
    sx += x;
    sxx += x * x;
    srr += r * r;
    probes++;
  }
  const mean = probes > 0 ? sx / probes : 0;
  const variance = probes > 0 ? Math.max(0, sxx / probes - mean * mean) : 0;
  return {
    values,
    removedRms: probes > 0 ? Math.sqrt(srr / probes) : 0,
    totalRms: Math.sqrt(variance),
  };
}

/** The controller-rate values through the two stages; ext holds the fine column with `pad` samples either side. */
function twoStageValues(
  ext: Float64Array,
  pad: number,
  count: number,
  plan: TwoStageDecimation,
): Float64Array {
  const { m1, m2, stage1, stage2 } = plan;
  const H1 = (stage1.length - 1) / 2;
  const H2 = (stage2.length - 1) / 2;
  const half1 = stage1.slice(H1);
  const half2 = stage2.slice(H2);
  // Intermediate samples at m2 x the controller rate, H2 beyond either end: mid[q] sits at fine index
  // (q - H2) m1.
  const nm = (count - 1) * m2 + 1 + 2 * H2;
  const mid = new Float64Array(nm);
  for (let q = 0; q < nm; q++) {
    const c = (q - H2) * m1 + pad;
    let s = (half1[0] as number) * (ext[c] as number);
    for (let i = 1; i <= H1; i++)
      s += (half1[i] as number) * ((ext[c - i] as number) + (ext[c + i] as number));
    mid[q] = s;
  }
  const values = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    const c = k * m2 + H2;
    let s = (half2[0] as number) * (mid[c] as number);
    for (let i = 1; i <= H2; i++)
      s += (half2[i] as number) * ((mid[c - i] as number) + (mid[c + i] as number));
    values[k] = s;
  }
  return values;
}

/** Reusable derivative filters for one rate (taps scaled to per-second units). */
export interface Differentiator {
  readonly rate_hz: number;
  readonly d1: Float64Array;
  readonly d2: Float64Array;
}

const TAPS = derivativeTaps();

/** The band-limited differentiator at rate_hz (see the file comment). */
export function differentiator(rate_hz: number): Differentiator {
  const d1 = TAPS.d1.map((c) => c * rate_hz);
  const d2 = TAPS.d2.map((c) => c * rate_hz * rate_hz);
  return { rate_hz, d1, d2 };
}

/**
 * First (order 1) or second (order 2) time derivative of a uniformly sampled, band-limited signal at
 * the filter's rate, exact on its sinc interpolant up to the window's error; into out[i*stride+offset].
 */
export function bandLimitedDerivativeInto(
  diff: Differentiator,
  order: 1 | 2,
  src: Float64Array,
  out: Float64Array,
  stride = 1,
  offset = 0,
): void {
  const n = src.length;
  if (n < 2) {
    for (let i = 0; i < n; i++) out[i * stride + offset] = 0;
    return;
  }
  const taps = order === 1 ? diff.d1 : diff.d2;
  const M = (taps.length - 1) / 2;
  const ext = extendByPrediction(src, M);
  // The first-derivative taps are odd (c[-k] = -c[k], c[0] = 0) and the second's even, exactly (see
  // derivativeTaps): fold them, half the multiplications.
  const half = taps.slice(M);
  const centre = half[0] as number;
  if (order === 1) {
    for (let i = 0; i < n; i++) {
      const c = i + M;
      let s = 0;
      for (let k = 1; k <= M; k++)
        s += (half[k] as number) * ((ext[c + k] as number) - (ext[c - k] as number));
      out[i * stride + offset] = s;
    }
  } else {
    for (let i = 0; i < n; i++) {
      const c = i + M;
      let s = centre * (ext[c] as number);
      for (let k = 1; k <= M; k++)
        s += (half[k] as number) * ((ext[c + k] as number) + (ext[c - k] as number));
      out[i * stride + offset] = s;
    }
  }
}

/** The first or second derivative (see bandLimitedDerivativeInto) as a new array. */
export function bandLimitedDerivative(diff: Differentiator, order: 1 | 2, src: Float64Array): Float64Array {
  const out = new Float64Array(src.length);
  bandLimitedDerivativeInto(diff, order, src, out);
  return out;
}

/**
 * The first and/or second derivatives (as bandLimitedDerivativeInto) of three signals of one length in
 * one pass, interleaved: sample i of signal j goes to d1Out[3 i + j] and d2Out[3 i + j] (pass null for an
 * order not wanted). Each output is summed in the same order as bandLimitedDerivativeInto sums it, so the
 * values are the same to the bit; reading the three signals and both orders together only saves the
 * repeated passes over memory and lets the sums run side by side.
 */
export function bandLimitedDerivatives3Into(
  diff: Differentiator,
  a: Float64Array,
  b: Float64Array,
  c: Float64Array,
  d1Out: Float64Array | null,
  d2Out: Float64Array | null,
): void {
  const n = a.length;
  if (b.length !== n || c.length !== n) {
    throw new RangeError(`three signals of ${n}, ${b.length} and ${c.length} samples: they must agree`);
  }
  if (n < 2) {
    for (let i = 0; i < 3 * n; i++) {
      if (d1Out) d1Out[i] = 0;
      if (d2Out) d2Out[i] = 0;
    }
    return;
  }
  const M = (diff.d1.length - 1) / 2;
  if ((diff.d2.length - 1) / 2 !== M)
    throw new RangeError('first and second derivative taps differ in width');
  const e0 = extendByPrediction(a, M);
  const e1 = extendByPrediction(b, M);
  const e2 = extendByPrediction(c, M);
  const h1 = diff.d1.slice(M);
  const h2 = diff.d2.slice(M);
  const c2 = h2[0] as number;
  if (d1Out && d2Out) {
    for (let i = 0; i < n; i++) {
      const m = i + M;
      let p0 = 0;
      let p1 = 0;
      let p2 = 0;
      let q0 = c2 * (e0[m] as number);
      let q1 = c2 * (e1[m] as number);
      let q2 = c2 * (e2[m] as number);
      for (let k = 1; k <= M; k++) {
        const g = h1[k] as number;
        const h = h2[k] as number;
        let u = e0[m + k] as number;
        let v = e0[m - k] as number;
        p0 += g * (u - v);
        q0 += h * (u + v);
        u = e1[m + k] as number;
        v = e1[m - k] as number;
        p1 += g * (u - v);
        q1 += h * (u + v);
        u = e2[m + k] as number;
        v = e2[m - k] as number;
        p2 += g * (u - v);
        q2 += h * (u + v);
      }
      const o = 3 * i;
      d1Out[o] = p0;
      d1Out[o + 1] = p1;
      d1Out[o + 2] = p2;
      d2Out[o] = q0;
      d2Out[o + 1] = q1;
      d2Out[o + 2] = q2;
    }
  } else if (d2Out) {
    for (let i = 0; i < n; i++) {
      const m = i + M;
      let q0 = c2 * (e0[m] as number);
      let q1 = c2 * (e1[m] as number);
      let q2 = c2 * (e2[m] as number);
      for (let k = 1; k <= M; k++) {
        const h = h2[k] as number;
        q0 += h * ((e0[m + k] as number) + (e0[m - k] as number));
        q1 += h * ((e1[m + k] as number) + (e1[m - k] as number));
        q2 += h * ((e2[m + k] as number) + (e2[m - k] as number));
      }
      const o = 3 * i;
      d2Out[o] = q0;
      d2Out[o + 1] = q1;
      d2Out[o + 2] = q2;
    }
  } else if (d1Out) {
    for (let i = 0; i < n; i++) {
      const m = i + M;
      let p0 = 0;
      let p1 = 0;
      let p2 = 0;
      for (let k = 1; k <= M; k++) {
        const g = h1[k] as number;
        p0 += g * ((e0[m + k] as number) - (e0[m - k] as number));
        p1 += g * ((e1[m + k] as number) - (e1[m - k] as number));
        p2 += g * ((e2[m + k] as number) - (e2[m - k] as number));
      }
      const o = 3 * i;
      d1Out[o] = p0;
      d1Out[o + 1] = p1;
      d1Out[o + 2] = p2;
    }
  }
}
