// The offline pipeline in one pure function: a parsed track (vehicle, pose or legs) and a motion base,
// plus an optional cueing profile and budget, become the computed run in memory: leg lengths and poses
// at the controller rate, findings and spectra. No I/O, no clock. The files, manifest, summary and
// chart series of a run are made from this result by buildRunOutputs (run-outputs.ts).
import type { Budget } from '../schemas/budget';
import { DEMO_BUDGET, ENVELOPE_AXES } from '../schemas/budget';
import type { CueingProfile } from '../schemas/cueing-profile';
import { defaultCueingProfile } from '../schemas/cueing-profile';
import type { CheckResult } from '../schemas/findings';
import { exitCodeFor } from '../schemas/findings';
import type { MotionBase } from '../schemas/motion-base';
import type { BudgetCheck, SeatForceModel } from './checks';
import { runChecks } from './checks';
import type { PoseColumns } from './hexapod';
import {
  hexapodConditionNumbers,
  hexapodForward,
  hexapodGeometry,
  hexapodInverse,
  hexapodLegSpeeds,
} from './hexapod';
import { planar3ConditionNumbers, planar3Forward, planar3Geometry, planar3Inverse } from './planar3';
import { bandLimitedDerivative, differentiator, ANTI_ALIAS_CUTOFF } from './band-limit';
import type { DecimatedColumn } from './band-limit';
import type { RemovedContent, TrackGap } from './resample';
import { GAP_FACTOR, GAP_MAX_S, findGaps, medianSpacing, resampleAntiAlias } from './resample';
import type { PoseOffsetTrack } from './seat-force';
import { platformMotion, seatForceFromMotion } from './seat-force';
import type { WelchPsd } from './spectra';
import { SICKNESS_BAND_HZ, bandPower, totalPower, welchPsd, welchSegmentLength } from './spectra';
import type { Track } from './track-reader';
import { trackColumn } from './track-reader';
import { cueClassical } from './washout';
import { trackName } from './track-names';
import { hexapodLegForces } from './leg-force';
import { applyTouchup, TouchupError } from './touchup';
import { isIdentityTouchup } from '../schemas/touchup';
import type { Touchup } from '../schemas/touchup';
import type { ControllerOutput } from '../schemas/controller-output';
import { withNeutralRamps } from './controller-output';

/** Inputs of the pipeline; the track is parsed (SI) but not yet resampled. */
export interface ProcessInput {
  track: Track;
  base: MotionBase;
  /** Cueing profile for vehicle tracks; the default profile when absent. */
  profile?: CueingProfile;
  /** Safety budget; the demo budget (clearly marked as such) when absent. */
  budget?: Budget;
  /** Touch-up applied to the take before anything else (resampling, cueing, kinematics, checks). */
  touchup?: Touchup;
  /**
   * The venue controller's ramps from neutral at rest into the show and back out of it, added after
   * cueing and before kinematics, so they are solved and checked like the rest; none when absent.
   */
  ramp?: ControllerOutput['ramp'];
  /**
   * Called once with the final motion (times, pose, legs, seat forces), before the checks and
   * spectra, which only read it: lets a caller start writing it out meanwhile.
   */
  onMotion?: (
    motion: Pick<ProcessResult, 'time_s' | 'pose' | 'legs' | 'seatForce_mps2' | 'baseKind'>,
  ) => void;
  /**
   * Columns of the input track (by index) already through the anti-alias resampling, computed by
   * resampleAntiAliasColumns (e.g. on another thread); used only when no touch-up changes the take.
   */
  resampledColumns?: ReadonlyMap<number, DecimatedColumn>;
}

/** The ramps a run carries (s) and their profile. */
export interface RampSummary {
  in_s: number;
  out_s: number;
  profile: ControllerOutput['ramp']['profile'];
}

/** Spectra as written to spectra.json: one-sided Welch PSD per axis of the rider's specific force. */
export interface SpectraJson {
  method: string;
  unit: string;
  rate_hz: number;
  segment_n: number;
  segments: number;
  df_hz: number;
  band: { low_hz: number; high_hz: number; note: string };
  axes: Record<
    'x' | 'y' | 'z',
    { seat: string; totalPower_mps2sq: number; bandPower_mps2sq: number; bandShare: number; psd: number[] }
  >;
}

