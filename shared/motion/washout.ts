// Classical washout (Reid and Nahon, UTIAS reports 1985-86; Nahon and Reid 1990) over a whole track,
// docs/motion-conventions.md section 4. Channels run one after another over Float64Arrays at the processing rate:
//   scale + soft limit -> translational high-pass -> double integration -> position
//   scaled surge/sway -> low-pass -> tilt (asin, angle limit, smooth rate and acceleration limit)
//   scaled angular velocity -> high-pass -> Euler rates -> integration, plus tilt -> angles
// and a final soft limit keeps every pose offset inside the profile's poseLimit.
//
// Simplification: the translational demand is the scaled specific force minus gravity in vehicle
// axes, not rotated by the platform attitude as in Reid and Nahon's full form (where the tilt's own
// gravity component also feeds the translational channel and cancels part of the low-frequency
// demand). The high-pass removes the sustained part either way; this form keeps the channels
// independent and a level vehicle at rest exactly at neutral.
// Rotations are about the platform origin, as the pose offsets are; the rider reference point of the
// profile is where the felt specific force is computed (diagnostics), so lever-arm effects of the
// rotations show there rather than being cancelled by extra translation, which would spend stroke.
// Integration is trapezoidal, which is the bilinear map of 1/s, so it matches the filters' discretisation.
// Every filter starts in steady state at the first sample, so the platform starts at neutral even
// when a track starts mid-motion.

import type { CueingProfile } from '../schemas/cueing-profile';
import type { FilterCascade } from './filters';
import {
  FilterDesignError,
  filterInto,
  highPass1,
  highPass2,
  highPass3,
  lowPass2,
  steadyState,
} from './filters';
import { bodyOmegaToEulerRatesInto } from './rotation';
import type { PoseOffsetTrack, SeatForce } from './seat-force';
import { seatSpecificForce } from './seat-force';
import { G0_MPS2, RAD_PER_DEG } from './units';
import type { StageCache } from './stage-cache';
import { NO_STAGE_CACHE, reuseArray, sectionKey as key } from './stage-cache';

/** A vehicle track at a uniform rate: specific force (m/s^2) and angular velocity (rad/s), vehicle body axes. */
export interface VehicleTrack {
  rate_hz: number;
  fx_mps2: Float64Array;
  fy_mps2: Float64Array;
  fz_mps2: Float64Array;
  wx_radps: Float64Array;
  wy_radps: Float64Array;
  wz_radps: Float64Array;
}

/** Intermediate signals of a cueing run, for review plots and tests. */
export interface CueDiagnostics {
  /** Scaled and limited specific force, m/s^2, vehicle axes (z includes +g0 at rest). */
  scaledForce_mps2: SeatForce;
  /** Scaled and limited angular velocity, rad/s. */
  scaledOmega_radps: SeatForce;
  /** High-passed translational demand (specific force minus gravity), m/s^2. */
  highPassedForce_mps2: SeatForce;
  /** Tilt-coordination angles after angle and rate limits, rad. */
  tiltRoll_rad: Float64Array;
  tiltPitch_rad: Float64Array;
  /** Specific force the rider feels at the profile's rider reference point, m/s^2, platform axes (computed when first read). */
  riderForce_mps2: SeatForce;
}

/** Pose offsets from neutral at the processing rate, plus diagnostics. */
export interface CueResult {
  pose: PoseOffsetTrack;
  diagnostics: CueDiagnostics;
}

/** A cueing failure that names the profile field or the track column at fault. */
export class CueingError extends Error {
  override name = 'CueingError';
}

/**
 * Smooth limiter: exactly linear for |x| <= knee * limit, then a tanh bend that approaches but never
 * exceeds `limit`; continuous with slope 1 at the knee. Unit of x.
 */
export function softLimit(x: number, limit: number, knee: number): number {
  const k = knee * limit;
  const a = Math.abs(x);
  if (a <= k) return x;
  const span = limit - k;
  const y = Math.min(k + span * Math.tanh((a - k) / span), limit);
  return x < 0 ? -y : y;
}

