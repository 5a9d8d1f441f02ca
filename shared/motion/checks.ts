// The motion-safety budget checks (docs/motion-conventions.md sections 5-6): each check gives a use ratio (worst value
// over limit) per subject, and a finding with its time span for every stretch at or over the limit.
//
// Ratios, per check:
// - stroke: measured from mid-stroke. The usable band is [min + margin, max - margin], m its middle and
//   h its half-width; ratio = |L - m| / h, so a leg resting at m reads 0 and a leg at either edge of the
//   band reads 1. value is the excursion |L - m| and limit is h, both in m.
// - legSpeed, legAccel: |value| / limit per leg.
// - envelope: see envelope.ts; subject = seat, with the axis and row named on the finding.
// - jerk, angularSpeed, angularAccel: |value| / limit per axis (platform frame) at the worst seat at
//   each instant.
// - wrms: weighted r.m.s. over the whole track at the worst seat / limit, per axis (Wd x, y; Wk z).
// - msdv: MSDV_z (Wf) at the worst seat / limit, subject z.
// - conditioning: Jacobian condition number / limit, subject "platform".
// - legForce: |axial force| / the actuator's rating per leg (leg-force.ts), when the base has a payload
//   and a rating.
// - startEnd: pose offset or rate at the first / last sample / its tolerance, subject "start" or "end"
//   (see start-end.ts).
// - vdv (when the budget sets vdvMax_mps1_75): VDV at its own worst seat / limit, per axis.
// - outOfBand: the share of an axis' r.m.s. the anti-alias low-pass removed / 0.05 (comfort tier).
//
// Derivatives (jerk, angular acceleration) are exact on the band-limited interpolant (band-limit.ts).
// Rider quantities are compared after a 4-pole Butterworth low-pass at 5 Hz (common practice for
// post-processing measured ride accelerations), run forward only and started in
// steady state; its group delay near 0 Hz is about 0.08 s, so spans can trail the pose by that much.
// The ISO 2631-1 weightings take the unfiltered specific force: they carry their own band limits.
import type { Budget } from '../schemas/budget';
import { ENVELOPE_AXES, REST_G } from '../schemas/budget';
import type { CheckName, CheckResult, ComfortSummary, Finding, Use } from '../schemas/findings';
import { CHECK_SEVERITY } from '../schemas/findings';
import { checkEnvelopeAxis } from './envelope';
import type { FilterCascade } from './filters';
import { analogLowPass2, cascadeFromAnalog, filterSignal } from './filters';
import { msdv, rms, upsamplingFactor, vdv, vomitingShare_percent, weight } from './iso2631';
import type { PoseColumns } from './hexapod';
import { checkStartEnd } from './start-end';
import { bandLimitedDerivativeInto, differentiator } from './band-limit';
import { G0_MPS2 } from './units';

/** Rider low-pass (common practice): 4-pole Butterworth at this corner, Hz. */
export const RIDER_LOWPASS_HZ = 5;

/** Condition number written for a singular pose (the kinematics report Infinity). */
export const SINGULAR_CONDITION = 1e12;

/** Actuator limits of a motion base's legs (m, m/s, m/s^2). */
export interface LegLimits {
  min_m: number;
  max_m: number;
  speedMax_mps: number;
  accelMax_mps2: number;
  /** Axial force rating (N), when the base gives one. */
  forceMax_N?: number;
}

/** Everything the checks read, on one uniform grid (time_s[i] = t0 + i / rate_hz). */
export interface CheckInput {
  time_s: Float64Array;
  rate_hz: number;
  /** Per leg: length (m), speed (m/s), acceleration (m/s^2); columns of time_s.length. */
  legLength_m: readonly Float64Array[];
  legSpeed_mps: readonly Float64Array[];
  legAccel_mps2: readonly Float64Array[];
  /** Per leg: axial force (N, compression positive), when the base has a payload. */
  legForce_N?: readonly Float64Array[];
  /** Per seat: specific force [x, y, z] in the platform frame, m/s^2 (at rest (0, 0, +g0)). */
  seatForce_mps2: readonly (readonly [Float64Array, Float64Array, Float64Array])[];
  /** Platform angular velocity in the platform frame [x, y, z], rad/s. */
  omega_radps: readonly [Float64Array, Float64Array, Float64Array];
  /** Pose offsets on the same grid, for the startEnd check (skipped when absent). */
  pose?: PoseColumns;
  /** Jacobian condition number per sample, if the kinematics gave one. */
  conditioning?: Float64Array;
  legLimits: LegLimits;
  /** The rigid platform's specific force as a function of seat position, for many seats (see SeatForceModel). */
  seatForceModel?: SeatForceModel;
  /** Per input axis, the share (0..1) of its r.m.s. the anti-alias low-pass removed. */
  bandLimit?: readonly { subject: string; share: number }[];
}