/** Everything a package holds, in memory. */
export interface ProcessResult {
  inputKind: Track['kind'];
  baseKind: MotionBase['kind'];
  rate_hz: number;
  time_s: Float64Array;
  /** Pose offsets from neutral (m, rad); planar stages keep z, roll and pitch at 0. */
  pose: PoseColumns;
  /** Leg lengths (m), one column per leg. */
  legs: Float64Array[];
  /** Axial leg forces (N, compression positive) when the base carries a payload (hexapods), else null. */
  legForce_N: Float64Array[] | null;
  /** Specific force at each seat [x, y, z] (m/s^2, platform frame), before the rider low-pass. */
  seatForce_mps2: (readonly [Float64Array, Float64Array, Float64Array])[];
  check: BudgetCheck;
  /** findings.json content (rounded for reading). */
  findings: CheckResult;
  /** spectra.json content, or null when the track is too short for a spectrum. */
  spectra: SpectraJson | null;
  budget: Budget;
  budgetIsDemo: boolean;
  /** The touch-up applied to the take before cueing, or null when none (or an identity one) was given. */
  touchup: Touchup | null;
  /** The profile used when the input was a vehicle track. */
  profile: CueingProfile | null;
  /** The ramps from and to neutral added around the show, or null when none. */
  ramp: RampSummary | null;
  notes: string[];
  exitCode: 0 | 3 | 4;
  /** Gaps in the input (spacing over 5 x the median), each bridged by interpolation; shaded on the charts. */
  gaps: TrackGap[];
}

/** Thrown when the track does not fit the base (a planar pose for a hexapod, too few samples). */
export class ProcessInputError extends Error {
  override name = 'ProcessInputError';
}

function vehicleColumns(track: Track, rate_hz: number) {
  return {
    rate_hz,
    fx_mps2: trackColumn(track, 'fx_mps2'),
    fy_mps2: trackColumn(track, 'fy_mps2'),
    fz_mps2: trackColumn(track, 'fz_mps2'),
    wx_radps: trackColumn(track, 'wx_radps'),
    wy_radps: trackColumn(track, 'wy_radps'),
    wz_radps: trackColumn(track, 'wz_radps'),
  };
}

