// Specific force felt at a seat (docs/motion-conventions.md section 5):
//   f_seat = R^T (a_O + alpha x (R r) + w x (w x (R r)) - g),  g = (0, 0, -g0),
// with a_O, w and alpha taken from a uniformly sampled pose track by exact differentiation of its
// band-limited interpolant (band-limit.ts: the sinc's derivatives, windowed, with the track continued
// past both ends by linear prediction), so a sinusoid up to 0.4 x the rate keeps its true amplitude in
// the middle and at the ends alike. w is the base-frame angular velocity from the Euler angle rates.

import { bandLimitedDerivatives3Into, differentiator } from './band-limit';
import type { PoseColumns } from './hexapod';
import { rotationFromTrigInto } from './rotation';
import { G0_MPS2 } from './units';

// A module-local copy: live import bindings can compile to property reads in hot loops.
const G0 = G0_MPS2;

/** Pose offsets from neutral at a uniform rate (docs/motion-conventions.md section 1); h0 is constant, so it drops out of every derivative. */
export interface PoseOffsetTrack extends PoseColumns {
  rate_hz: number;
}

/** Platform motion derived from a pose track; every array is sample-major (9 or 3 values per sample). */
export interface PlatformMotion {
  length: number;
  rate_hz: number;
  /** R = Rz Ry Rx per sample, row-major, platform to base. */
  rotation: Float64Array;
  /** Acceleration of the platform origin in the base frame, m/s^2. */
  accel_mps2: Float64Array;
  /** Angular velocity in the base frame, rad/s. */
  omega_radps: Float64Array;
  /** Angular acceleration in the base frame, rad/s^2. */
  alpha_radps2: Float64Array;
}

/** Specific force components at a seat, platform (seat) axes, m/s^2. */
export interface SeatForce {
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
}

/** Checks the rate of a pose track; throws naming it when it is not a positive number of Hz. */
function checkRate(rate: number): void {
  if (!(rate > 0) || !Number.isFinite(rate)) {
    throw new RangeError(`pose rate must be a positive number of Hz, got ${rate}`);
  }
}

/** Checks pose columns against length n; throws naming the column and sample at fault. */
function checkColumns(pose: Partial<PoseColumns>, keys: readonly (keyof PoseColumns)[], n: number): void {
  for (const key of keys) {
    const col = pose[key] as Float64Array;
    if (col.length !== n) throw new RangeError(`pose column ${key} has ${col.length} samples, x_m has ${n}`);
    for (let i = 0; i < n; i++) {
      if (!Number.isFinite(col[i]))
        throw new RangeError(`pose column ${key}, sample ${i}: not a finite number`);
    }
  }
}

function checkSeat(seat_m: readonly number[]): void {
  if (seat_m.length !== 3 || !seat_m.every(Number.isFinite)) {
    throw new RangeError(`seat point must be three finite numbers in metres, got [${seat_m.join(', ')}]`);
  }
}

/** The rotational part of PlatformMotion, which depends on the three angles only. */
export type PlatformRotation = Pick<PlatformMotion, 'rotation' | 'omega_radps' | 'alpha_radps2'>;

/** Acceleration of the platform origin (m/s^2, base frame, 3 per sample) from the position columns. */
export function platformAcceleration(
  pose: Pick<PoseOffsetTrack, 'rate_hz' | 'x_m' | 'y_m' | 'z_m'>,
  previous?: Float64Array,
): Float64Array {
  checkRate(pose.rate_hz);
  const n = pose.x_m.length;
  checkColumns(pose, ['x_m', 'y_m', 'z_m'], n);
  const accel = previous?.length === 3 * n ? previous : new Float64Array(3 * n);
  bandLimitedDerivatives3Into(differentiator(pose.rate_hz), pose.x_m, pose.y_m, pose.z_m, null, accel);
  return accel;
}

/**
 * Rotation matrices, angular velocity (rad/s) and angular acceleration (rad/s^2), base frame, from the
 * angle columns; n is the track's length (that of x_m). A `previous` result of the same length is
 * written over (as is `previous` of platformAcceleration).
 */