/** Share of an axis' r.m.s. removed by the anti-alias low-pass above which it is a finding. */
export const OUT_OF_BAND_SHARE_MAX = 0.05;

/** Crest factor above which the basic r.m.s. evaluation may underestimate (ISO 2631-1:1997, 6.2.1). */
export const CREST_FACTOR_FLAG = 9;

/** Running r.m.s. integration time of the MTVV, s (ISO 2631-1:1997, 6.3.1, tau = 1 s). */
export const MTVV_TAU_S = 1;

type Triple = readonly [Float64Array, Float64Array, Float64Array];

/**
 * Specific force on a rigid platform is affine in the seat position r (docs/motion-conventions.md section 5:
 * f = R^T (a_O - g) + R^T (alpha x R r + w x (w x R r))), so f(r) = origin + sum_j r_j perMetre[j]
 * (m/s^2 and m/s^2 per m, platform frame). The ISO weightings are linear filters, so they then run on
 * at most four signals per axis instead of once per seat: the force at the seats' centroid and its
 * change along each direction the seats spread in (seatLayoutBasis), three when the seats share a
 * plane. seats_m lists each seat's r (m, platform frame).
 */
export interface SeatForceModel {
  origin: Triple;
  perMetre: readonly [Triple, Triple, Triple];
  seats_m: readonly (readonly [number, number, number])[];
}

/**
 * The seats' centroid and orthonormal directions spanning their offsets from it (none for one seat,
 * one for seats in a row, two for seats in a plane, at most three); offsets under a micrometre are
 * taken as none.
 */
export function seatLayoutBasis(seats_m: readonly (readonly [number, number, number])[]): {
  centre: [number, number, number];
  directions: [number, number, number][];
} {
  const n = seats_m.length;
  const centre: [number, number, number] = [0, 0, 0];
  for (const r of seats_m) {
    centre[0] += r[0] / n;
    centre[1] += r[1] / n;
    centre[2] += r[2] / n;
  }
  const directions: [number, number, number][] = [];
  // Gram-Schmidt on the offsets, largest remainder first, so the basis does not hang on seat order.
  const rest = seats_m.map(
    (r) => [r[0] - centre[0], r[1] - centre[1], r[2] - centre[2]] as [number, number, number],
  );
  while (directions.length < 3) {
    let best = -1;
    let bestNorm = 1e-6;
    rest.forEach((v, i) => {
      const norm = Math.hypot(v[0], v[1], v[2]);
      if (norm > bestNorm) {
        bestNorm = norm;
        best = i;
      }
    });
    if (best < 0) break;
    const b = rest[best] as [number, number, number];
    const u: [number, number, number] = [b[0] / bestNorm, b[1] / bestNorm, b[2] / bestNorm];
    directions.push(u);
    for (const v of rest) {
      const d = v[0] * u[0] + v[1] * u[1] + v[2] * u[2];
      for (let a = 0; a < 3; a++) v[a] = (v[a] as number) - d * (u[a] as number);
    }
  }
  return { centre, directions };
}

/** Intermediate rider signals the pipeline reuses for spectra and charts (m/s^2, m/s^3, rad/s, rad/s^2). */
export interface RiderSignals {
  /** Per seat, low-passed specific force [x, y, z]. */
  seatForceLp_mps2: [Float64Array, Float64Array, Float64Array][];
  /** Per axis, worst |jerk| over the seats at each instant. */
  jerkWorst_mps3: [Float64Array, Float64Array, Float64Array];
}

export interface BudgetCheck extends CheckResult {
  rider: RiderSignals;
  notes: string[];
}