/** Runs the whole offline pipeline (see the file comment); pure, throws on input it cannot process. */
export function processTrack(input: ProcessInput): ProcessResult {
  const { base } = input;
  const notes: string[] = [];
  let track = input.track;
  if (input.touchup && !isIdentityTouchup(input.touchup)) {
    try {
      track = applyTouchup(input.track, input.touchup);
    } catch (e) {
      if (e instanceof TouchupError) throw new ProcessInputError(`touch-up: ${e.message}`);
      throw e;
    }
    notes.push('The take was touched up before cueing (see the touch-up in the run parameters).');
  }
  const budgetIsDemo = input.budget === undefined;
  const budget = input.budget ?? DEMO_BUDGET;
  if (budgetIsDemo) {
    notes.push("No budget was given: the DEMO budget was used. Its numbers are invented, not a standard's.");
  }
  if (track.kind !== 'vehicle' && track.layout !== base.kind) {
    throw new ProcessInputError(
      `a ${trackName(track.kind, track.layout)} does not fit a ${base.kind} base (its columns are for the other kind)`,
    );
  }
  const rate_hz = base.controllerRate_hz;
  // Every track reaches the controller rate through the anti-alias low-pass (resampleAntiAlias):
  // platform motion (pose, legs) on a cubic Hermite curve, a vehicle track on straight segments (the
  // washout's filters and double integration smooth it anyway).
  // Holes in the track: a long one is bad input (the interpolant would invent the motion across it),
  // a shorter one is bridged and named in the notes and on the charts.
  const spacing = medianSpacing(track.time_s);
  const gaps = findGaps(track, spacing);
  for (const g of gaps) {
    if (g.end_s - g.start_s > GAP_MAX_S) {
      const where = g.lineAfter !== undefined ? `line ${g.lineAfter}: ` : '';
      throw new ProcessInputError(
        `${where}time jumps from ${g.start_s} s to ${g.end_s} s, a gap of ${sig(g.end_s - g.start_s)} s ` +
          `(over ${GAP_MAX_S} s; the median spacing is ${sig(spacing)} s): motion across it would be invented`,
      );
    }
    const lines =
      g.lineBefore !== undefined && g.lineAfter !== undefined
        ? ` (lines ${g.lineBefore}-${g.lineAfter})`
        : '';
    notes.push(
      `Gap in the track from ${sig(g.start_s)} s to ${sig(g.end_s)} s${lines}: ` +
        `${sig((g.end_s - g.start_s) / spacing)} times the median spacing (over ${GAP_FACTOR}x), bridged by interpolation.`,
    );
  }
  const decimated = resampleAntiAlias(
    track,
    rate_hz,
    track === input.track ? (input.resampledColumns ?? new Map()) : new Map(),
  );
  const rs = decimated.track;
  let n = rs.length;
  if (n < 4) {
    throw new ProcessInputError(
      `the track spans ${n} sample(s) at the controller rate ${rate_hz} Hz; at least 4 are needed`,
    );
  }
  let time_s = rs.time_s;
  const zeros = () => new Float64Array(n);
  let pose: PoseColumns;
  let legs: Float64Array[] | undefined;
  let profile: CueingProfile | null = null;

  if (rs.kind === 'vehicle') {
    profile = input.profile ?? defaultCueingProfile();
    const cued = cueClassical(vehicleColumns(rs, rate_hz), profile);
    const p = cued.pose;
    pose = {
      x_m: p.x_m,
      y_m: p.y_m,
      z_m: p.z_m,
      roll_rad: p.roll_rad,
      pitch_rad: p.pitch_rad,
      yaw_rad: p.yaw_rad,
    };
    if (base.kind === 'planar3') {
      // A planar stage moves in x, y and yaw only; heave and tilt coordination cannot be rendered.
      pose.z_m = zeros();
      pose.roll_rad = zeros();
      pose.pitch_rad = zeros();
      notes.push(
        'The base is a planar x-y-yaw stage: the cued heave, roll and pitch (including tilt coordination) were left out.',
      );
    }
  } else if (rs.kind === 'pose') {
    pose =
      base.kind === 'hexapod'
        ? {
            x_m: trackColumn(rs, 'x_m'),
            y_m: trackColumn(rs, 'y_m'),
            z_m: trackColumn(rs, 'z_m'),
            roll_rad: trackColumn(rs, 'roll_rad'),
            pitch_rad: trackColumn(rs, 'pitch_rad'),
            yaw_rad: trackColumn(rs, 'yaw_rad'),
          }
        : {
            x_m: trackColumn(rs, 'x_m'),
            y_m: trackColumn(rs, 'y_m'),
            z_m: zeros(),
            roll_rad: zeros(),
            pitch_rad: zeros(),
            yaw_rad: trackColumn(rs, 'yaw_rad'),
          };
  } else {
    legs = rs.columns.map((c) => c);
    if (base.kind === 'hexapod') {
      pose = hexapodForward(hexapodGeometry(base), legs, { time_s });
    } else {
      const p = planar3Forward(planar3Geometry(base), legs, { time_s });
      pose = {
        x_m: p.x_m,
        y_m: p.y_m,
        z_m: zeros(),
        roll_rad: zeros(),
        pitch_rad: zeros(),
        yaw_rad: p.yaw_rad,
      };
    }
  }

  // Ramps from neutral at rest into the show and back out of it, in the show's own time axis (the ramp
  // in before its first sample). Legs of a legs take are solved again from the ramped pose.
  let ramp: RampSummary | null = null;
  if (input.ramp && input.ramp.duration_s > 0) {
    const r = withNeutralRamps(time_s, pose, rate_hz, input.ramp);
    if (r.rampIn_s > 0) {
      time_s = r.time_s;
      pose = r.pose;
      n = time_s.length;
      legs = undefined;
      ramp = { in_s: r.rampIn_s, out_s: r.rampOut_s, profile: input.ramp.profile };
      notes.push(
        `Ramps of ${sig(r.rampIn_s)} s (${input.ramp.profile === 'quintic' ? 'quintic, from rest' : 'raised cosine'}) ` +
          'from neutral into the first pose and from the last pose back to neutral were added, as the venue controller ' +
          'plays them; they are solved and checked with the show.',
      );
    }
  }

  // Kinematics: lengths, speeds, accelerations and conditioning.
  let legSpeed: Float64Array[];
  let legAccel: Float64Array[];
  let conditioning: Float64Array | undefined;
  const wantConditioning = budget.comfort.conditioningMax !== undefined;
  // Pose rates and leg accelerations are exact derivatives of the band-limited interpolant at the
  // controller rate (band-limit.ts), so they do not depend on the rate for content it can carry.
  const D = differentiator(rate_hz);
  const d1 = (a: Float64Array) => bandLimitedDerivative(D, 1, a);
  if (base.kind === 'hexapod') {
    const g = hexapodGeometry(base);
    legs ??= hexapodInverse(g, pose);
    legSpeed = hexapodLegSpeeds(g, pose, {
      vx_mps: d1(pose.x_m),
      vy_mps: d1(pose.y_m),
      vz_mps: d1(pose.z_m),
      droll_radps: d1(pose.roll_rad),
      dpitch_radps: d1(pose.pitch_rad),
      dyaw_radps: d1(pose.yaw_rad),
    });
    legAccel = legSpeed.map(d1);
    if (wantConditioning) conditioning = hexapodConditionNumbers(g, pose);
  } else {
    const g = planar3Geometry(base);
    const planarPose = { x_m: pose.x_m, y_m: pose.y_m, yaw_rad: pose.yaw_rad };
    legs ??= planar3Inverse(g, planarPose);
    legSpeed = legs.map(d1);
    legAccel = legSpeed.map(d1);
    if (wantConditioning) conditioning = planar3ConditionNumbers(g, planarPose);
  }

  // What the riders feel.
  const poseTrack: PoseOffsetTrack = { rate_hz, ...pose };
  const motion = platformMotion(poseTrack);
  const legForce = actuatorForces(base, pose, motion, notes);
  const seatForce = base.seats_m.map((seat) => {
    const f = seatForceFromMotion(motion, seat);
    return [f.x, f.y, f.z] as const;
  });
  let seatForceModel: SeatForceModel | undefined;
  if (base.seats_m.length > 1) {
    const at = (r: [number, number, number]) => {
      const f = seatForceFromMotion(motion, r);
      return [f.x, f.y, f.z] as const;
    };
    const origin = at([0, 0, 0]);
    const unit = (r: [number, number, number]) => {
      const f = at(r);
      for (let a = 0; a < 3; a++) {
        const fa = f[a] as Float64Array;
        const oa = origin[a] as Float64Array;
        for (let i = 0; i < n; i++) fa[i] = (fa[i] as number) - (oa[i] as number);
      }
      return f;
    };
    seatForceModel = {
      origin,
      perMetre: [unit([1, 0, 0]), unit([0, 1, 0]), unit([0, 0, 1])],
      seats_m: base.seats_m,
    };
  }
  const omega: [Float64Array, Float64Array, Float64Array] = [zeros(), zeros(), zeros()];
  {
    // Platform-frame angular velocity R^T w, the rotation a rider feels.
    const R = motion.rotation;
    const W = motion.omega_radps;
    const [ox, oy, oz] = omega;
    for (let i = 0; i < n; i++) {
      const m = 9 * i;
      const o = 3 * i;
      const wx = W[o] as number;
      const wy = W[o + 1] as number;
      const wz = W[o + 2] as number;
      ox[i] = (R[m] as number) * wx + (R[m + 3] as number) * wy + (R[m + 6] as number) * wz;
      oy[i] = (R[m + 1] as number) * wx + (R[m + 4] as number) * wy + (R[m + 7] as number) * wz;
      oz[i] = (R[m + 2] as number) * wx + (R[m + 5] as number) * wy + (R[m + 8] as number) * wz;
    }
  }

  input.onMotion?.({ time_s, pose, legs, seatForce_mps2: seatForce, baseKind: base.kind });

  const check = runChecks(
    {
      time_s,
      rate_hz,
      legLength_m: legs,
      legSpeed_mps: legSpeed,
      legAccel_mps2: legAccel,
      ...(legForce ? { legForce_N: legForce } : {}),
      seatForce_mps2: seatForce,
      omega_radps: omega,
      pose,
      ...(conditioning ? { conditioning } : {}),
      ...(seatForceModel ? { seatForceModel } : {}),
      legLimits: base.leg,
      bandLimit: decimated.removed.map((r) => ({ subject: axisName(r.name), share: removedShare(r) })),
    },
    budget,
  );
  notes.push(bandLimitNote(decimated.removed, rate_hz, decimated.bandScale));
  notes.push(...check.notes);
  if (check.comfort) notes.push(check.comfort.weightingNote);

  const spectra = riderSpectra(seatForce, check, rate_hz, n);
  if (!spectra) notes.push('The track is too short for a spectrum (fewer than 32 samples).');

  return {
    inputKind: track.kind,
    baseKind: base.kind,
    rate_hz,
    time_s,
    pose,
    legs,
    legForce_N: legForce,
    seatForce_mps2: seatForce,
    check,
    findings: findingsForJson(check, notes),
    spectra,
    budget,
    budgetIsDemo,
    touchup: input.touchup && !isIdentityTouchup(input.touchup) ? input.touchup : null,
    profile,
    ramp,
    notes,
    exitCode: exitCodeFor(check),
    gaps: gaps.map((g) => ({ start_s: g.start_s, end_s: g.end_s })),
  };
}