const TWO_PI = 2 * Math.PI;
// Module-local copies: live import bindings can compile to property reads in hot loops.
const G0 = G0_MPS2;
const RAD = RAD_PER_DEG;

function design(field: string, make: () => FilterCascade): FilterCascade {
  try {
    return make();
  } catch (e) {
    if (e instanceof FilterDesignError) throw new CueingError(`cueing profile field ${field}: ${e.message}`);
    throw e;
  }
}

type Axis = 'x' | 'y' | 'z';

function translationalFilter(profile: CueingProfile, axis: Axis, rate_hz: number): FilterCascade {
  const p = profile.translational[axis];
  const base = `translational.${axis}`;
  const f = p.naturalFrequency_radps / TWO_PI;
  if (p.order === 2) return design(`${base}.naturalFrequency_radps`, () => highPass2(f, p.damping, rate_hz));
  design(`${base}.breakFrequency_radps`, () => highPass1(p.breakFrequency_radps / TWO_PI, rate_hz));
  return design(`${base}.naturalFrequency_radps`, () =>
    highPass3(f, p.damping, p.breakFrequency_radps / TWO_PI, rate_hz),
  );
}

function rotationalFilter(profile: CueingProfile, axis: Axis, rate_hz: number): FilterCascade {
  const p = profile.rotational[axis];
  const field = `rotational.${axis}.frequency_radps`;
  const f = p.frequency_radps / TWO_PI;
  return p.order === 1
    ? design(field, () => highPass1(f, rate_hz))
    : design(field, () => highPass2(f, p.damping, rate_hz));
}

function runFrom(cascade: FilterCascade, input: Float64Array, previous?: Float64Array): Float64Array {
  const out = reuseArray(previous, input.length);
  const state = input.length > 0 ? steadyState(cascade, input[0] as number) : undefined;
  filterInto(cascade, input, out, state);
  return out;
}

function checkTrack(v: VehicleTrack): number {
  if (!(v.rate_hz > 0) || !Number.isFinite(v.rate_hz)) {
    throw new CueingError(`processing rate must be a positive number of Hz, got ${v.rate_hz}`);
  }
  const n = v.fx_mps2.length;
  const cols = ['fx_mps2', 'fy_mps2', 'fz_mps2', 'wx_radps', 'wy_radps', 'wz_radps'] as const;
  for (const c of cols) {
    const a = v[c];
    if (a.length !== n)
      throw new CueingError(`vehicle column ${c} has ${a.length} samples, fx_mps2 has ${n}`);
    for (let i = 0; i < n; i++) {
      if (!Number.isFinite(a[i])) {
        throw new CueingError(
          `vehicle column ${c}, sample ${i} (t = ${(i / v.rate_hz).toFixed(4)} s): not a finite number`,
        );
      }
    }
  }
  return n;
}

/**
 * Classical washout of a vehicle track (vehicle axes, SI) into platform pose offsets from neutral at the
 * same rate. With a cache (one per vehicle track), the stages (scaling per axis, each translational
 * axis, tilt coordination, the rotational channel) whose inputs are unchanged since the previous call
 * are reused rather than run again, and those run again write into their previous arrays; the result
 * is the same either way. The arrays of a result given with a cache belong to the cache: read them,
 * never write into them, and do not keep them past the next call with the same cache.
 */