/** 4-pole Butterworth low-pass at f_hz as two biquads (damping cos(pi/8) and cos(3pi/8)), pre-warped at f_hz. */
export function butterworth4LowPass(f_hz: number, rate_hz: number): FilterCascade {
  return cascadeFromAnalog(
    [analogLowPass2(f_hz, Math.cos(Math.PI / 8)), analogLowPass2(f_hz, Math.cos((3 * Math.PI) / 8))],
    rate_hz,
  );
}

/** Thrown when a computed signal is not finite: a bug or an input the kinematics could not follow. */
export class CheckInputError extends Error {
  override name = 'CheckInputError';
}

function assertFinite(what: string, a: Float64Array, time_s: Float64Array): void {
  for (let i = 0; i < a.length; i++) {
    if (!Number.isFinite(a[i])) {
      throw new CheckInputError(`${what} is not a finite number at t = ${time_s[i]} s (sample ${i})`);
    }
  }
}

const AXIS_INDEX = { x: 0, y: 1, z: 2 } as const;

class Collector {
  readonly findings: Finding[] = [];
  readonly uses: Use[] = [];
  constructor(
    readonly time_s: Float64Array,
    readonly rate_hz: number,
  ) {}

  /** Span of samples first..last, widened half a sample each side (it covers the samples' intervals). */
  span(first: number, last: number): { start_s: number; end_s: number } {
    const half = 0.5 / this.rate_hz;
    return { start_s: (this.time_s[first] as number) - half, end_s: (this.time_s[last] as number) + half };
  }

  /**
   * Scans ratio[0..n) for runs at or over 1; each run becomes a finding valued at its worst sample.
   * Records the use (worst ratio) for the subject.
   */
  scan(
    check: CheckName,
    subject: string,
    ratio: Float64Array,
    valueAt: (i: number) => number,
    limitAt: (i: number) => number,
  ): void {
    const n = this.time_s.length;
    let worst = 0;
    let worstAt = -1;
    let first = -1;
    let peak = 0;
    for (let i = 0; i <= n; i++) {
      const r = i < n ? (ratio[i] as number) : 0;
      if (r > worst) {
        worst = r;
        worstAt = i;
      }
      if (r >= 1) {
        if (first < 0) {
          first = i;
          peak = i;
        } else if (r > (ratio[peak] as number)) peak = i;
      } else if (first >= 0) {
        this.findings.push({
          check,
          severity: CHECK_SEVERITY[check],
          subject,
          ...this.span(first, i - 1),
          value: valueAt(peak),
          limit: limitAt(peak),
          ratio: ratio[peak] as number,
        });
        first = -1;
      }
    }
    this.uses.push(
      worstAt >= 0
        ? { check, subject, ratio: worst, value: valueAt(worstAt), limit: limitAt(worstAt) }
        : { check, subject, ratio: worst },
    );
  }

  /** scan() of |signal| (any unit) against a constant limit in the same unit; `ratio` is scratch of length n. */
  scanAbs(check: CheckName, subject: string, signal: Float64Array, limit: number, ratio: Float64Array): void {
    this.scan(
      check,
      subject,
      absRatio(signal, limit, ratio),
      (i) => Math.abs(signal[i] as number),
      () => limit,
    );
  }

  /** A whole-track figure (wrms, msdv) against its limit. */
  whole(check: CheckName, subject: string, value: number, limit: number): void {
    const ratio = value / limit;
    const n = this.time_s.length;
    this.uses.push({ check, subject, ratio, value, limit });
    if (ratio >= 1 && n > 0) {
      this.findings.push({
        check,
        severity: CHECK_SEVERITY[check],
        subject,
        ...this.span(0, n - 1),
        value,
        limit,
        ratio,
      });
    }
  }
}

/** Fills ratio[i] = |signal[i]| / limit. */
function absRatio(signal: Float64Array, limit: number, ratio: Float64Array): Float64Array {
  const inv = 1 / limit;
  for (let i = 0; i < signal.length; i++) ratio[i] = Math.abs(signal[i] as number) * inv;
  return ratio;
}

/** The usable stroke band [min + margin, max - margin] (m), its middle and its half-width. */
export function strokeBand(
  leg: Pick<LegLimits, 'min_m' | 'max_m'>,
  margin_m: number,
): { low_m: number; high_m: number; mid_m: number; halfWidth_m: number } {
  const low_m = leg.min_m + margin_m;
  const high_m = leg.max_m - margin_m;
  return { low_m, high_m, mid_m: (low_m + high_m) / 2, halfWidth_m: (high_m - low_m) / 2 };
}