// Below these r.m.s. levels an axis counts as still, so a share of nothing is not a finding (m, rad,
// m/s^2, rad/s; common practice for measurement noise floors, well under anything a rider feels).
const STILL_RMS: Readonly<Record<string, number>> = { m: 1e-5, rad: 1e-5, mps2: 1e-3, radps: 1e-4 };

/** The share (0..1) of a column's r.m.s. the anti-alias low-pass removed, a still axis counting as its floor. */
export function removedShare(r: RemovedContent): number {
  const unit = r.name.slice(r.name.lastIndexOf('_') + 1);
  const floor = STILL_RMS[unit] ?? 0;
  const total = Math.max(r.totalRms, floor);
  return total > 0 ? Math.min(1, r.removedRms / total) : 0;
}

/** 'roll_rad' -> 'roll': the axis a column carries, without its unit. */
const axisName = (column: string) => column.slice(0, Math.max(0, column.lastIndexOf('_'))) || column;

function bandLimitNote(removed: readonly RemovedContent[], rate_hz: number, scale: number): string {
  const cut = sig(ANTI_ALIAS_CUTOFF * rate_hz * scale);
  const where =
    scale < 1
      ? `0.4 x the track's own rate, which is below the controller's`
      : `${ANTI_ALIAS_CUTOFF} x the rate`;
  const parts = removed.map((r) => {
    return `${axisName(r.name)} ${(removedShare(r) * 100).toFixed(1)} %`;
  });
  return (
    `Decimated to the ${rate_hz} Hz controller rate through an anti-alias low-pass (Kaiser-windowed sinc, ` +
    `cut-off ${cut} Hz = ${where}, zero phase); share of each axis' r.m.s. removed: ` +
    `${parts.join(', ')}.`
  );
}