export function cueClassical(vehicle: VehicleTrack, profile: CueingProfile, cache?: StageCache): CueResult {
  const c = cache ?? NO_STAGE_CACHE;
  const n = c.stage(
    'check',
    [
      vehicle.fx_mps2,
      vehicle.fy_mps2,
      vehicle.fz_mps2,
      vehicle.wx_radps,
      vehicle.wy_radps,
      vehicle.wz_radps,
      vehicle.rate_hz,
    ],
    () => checkTrack(vehicle),
  );
  const rate = vehicle.rate_hz;
  const dt = 1 / rate;
  const halfDt = 0.5 * dt;

  // Every filter is designed first, so a bad field is named whatever the cache holds.
  const hpX = translationalFilter(profile, 'x', rate);
  const hpY = translationalFilter(profile, 'y', rate);
  const hpZ = translationalFilter(profile, 'z', rate);
  const tiltF = profile.tilt.lowPassFrequency_radps / TWO_PI;
  const lp = design('tilt.lowPassFrequency_radps', () => lowPass2(tiltF, profile.tilt.damping, rate));
  const hpRoll = rotationalFilter(profile, 'x', rate);
  const hpPitch = rotationalFilter(profile, 'y', rate);
  const hpYaw = rotationalFilter(profile, 'z', rate);

  // 1. Scale and limit. The z channel works on the deviation from rest so that a level vehicle at
  // rest (fz = g0) gives exactly zero demand whatever the heave gain.
  const s = profile.scale;
  const fl = profile.inputLimit.specificForce_mps2;
  const wl = profile.inputLimit.angularRate_radps;
  const scaleOne = (
    col: Float64Array,
    gain: number,
    offset: number,
    limit: { limit: number; knee: number },
    previous: Float64Array | undefined,
  ) => {
    const out = reuseArray(previous, n);
    for (let i = 0; i < n; i++)
      out[i] = softLimit(gain * ((col[i] as number) - offset), limit.limit, limit.knee);
    return out;
  };
  // x - 0 is x exactly, so the axes without an offset scale as gain * x.
  const sx = c.stage<Float64Array>('scale.x', [vehicle.fx_mps2, s.surge, key(fl)], (prev) =>
    scaleOne(vehicle.fx_mps2, s.surge, 0, fl, prev),
  );
  const sy = c.stage<Float64Array>('scale.y', [vehicle.fy_mps2, s.sway, key(fl)], (prev) =>
    scaleOne(vehicle.fy_mps2, s.sway, 0, fl, prev),
  );
  // deviation from rest: translational demand along z
  const sz = c.stage<Float64Array>('scale.z', [vehicle.fz_mps2, s.heave, key(fl)], (prev) =>
    scaleOne(vehicle.fz_mps2, s.heave, G0, fl, prev),
  );
  const sp = c.stage<Float64Array>('scale.roll', [vehicle.wx_radps, s.roll, key(wl)], (prev) =>
    scaleOne(vehicle.wx_radps, s.roll, 0, wl, prev),
  );
  const sq = c.stage<Float64Array>('scale.pitch', [vehicle.wy_radps, s.pitch, key(wl)], (prev) =>
    scaleOne(vehicle.wy_radps, s.pitch, 0, wl, prev),
  );
  const sr = c.stage<Float64Array>('scale.yaw', [vehicle.wz_radps, s.yaw, key(wl)], (prev) =>
    scaleOne(vehicle.wz_radps, s.yaw, 0, wl, prev),
  );

  // 2. Translational channel: high-pass, integrate twice, soft-limit.
  const lim = profile.poseLimit;
  const translate = (axis: Axis, scaled: Float64Array, hpf: FilterCascade, limit_m: number) =>
    c.stage(
      `translational.${axis}`,
      [scaled, rate, key(profile.translational[axis]), limit_m, lim.knee],
      (prev: { h: Float64Array; p: Float64Array } | undefined) => {
        const h = runFrom(hpf, scaled, prev?.h);
        return { h, p: integrateTwiceLimited(h, halfDt, limit_m, lim.knee, prev?.p) };
      },
    );
  const tx = translate('x', sx, hpX, lim.x_m);
  const ty = translate('y', sy, hpY, lim.y_m);
  const tz = translate('z', sz, hpZ, lim.z_m);

  // 3. Tilt coordination on the low-passed surge and sway force: pitch from surge, roll from sway, each
  // in two stages (the low-pass, then the angle and its limits) so a change of a limit keeps the low-pass.
  const tilt = profile.tilt;
  const lowPassKey = key({ f: tilt.lowPassFrequency_radps, d: tilt.damping });
  const lx = c.stage<Float64Array>('tilt.lowPass.x', [sx, rate, lowPassKey], (prev) => runFrom(lp, sx, prev));
  const ly = c.stage<Float64Array>('tilt.lowPass.y', [sy, rate, lowPassKey], (prev) => runFrom(lp, sy, prev));
  const tiltMax = tilt.angleLimit_deg * RAD;
  const limits = { rate: tilt.rateLimit_degps * RAD, accel: tilt.accelLimit_degps2 * RAD };
  const limitKey = key(tilt);
  type Tilt = { command: Float64Array; angle: Float64Array };
  // pitch = -asin(f_x,lp / g0), roll = asin(f_y,lp / g0), clamped to the angle limit.
  const tiltOf = (axis: 'pitch' | 'roll', lowPassed: Float64Array, sign: 1 | -1) =>
    c.stage(`tilt.${axis}`, [lowPassed, rate, limitKey], (prev: Tilt | undefined) => {
      const command = reuseArray(prev?.command, n);
      const angle = reuseArray(prev?.angle, n);
      for (let i = 0; i < n; i++) {
        const a = Math.asin(clamp((lowPassed[i] as number) / G0, -1, 1));
        command[i] = clamp(sign < 0 ? -a : a, -tiltMax, tiltMax);
      }
      smoothTiltInto(command, dt, limits, angle);
      return { command, angle };
    });
  const tiltPitch = tiltOf('pitch', lx, -1).angle;
  const tiltRoll = tiltOf('roll', ly, 1).angle;

  // 4. Rotational channel: high-pass the body rates, turn them into Euler rates at the platform's
  // current (limited, hence far from the pitch singularity) attitude, integrate, add the tilt.
  const rotKey = key(profile.rotational);
  const hp = c.stage<Float64Array>('rotational.highPass.x', [sp, rate, rotKey], (prev) =>
    runFrom(hpRoll, sp, prev),
  );
  const hq = c.stage<Float64Array>('rotational.highPass.y', [sq, rate, rotKey], (prev) =>
    runFrom(hpPitch, sq, prev),
  );
  const hr = c.stage<Float64Array>('rotational.highPass.z', [sr, rate, rotKey], (prev) =>
    runFrom(hpYaw, sr, prev),
  );
  const rotInputs = [
    hp,
    hq,
    hr,
    tiltRoll,
    tiltPitch,
    rate,
    lim.roll_deg,
    lim.pitch_deg,
    lim.yaw_deg,
    lim.knee,
  ];
  type Rotational = Record<'roll' | 'pitch' | 'yaw', Float64Array>;
  const { roll, pitch, yaw } = c.stage('rotational', rotInputs, (prev: Rotational | undefined) => {
    const roll = reuseArray(prev?.roll, n);
    const pitch = reuseArray(prev?.pitch, n);
    const yaw = reuseArray(prev?.yaw, n);
    const rollMax = lim.roll_deg * RAD;
    const pitchMax = lim.pitch_deg * RAD;
    const yawMax = lim.yaw_deg * RAD;
    const rates = new Float64Array(3);
    let aRoll = 0;
    let aPitch = 0;
    let aYaw = 0;
    let prevRoll = 0;
    let prevPitch = 0;
    let prevYaw = 0;
    let outRoll = 0;
    let outPitch = 0;
    for (let i = 0; i < n; i++) {
      bodyOmegaToEulerRatesInto(outRoll, outPitch, hp[i] as number, hq[i] as number, hr[i] as number, rates);
      const dRoll = rates[0] as number;
      const dPitch = rates[1] as number;
      const dYaw = rates[2] as number;
      if (i > 0) {
        aRoll += halfDt * (prevRoll + dRoll);
        aPitch += halfDt * (prevPitch + dPitch);
        aYaw += halfDt * (prevYaw + dYaw);
      }
      prevRoll = dRoll;
      prevPitch = dPitch;
      prevYaw = dYaw;
      outRoll = softLimit(aRoll + (tiltRoll[i] as number), rollMax, lim.knee);
      outPitch = softLimit(aPitch + (tiltPitch[i] as number), pitchMax, lim.knee);
      roll[i] = outRoll;
      pitch[i] = outPitch;
      yaw[i] = softLimit(aYaw, yawMax, lim.knee);
    }
    return { roll, pitch, yaw };
  });

  const pose: PoseOffsetTrack = {
    rate_hz: rate,
    x_m: tx.p,
    y_m: ty.p,
    z_m: tz.p,
    roll_rad: roll,
    pitch_rad: pitch,
    yaw_rad: yaw,
  };
  const ref = profile.riderReference_m;
  // The scaled vertical force and the felt force at the rider reference are diagnostics the pipeline
  // does not read; they are computed when first read (the felt force needs the platform's whole motion,
  // about as much work as the washout itself).
  let scaledZ: Float64Array | undefined;
  let riderForce: SeatForce | undefined;
  return {
    pose,
    diagnostics: {
      scaledForce_mps2: {
        x: sx,
        y: sy,
        get z(): Float64Array {
          if (!scaledZ) {
            scaledZ = new Float64Array(n);
            for (let i = 0; i < n; i++) scaledZ[i] = (sz[i] as number) + G0;
          }
          return scaledZ;
        },
      },
      scaledOmega_radps: { x: sp, y: sq, z: sr },
      highPassedForce_mps2: { x: tx.h, y: ty.h, z: tz.h },
      tiltRoll_rad: tiltRoll,
      tiltPitch_rad: tiltPitch,
      get riderForce_mps2(): SeatForce {
        riderForce ??= seatSpecificForce(pose, [ref[0], ref[1], ref[2]]);
        return riderForce;
      },
    },
  };
}