/** Stroke use of a leg at length_m (m): |L - mid| / half-width, 0 at mid-stroke and 1 at either edge. */
export function strokeUse(length_m: number, band: { mid_m: number; halfWidth_m: number }): number {
  return Math.abs(length_m - band.mid_m) / band.halfWidth_m;
}

/** Runs every check of the budget on one uniform-grid track; pure, allocation proportional to the track. */
export function runChecks(input: CheckInput, budget: Budget): BudgetCheck {
  const { time_s, rate_hz } = input;
  const n = time_s.length;
  const out = new Collector(time_s, rate_hz);
  const notes: string[] = [];
  const ratio = new Float64Array(n);
  const lim = input.legLimits;

  // Actuators.
  const band = strokeBand(lim, budget.strokeMargin_m);
  if (!(band.halfWidth_m > 0)) {
    throw new CheckInputError(
      `stroke margin ${budget.strokeMargin_m} m leaves no stroke between ${lim.min_m} m and ${lim.max_m} m`,
    );
  }
  const mid = band.mid_m;
  const half = band.halfWidth_m;
  const invHalf = 1 / half;
  input.legLength_m.forEach((len, k) => {
    assertFinite(`leg${k + 1} length`, len, time_s);
    for (let i = 0; i < n; i++) ratio[i] = Math.abs((len[i] as number) - mid) * invHalf;
    out.scan(
      'stroke',
      `leg${k + 1}`,
      ratio,
      (i) => Math.abs((len[i] as number) - mid),
      () => half,
    );
  });
  input.legSpeed_mps.forEach((v, k) => {
    assertFinite(`leg${k + 1} speed`, v, time_s);
    out.scanAbs('legSpeed', `leg${k + 1}`, v, lim.speedMax_mps, ratio);
  });
  input.legAccel_mps2.forEach((a, k) => {
    assertFinite(`leg${k + 1} acceleration`, a, time_s);
    out.scanAbs('legAccel', `leg${k + 1}`, a, lim.accelMax_mps2, ratio);
  });
  const forceMax = lim.forceMax_N;
  if (input.legForce_N && forceMax !== undefined) {
    input.legForce_N.forEach((f, k) => {
      assertFinite(`leg${k + 1} force`, f, time_s);
      out.scanAbs('legForce', `leg${k + 1}`, f, forceMax, ratio);
    });
  }

  // Rider: low-passed specific force per seat, envelope per seat and axis.
  const filterOk = rate_hz > 2 * RIDER_LOWPASS_HZ;
  if (!filterOk) {
    notes.push(
      `The ${RIDER_LOWPASS_HZ} Hz rider low-pass was not applied: the track rate ${rate_hz} Hz is too low for it.`,
    );
  }
  const lowPass = filterOk ? butterworth4LowPass(RIDER_LOWPASS_HZ, rate_hz) : null;
  const smooth = (a: Float64Array) => (lowPass ? filterSignal(lowPass, a, 'steady') : a.slice());
  const seatForceLp: [Float64Array, Float64Array, Float64Array][] = [];
  const jerkWorst: [Float64Array, Float64Array, Float64Array] = [
    new Float64Array(n),
    new Float64Array(n),
    new Float64Array(n),
  ];
  const scratch = new Float64Array(n);
  const g = new Float64Array(n);
  const D = differentiator(rate_hz);
  input.seatForce_mps2.forEach((force, s) => {
    const seat = `seat${s + 1}`;
    const lp = force.map((f, a) => {
      assertFinite(`${seat} specific force ${ENVELOPE_AXES[a]}`, f, time_s);
      return smooth(f);
    }) as [Float64Array, Float64Array, Float64Array];
    seatForceLp.push(lp);
    let seatWorst = 0;
    let seatAxis: 'x' | 'y' | 'z' = 'x';
    let seatRow = { row: 0, totalOutside_s: 0, excursions: 0 };
    for (const axis of ENVELOPE_AXES) {
      const f = lp[AXIS_INDEX[axis]];
      for (let i = 0; i < n; i++) g[i] = (f[i] as number) / G0_MPS2;
      const res = checkEnvelopeAxis(g, 0, 1, n, rate_hz, budget.envelope[axis], REST_G[axis]);
      if (res.ratio > seatWorst) {
        seatWorst = res.ratio;
        seatAxis = axis;
        const rs = res.rows[res.worstRow];
        seatRow = {
          row: res.worstRow,
          totalOutside_s: rs?.totalOutside_s ?? 0,
          excursions: rs?.excursions ?? 0,
        };
      }
      for (const v of res.violations) {
        out.findings.push({
          check: 'envelope',
          severity: CHECK_SEVERITY.envelope,
          subject: seat,
          ...out.span(v.firstIndex, v.lastIndex),
          value: v.value,
          limit: v.limit,
          ratio: v.ratio,
          axis,
          row: v.row,
          totalOutside_s: v.rowOutside_s,
          excursions: v.rowExcursions,
        });
      }
      // Jerk of the low-passed force; the worst seat at each instant.
      bandLimitedDerivativeInto(D, 1, f, scratch);
      const jw = jerkWorst[AXIS_INDEX[axis]];
      for (let i = 0; i < n; i++) {
        const j = Math.abs(scratch[i] as number);
        if (j > (jw[i] as number)) jw[i] = j;
      }
    }
    out.uses.push({ check: 'envelope', subject: seat, ratio: seatWorst, axis: seatAxis, ...seatRow });
  });

  const c = budget.comfort;
  for (const axis of ENVELOPE_AXES) {
    // jerkWorst holds magnitudes already (>= 0), so |jw| is jw itself.
    out.scanAbs('jerk', axis, jerkWorst[AXIS_INDEX[axis]], c.jerkMax_mps3, ratio);
  }

  // Platform rotation (the same at every seat), low-passed like the rider's specific force.
  const alpha = new Float64Array(n);
  for (const axis of ENVELOPE_AXES) {
    const raw = input.omega_radps[AXIS_INDEX[axis]];
    assertFinite(`angular velocity ${axis}`, raw, time_s);
    const w = smooth(raw);
    out.scanAbs('angularSpeed', axis, w, c.angularSpeedMax_radps, ratio);
    bandLimitedDerivativeInto(D, 1, w, alpha);
    out.scanAbs('angularAccel', axis, alpha, c.angularAccelMax_radps2, ratio);
  }

  if (input.conditioning && c.conditioningMax !== undefined) {
    const kMax = c.conditioningMax;
    // A singular pose has an infinite condition number: it is the worst finding, not bad input, so it
    // is written as SINGULAR_CONDITION to keep the JSON finite.
    const k = input.conditioning.map((v) => (Number.isFinite(v) ? v : SINGULAR_CONDITION));
    for (let i = 0; i < n; i++) ratio[i] = (k[i] as number) / kMax;
    out.scan(
      'conditioning',
      'platform',
      ratio,
      (i) => k[i] as number,
      () => kMax,
    );
  }

  if (input.pose) {
    const ends = checkStartEnd(time_s, rate_hz, input.pose, budget.startEnd);
    out.findings.push(...ends.findings);
    out.uses.push(...ends.uses);
  }

  const comfort = comfortFigures(input, rate_hz);
  if (comfort) {
    for (const axis of ENVELOPE_AXES) out.whole('wrms', axis, comfort.wrms_mps2[axis], c.wrmsMax_mps2);
    out.whole('msdv', 'z', comfort.msdvZ_mps1_5, c.msdvZMax_mps1_5);
    if (c.vdvMax_mps1_75 !== undefined) {
      for (const axis of ENVELOPE_AXES) out.whole('vdv', axis, comfort.vdv_mps1_75[axis], c.vdvMax_mps1_75);
    }
    const crest = comfort.crestFactor;
    if (crest) {
      const high = ENVELOPE_AXES.filter((a) => crest[a] > CREST_FACTOR_FLAG);
      if (high.length > 0) {
        notes.push(
          `Crest factor above ${CREST_FACTOR_FLAG} on ${high.map((a) => `${a} (${crest[a].toFixed(1)} at ${comfort.wrmsSeat[a]})`).join(', ')}: ` +
            'the basic r.m.s. method may underestimate the effect of the shocks (ISO 2631-1:1997, 6.2.1); read the MTVV and the VDV beside it.',
        );
      }
    }
  }

  for (const b of input.bandLimit ?? []) {
    out.whole('outOfBand', b.subject, b.share, OUT_OF_BAND_SHARE_MAX);
  }

  return {
    within: out.findings.length === 0,
    findings: out.findings,
    uses: out.uses,
    ...(comfort ? { comfort } : {}),
    rider: { seatForceLp_mps2: seatForceLp, jerkWorst_mps3: jerkWorst },
    notes,
  };
}