/** Leg forces from the platform's inverse dynamics when the base has a payload; notes say what was left out. */
function actuatorForces(
  base: MotionBase,
  pose: PoseColumns,
  motion: ReturnType<typeof platformMotion>,
  notes: string[],
): Float64Array[] | null {
  if (base.kind !== 'hexapod' || !base.payload) {
    if (base.leg.forceMax_N !== undefined) {
      notes.push(
        base.kind === 'hexapod'
          ? 'The base gives an actuator force rating but no payload: actuator forces were not computed.'
          : 'Actuator forces are computed for hexapods only; the planar stage rating was not checked.',
      );
    }
    return null;
  }
  if (base.leg.forceMax_N === undefined) {
    notes.push(
      'The base gives a payload but no actuator force rating (leg.forceMax_N): forces are charted, not checked.',
    );
  }
  notes.push(
    'Actuator forces: rigid-body inverse dynamics of the platform and its payload (Newton-Euler, legs massless), ' +
      'mapped onto the legs through the Jacobian transpose; compression positive.',
  );
  return hexapodLegForces(hexapodGeometry(base), pose, motion, base.payload);
}

function riderSpectra(
  seatForce: readonly (readonly [Float64Array, Float64Array, Float64Array])[],
  check: BudgetCheck,
  rate_hz: number,
  n: number,
): SpectraJson | null {
  const seg = welchSegmentLength(n, rate_hz);
  if (seg === 0 || seatForce.length === 0) return null;
  let first: WelchPsd | undefined;
  const axes = {} as SpectraJson['axes'];
  ENVELOPE_AXES.forEach((axis, a) => {
    // The seat with the highest weighted r.m.s. on this axis, as in the wrms check.
    const seatName = check.comfort?.wrmsSeat[axis] ?? 'seat1';
    const s = Math.max(0, Number(seatName.slice(4)) - 1);
    const signal = (seatForce[s] ?? seatForce[0])?.[a] as Float64Array;
    const p = welchPsd(signal, 0, 1, n, rate_hz, seg);
    first ??= p;
    const total = totalPower(p);
    const band = bandPower(p, SICKNESS_BAND_HZ.low, SICKNESS_BAND_HZ.high);
    axes[axis] = {
      seat: seatName,
      totalPower_mps2sq: sig(total),
      bandPower_mps2sq: sig(band),
      bandShare: total > 0 ? sig(band / total) : 0,
      psd: Array.from(p.psd, sig),
    };
  });
  const p = first as WelchPsd;
  return {
    method:
      'Welch: periodic Hann window, 50 % overlap, segment mean removed, one-sided; PSD summed over the bins times df_hz equals the variance',
    unit: '(m/s^2)^2/Hz',
    rate_hz,
    segment_n: p.segment_n,
    segments: p.segments,
    df_hz: p.df_hz,
    band: {
      low_hz: SICKNESS_BAND_HZ.low,
      high_hz: SICKNESS_BAND_HZ.high,
      note: 'The band where motion sickness is most provoked; bin k lies at k * df_hz.',
    },
    axes,
  };
}