/** Knee of the tilt limiter's soft limits: linear (exact tracking) below 0.8 of each limit. */
const TILT_KNEE = 0.8;

/**
 * Tilt that follows a commanded angle (rad) with its rate and angular acceleration smoothly limited:
 * the wanted rate is the command's own rate plus a correction kp (command - tilt), soft-limited to the
 * rate limit; the angular acceleration that would reach it in one step is soft-limited to the
 * acceleration limit and integrated. Below the knees the tilt equals the command exactly; above them
 * the rate approaches its limit without a step and never passes it. kp = a_max / (2 w_max) keeps the
 * deceleration toward the command inside the linear range, so the tilt does not overshoot. Starts at
 * neutral, at rest. A hard clamp on the rate instead steps it each time the clamp engages or lets go,
 * an angular acceleration impulse that grows with the processing rate.
 */
export function smoothTiltInto(
  command: Float64Array,
  dt: number,
  limits: { rate: number; accel: number },
  out: Float64Array,
): void {
  const n = command.length;
  const kp = limits.accel / (2 * limits.rate);
  let angle = 0;
  let rate = 0;
  for (let i = 0; i < n; i++) {
    out[i] = angle;
    const c = command[i] as number;
    const next = i + 1 < n ? (command[i + 1] as number) : c;
    const wanted = softLimit((next - c) / dt + kp * (c - angle), limits.rate, TILT_KNEE);
    const accel = softLimit((wanted - rate) / dt, limits.accel, TILT_KNEE);
    rate += accel * dt;
    angle += rate * dt;
  }
}

function clamp(v: number, lo: number, hi: number): number {
  return v < lo ? lo : v > hi ? hi : v;
}

/** Trapezoidal double integral of an acceleration from rest, then the soft position limit (m). */
function integrateTwiceLimited(
  a: Float64Array,
  halfDt: number,
  limit_m: number,
  knee: number,
  previous?: Float64Array,
): Float64Array {
  const n = a.length;
  const out = reuseArray(previous, n);
  if (n > 0) out[0] = 0;
  let v = 0;
  let p = 0;
  let prevA = n > 0 ? (a[0] as number) : 0;
  let prevV = 0;
  for (let i = 1; i < n; i++) {
    const ai = a[i] as number;
    v += halfDt * (prevA + ai);
    p += halfDt * (prevV + v);
    prevA = ai;
    prevV = v;
    out[i] = softLimit(p, limit_m, knee);
  }
  return out;
}