/**
 * Per seat: weighted r.m.s. (signal unit), VDV (unit s^0.25), MSDV (unit s^0.5), peak |a_w| and the
 * MTVV (signal unit) of one axis.
 */
interface Dose {
  rms: number;
  vdv: number;
  msdv: number;
  peak: number;
  mtvv: number;
}
type SeatDose = (seat: number) => Dose;

/**
 * Accumulates the figures of a weighted signal fed sample by sample. The MTVV is the largest running
 * r.m.s. with linear integration over tau = 1 s (ISO 2631-1:1997, 6.3.1, equation 4) once a whole
 * window has passed, or the whole track's r.m.s. when it is shorter than tau.
 */
class DoseAccumulator {
  private sum2 = 0;
  private sum4 = 0;
  private peak = 0;
  private window = 0;
  private maxWindow = 0;
  private count = 0;
  private readonly ring: Float64Array;
  constructor(private readonly rate_hz: number) {
    this.ring = new Float64Array(Math.max(1, Math.round(MTVV_TAU_S * rate_hz)));
  }
  add(v: number): void {
    const v2 = v * v;
    this.sum2 += v2;
    this.sum4 += v2 * v2;
    const a = Math.abs(v);
    if (a > this.peak) this.peak = a;
    const W = this.ring.length;
    const slot = this.count % W;
    this.window += v2 - (this.ring[slot] as number);
    this.ring[slot] = v2;
    this.count++;
    if (this.count >= W && this.window > this.maxWindow) this.maxWindow = this.window;
  }
  result(): Dose {
    const n = this.count;
    const W = this.ring.length;
    return {
      rms: n > 0 ? Math.sqrt(this.sum2 / n) : 0,
      vdv: Math.pow(this.sum4 / this.rate_hz, 0.25),
      msdv: Math.sqrt(this.sum2 / this.rate_hz),
      peak: this.peak,
      mtvv: n >= W ? Math.sqrt(Math.max(0, this.maxWindow) / W) : n > 0 ? Math.sqrt(this.sum2 / n) : 0,
    };
  }
}