/** Rounds to 6 significant digits for files people read; exact zero stays zero. */
export function sig(v: number): number {
  return v === 0 ? 0 : Number(v.toPrecision(6));
}

/** Ratio rounded to 4 decimals, never rounded up to 1 when it is below 1 (that would read as a breach). */
function ratio4(r: number): number {
  const x = Math.round(r * 1e4) / 1e4;
  return r < 1 && x >= 1 ? 0.9999 : x;
}

const time4 = (t: number) => Math.round(t * 1e4) / 1e4;

/** The findings JSON of docs/motion-conventions.md section 7, rounded for reading, plus the comfort summary and notes. */
export function findingsForJson(check: CheckResult, notes: readonly string[] = []): CheckResult {
  const out: CheckResult = {
    within: check.within,
    findings: check.findings.map((f) => ({
      ...f,
      start_s: time4(f.start_s),
      end_s: time4(f.end_s),
      value: sig(f.value),
      limit: sig(f.limit),
      ratio: ratio4(f.ratio),
    })),
    uses: check.uses.map((u) => ({ ...u, ratio: ratio4(u.ratio) })),
  };
  if (check.comfort) {
    const c = check.comfort;
    out.comfort = {
      ...c,
      wrms_mps2: { x: sig(c.wrms_mps2.x), y: sig(c.wrms_mps2.y), z: sig(c.wrms_mps2.z) },
      vdv_mps1_75: { x: sig(c.vdv_mps1_75.x), y: sig(c.vdv_mps1_75.y), z: sig(c.vdv_mps1_75.z) },
      ...(c.crestFactor
        ? { crestFactor: { x: sig(c.crestFactor.x), y: sig(c.crestFactor.y), z: sig(c.crestFactor.z) } }
        : {}),
      ...(c.mtvv_mps2
        ? { mtvv_mps2: { x: sig(c.mtvv_mps2.x), y: sig(c.mtvv_mps2.y), z: sig(c.mtvv_mps2.z) } }
        : {}),
      msdvZ_mps1_5: sig(c.msdvZ_mps1_5),
      vomitShare_pct: sig(c.vomitShare_pct),
    };
  }
  if (notes.length > 0) out.notes = [...notes];
  return out;
}