export function platformRotation(
  pose: Pick<PoseOffsetTrack, 'rate_hz' | 'roll_rad' | 'pitch_rad' | 'yaw_rad'>,
  n: number = pose.roll_rad.length,
  previous?: PlatformRotation,
): PlatformRotation {
  checkRate(pose.rate_hz);
  checkColumns(pose, ['roll_rad', 'pitch_rad', 'yaw_rad'], n);
  // Every value is written below, so a previous result of this length can take the new one.
  const fits = previous?.rotation.length === 9 * n;
  const rotation = fits ? previous.rotation : new Float64Array(9 * n);
  const omega = fits ? previous.omega_radps : new Float64Array(3 * n);
  const alpha = fits ? previous.alpha_radps2 : new Float64Array(3 * n);
  const D = differentiator(pose.rate_hz);
  // Angle rates go into omega and angle accelerations into alpha as scratch; each sample then turns
  // them into w = E rates and alpha = dE/dt rates + E accels (E as in eulerRateToBaseOmegaInto), so
  // alpha needs no derivative of a derivative.
  bandLimitedDerivatives3Into(D, pose.roll_rad, pose.pitch_rad, pose.yaw_rad, omega, alpha);
  const rollCol = pose.roll_rad;
  const pitchCol = pose.pitch_rad;
  const yawCol = pose.yaw_rad;
  for (let i = 0; i < n; i++) {
    const roll = rollCol[i] as number;
    const pitch = pitchCol[i] as number;
    const yaw = yawCol[i] as number;
    const cp = Math.cos(pitch);
    const sp = Math.sin(pitch);
    const cy = Math.cos(yaw);
    const sy = Math.sin(yaw);
    rotationFromTrigInto(Math.cos(roll), Math.sin(roll), cp, sp, cy, sy, rotation, 9 * i);
    const o = 3 * i;
    const dr = omega[o] as number;
    const dp = omega[o + 1] as number;
    const dy = omega[o + 2] as number;
    const ddr = alpha[o] as number;
    const ddp = alpha[o + 1] as number;
    const ddy = alpha[o + 2] as number;
    omega[o] = cy * cp * dr - sy * dp;
    omega[o + 1] = sy * cp * dr + cy * dp;
    omega[o + 2] = -sp * dr + dy;
    alpha[o] = (-sy * cp * dy - cy * sp * dp) * dr - cy * dy * dp + cy * cp * ddr - sy * ddp;
    alpha[o + 1] = (cy * cp * dy - sy * sp * dp) * dr - sy * dy * dp + sy * cp * ddr + cy * ddp;
    alpha[o + 2] = -cp * dp * dr - sp * ddr + ddy;
  }
  return { rotation, omega_radps: omega, alpha_radps2: alpha };
}

/**
 * Rotation, origin acceleration (m/s^2), angular velocity (rad/s) and angular acceleration (rad/s^2),
 * base frame, from a pose track: platformAcceleration and platformRotation.
 */
export function platformMotion(pose: PoseOffsetTrack): PlatformMotion {
  const n = pose.x_m.length;
  checkRate(pose.rate_hz);
  const accel = platformAcceleration(pose);
  const rot = platformRotation(pose, n);
  return { length: n, rate_hz: pose.rate_hz, accel_mps2: accel, ...rot };
}

/** Specific force (m/s^2, platform axes) at seat point seat_m (platform frame, m) from derived platform motion. */
export function seatForceFromMotion(
  motion: PlatformMotion,
  seat_m: readonly [number, number, number],
  out?: SeatForce,
): SeatForce {
  const n = motion.length;
  checkSeat(seat_m);
  if (out && (out.x.length < n || out.y.length < n || out.z.length < n)) {
    throw new RangeError(`seatForceFromMotion: output columns shorter than the ${n} samples`);
  }
  const fx = out?.x ?? new Float64Array(n);
  const fy = out?.y ?? new Float64Array(n);
  const fz = out?.z ?? new Float64Array(n);
  const [rx, ry, rz] = seat_m;
  const R = motion.rotation;
  const A = motion.accel_mps2;
  const W = motion.omega_radps;
  const AL = motion.alpha_radps2;
  for (let i = 0; i < n; i++) {
    const m = 9 * i;
    const o = 3 * i;
    const r00 = R[m] as number;
    const r01 = R[m + 1] as number;
    const r02 = R[m + 2] as number;
    const r10 = R[m + 3] as number;
    const r11 = R[m + 4] as number;
    const r12 = R[m + 5] as number;
    const r20 = R[m + 6] as number;
    const r21 = R[m + 7] as number;
    const r22 = R[m + 8] as number;
    // p = R r: the seat's offset from the platform origin in base axes.
    const px = r00 * rx + r01 * ry + r02 * rz;
    const py = r10 * rx + r11 * ry + r12 * rz;
    const pz = r20 * rx + r21 * ry + r22 * rz;
    const wx = W[o] as number;
    const wy = W[o + 1] as number;
    const wz = W[o + 2] as number;
    const ax = AL[o] as number;
    const ay = AL[o + 1] as number;
    const az = AL[o + 2] as number;
    // w x p, then w x (w x p) and alpha x p.
    const cx = wy * pz - wz * py;
    const cy = wz * px - wx * pz;
    const cz = wx * py - wy * px;
    const bx = (A[o] as number) + (ay * pz - az * py) + (wy * cz - wz * cy);
    const by = (A[o + 1] as number) + (az * px - ax * pz) + (wz * cx - wx * cz);
    const bz = (A[o + 2] as number) + (ax * py - ay * px) + (wx * cy - wy * cx) + G0;
    fx[i] = r00 * bx + r10 * by + r20 * bz;
    fy[i] = r01 * bx + r11 * by + r21 * bz;
    fz[i] = r02 * bx + r12 * by + r22 * bz;
  }
  return { x: fx, y: fy, z: fz };
}

/**
 * Specific force (m/s^2, platform axes) at one seat point seat_m (platform frame, m) along a pose track:
 * platformMotion then seatForceFromMotion.
 */
export function seatSpecificForce(
  pose: PoseOffsetTrack,
  seat_m: readonly [number, number, number],
): SeatForce {
  checkSeat(seat_m);
  return seatForceFromMotion(platformMotion(pose), seat_m);
}