/** Weights each seat's own signal (a filter run per seat and axis). */
function directDose(input: CheckInput, axis: 0 | 1 | 2, w: 'Wk' | 'Wd' | 'Wf', rate_hz: number): SeatDose {
  return (s) => {
    const weighted = weight((input.seatForce_mps2[s] as Triple)[axis], rate_hz, w);
    const acc = new DoseAccumulator(rate_hz);
    for (let i = 0; i < weighted.length; i++) acc.add(weighted[i] as number);
    const d = acc.result();
    // The library's own VDV and MSDV, which also refuse a non-finite sample.
    return { ...d, vdv: vdv(weighted, rate_hz), msdv: msdv(weighted, rate_hz), rms: rms(weighted) };
  };
}

/** Weights the model's signals along the seat layout once, then combines them per seat (filters are linear). */
function modelDose(model: SeatForceModel, axis: 0 | 1 | 2, w: 'Wk' | 'Wd' | 'Wf', rate_hz: number): SeatDose {
  const { centre, directions } = seatLayoutBasis(model.seats_m);
  const o = model.origin[axis];
  const pm = [model.perMetre[0][axis], model.perMetre[1][axis], model.perMetre[2][axis]] as const;
  const n = o.length;
  // f(r) = origin + sum_j r_j perMetre[j]: the force at the centre, and its change per metre along each direction.
  const along = (r: readonly number[], withOrigin: boolean) => {
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      out[i] =
        (withOrigin ? (o[i] as number) : 0) +
        (r[0] as number) * (pm[0][i] as number) +
        (r[1] as number) * (pm[1][i] as number) +
        (r[2] as number) * (pm[2][i] as number);
    }
    return out;
  };
  const w0 = weight(along(centre, true), rate_hz, w);
  const wk = directions.map((d) => weight(along(d, false), rate_hz, w));
  return (s) => {
    const r = model.seats_m[s] as readonly [number, number, number];
    const coef = directions.map(
      (d) => (r[0] - centre[0]) * d[0] + (r[1] - centre[1]) * d[1] + (r[2] - centre[2]) * d[2],
    );
    const acc = new DoseAccumulator(rate_hz);
    for (let i = 0; i < n; i++) {
      let v = w0[i] as number;
      for (let k = 0; k < wk.length; k++) v += (coef[k] as number) * ((wk[k] as Float64Array)[i] as number);
      acc.add(v);
    }
    return acc.result();
  };
}

/** ISO 2631-1 figures over the whole track at the worst seat per axis; undefined without seats or samples. */
export function comfortFigures(input: CheckInput, rate_hz: number): ComfortSummary | undefined {
  const seats = input.seatForce_mps2.length;
  if (seats === 0 || input.time_s.length < 2) return undefined;
  // The model when it needs fewer weightings than the seats would (coplanar seats: three per axis).
  const model =
    input.seatForceModel &&
    input.seatForceModel.seats_m.length === seats &&
    1 + seatLayoutBasis(input.seatForceModel.seats_m).directions.length < seats
      ? input.seatForceModel
      : undefined;
  const dose = (axis: 0 | 1 | 2, w: 'Wk' | 'Wd' | 'Wf') =>
    model ? modelDose(model, axis, w, rate_hz) : directDose(input, axis, w, rate_hz);
  const wrms = { x: 0, y: 0, z: 0 };
  const wrmsSeat = { x: 'seat1', y: 'seat1', z: 'seat1' };
  const vdvs = { x: 0, y: 0, z: 0 };
  const vdvSeat = { x: 'seat1', y: 'seat1', z: 'seat1' };
  const crest = { x: 0, y: 0, z: 0 };
  const mtvv = { x: 0, y: 0, z: 0 };
  const mtvvSeat = { x: 'seat1', y: 'seat1', z: 'seat1' };
  for (const axis of ENVELOPE_AXES) {
    const a = AXIS_INDEX[axis];
    const of = dose(a, axis === 'z' ? 'Wk' : 'Wd');
    for (let s = 0; s < seats; s++) {
      const d = of(s);
      const seat = `seat${s + 1}`;
      if (d.rms > wrms[axis] || s === 0) {
        wrms[axis] = d.rms;
        wrmsSeat[axis] = seat;
        crest[axis] = d.rms > 0 ? d.peak / d.rms : 0;
      }
      // VDV and MTVV each at their own worst seat: a seat with a lower r.m.s. can take harder shocks.
      if (d.vdv > vdvs[axis] || s === 0) {
        vdvs[axis] = d.vdv;
        vdvSeat[axis] = seat;
      }
      if (d.mtvv > mtvv[axis] || s === 0) {
        mtvv[axis] = d.mtvv;
        mtvvSeat[axis] = seat;
      }
    }
  }
  let msdvZ = 0;
  let msdvSeat = 'seat1';
  const sick = dose(2, 'Wf');
  for (let s = 0; s < seats; s++) {
    const m = sick(s).msdv;
    if (m > msdvZ || s === 0) {
      msdvZ = m;
      msdvSeat = `seat${s + 1}`;
    }
  }
  const up = upsamplingFactor('Wk', rate_hz);
  const weightingNote =
    up > 1
      ? `Wk and Wd were evaluated at ${rate_hz * up} Hz (the ${rate_hz} Hz track interpolated up ${up} times) so ` +
        `their 100 Hz band limit is kept; the track itself was band-limited below ${Number((0.45 * rate_hz).toPrecision(6))} Hz by the anti-alias low-pass.`
      : `Wk and Wd were evaluated at the track rate ${rate_hz} Hz.`;
  return {
    wrms_mps2: wrms,
    wrmsSeat,
    vdv_mps1_75: vdvs,
    vdvSeat,
    crestFactor: crest,
    mtvv_mps2: mtvv,
    mtvvSeat,
    msdvZ_mps1_5: msdvZ,
    msdvSeat,
    vomitShare_pct: vomitingShare_percent(msdvZ),
    weightingNote,
  };
}
