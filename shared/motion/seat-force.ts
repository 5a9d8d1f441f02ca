// Specific force felt at a seat (docs/motion-conventions.md section 5):
//   f_seat = R^T (a_O + alpha x (R r) + w x (w x (R r)) - g),  g = (0, 0, -g0),
// with a_O, w and alpha taken from a uniformly sampled pose track by finite differences: central
// differences inside the track and second-order one-sided differences at its two ends, so the error
// is O(dt^2) everywhere. w is the base-frame angular velocity from the Euler angle rates.

import type { PoseColumns } from './hexapod';
import { rotationInto } from './rotation';
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

/** d/dt of a uniformly sampled signal into out[i*stride + offset] (unit of src per second). */
function firstDerivative(
  src: Float64Array,
  rate_hz: number,
  out: Float64Array,
  stride: number,
  offset: number,
): void {
  const n = src.length;
  if (n < 2) {
    for (let i = 0; i < n; i++) out[i * stride + offset] = 0;
    return;
  }
  if (n === 2) {
    const d = ((src[1] as number) - (src[0] as number)) * rate_hz;
    out[offset] = d;
    out[stride + offset] = d;
    return;
  }
  const h = 0.5 * rate_hz;
  out[offset] = (-3 * (src[0] as number) + 4 * (src[1] as number) - (src[2] as number)) * h;
  for (let i = 1; i < n - 1; i++)
    out[i * stride + offset] = ((src[i + 1] as number) - (src[i - 1] as number)) * h;
  out[(n - 1) * stride + offset] =
    (3 * (src[n - 1] as number) - 4 * (src[n - 2] as number) + (src[n - 3] as number)) * h;
}

/** d^2/dt^2 of a uniformly sampled signal into out[i*stride + offset]. */
function secondDerivative(
  src: Float64Array,
  rate_hz: number,
  out: Float64Array,
  stride: number,
  offset: number,
): void {
  const n = src.length;
  const r2 = rate_hz * rate_hz;
  if (n < 3) {
    for (let i = 0; i < n; i++) out[i * stride + offset] = 0;
    return;
  }
  for (let i = 1; i < n - 1; i++) {
    out[i * stride + offset] =
      ((src[i + 1] as number) - 2 * (src[i] as number) + (src[i - 1] as number)) * r2;
  }
  if (n === 3) {
    out[offset] = out[stride + offset] as number;
    out[2 * stride + offset] = out[stride + offset] as number;
    return;
  }
  out[offset] =
    (2 * (src[0] as number) - 5 * (src[1] as number) + 4 * (src[2] as number) - (src[3] as number)) * r2;
  out[(n - 1) * stride + offset] =
    (2 * (src[n - 1] as number) -
      5 * (src[n - 2] as number) +
      4 * (src[n - 3] as number) -
      (src[n - 4] as number)) *
    r2;
}

/** Validates a pose track and returns its length; throws naming the column and sample at fault. */
function checkPose(pose: PoseOffsetTrack): number {
  const n = pose.x_m.length;
  const rate = pose.rate_hz;
  if (!(rate > 0) || !Number.isFinite(rate)) {
    throw new RangeError(`pose rate must be a positive number of Hz, got ${rate}`);
  }
  for (const key of ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const) {
    const col = pose[key];
    if (col.length !== n) throw new RangeError(`pose column ${key} has ${col.length} samples, x_m has ${n}`);
    for (let i = 0; i < n; i++) {
      if (!Number.isFinite(col[i]))
        throw new RangeError(`pose column ${key}, sample ${i}: not a finite number`);
    }
  }
  return n;
}

function checkSeat(seat_m: readonly number[]): void {
  if (seat_m.length !== 3 || !seat_m.every(Number.isFinite)) {
    throw new RangeError(`seat point must be three finite numbers in metres, got [${seat_m.join(', ')}]`);
  }
}

/** Rotation, origin acceleration (m/s^2), angular velocity (rad/s) and angular acceleration (rad/s^2), base frame, from a pose track. */
export function platformMotion(pose: PoseOffsetTrack): PlatformMotion {
  const n = checkPose(pose);
  const rate = pose.rate_hz;
  const rotation = new Float64Array(9 * n);
  const accel = new Float64Array(3 * n);
  const omega = new Float64Array(3 * n);
  const alpha = new Float64Array(3 * n);
  secondDerivative(pose.x_m, rate, accel, 3, 0);
  secondDerivative(pose.y_m, rate, accel, 3, 1);
  secondDerivative(pose.z_m, rate, accel, 3, 2);
  // Angle rates go into omega and angle accelerations into alpha as scratch; each sample then turns
  // them into w = E rates and alpha = dE/dt rates + E accels (E as in eulerRateToBaseOmegaInto), so
  // alpha needs no difference of differences and keeps O(dt^2) accuracy right up to the ends.
  firstDerivative(pose.roll_rad, rate, omega, 3, 0);
  firstDerivative(pose.pitch_rad, rate, omega, 3, 1);
  firstDerivative(pose.yaw_rad, rate, omega, 3, 2);
  secondDerivative(pose.roll_rad, rate, alpha, 3, 0);
  secondDerivative(pose.pitch_rad, rate, alpha, 3, 1);
  secondDerivative(pose.yaw_rad, rate, alpha, 3, 2);
  for (let i = 0; i < n; i++) {
    const pitch = pose.pitch_rad[i] as number;
    const yaw = pose.yaw_rad[i] as number;
    rotationInto(pose.roll_rad[i] as number, pitch, yaw, rotation, 9 * i);
    const cp = Math.cos(pitch);
    const sp = Math.sin(pitch);
    const cy = Math.cos(yaw);
    const sy = Math.sin(yaw);
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
  return { length: n, rate_hz: rate, rotation, accel_mps2: accel, omega_radps: omega, alpha_radps2: alpha };
}

/** Specific force (m/s^2, platform axes) at seat point seat_m (platform frame, m) from derived platform motion. */
export function seatForceFromMotion(
  motion: PlatformMotion,
  seat_m: readonly [number, number, number],
): SeatForce {
  const n = motion.length;
  checkSeat(seat_m);
  const fx = new Float64Array(n);
  const fy = new Float64Array(n);
  const fz = new Float64Array(n);
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

/** d/dt of a[i] on the uniform grid: the same differences as firstDerivative, one sample at a time. */
function d1At(a: Float64Array, i: number, n: number, halfRate: number): number {
  if (n < 2) return 0;
  if (n === 2) return ((a[1] as number) - (a[0] as number)) * 2 * halfRate;
  if (i === 0) return (-3 * (a[0] as number) + 4 * (a[1] as number) - (a[2] as number)) * halfRate;
  if (i === n - 1)
    return (3 * (a[n - 1] as number) - 4 * (a[n - 2] as number) + (a[n - 3] as number)) * halfRate;
  return ((a[i + 1] as number) - (a[i - 1] as number)) * halfRate;
}

/** d^2/dt^2 of a[i] on the uniform grid: the same differences as secondDerivative, one sample at a time. */
function d2At(a: Float64Array, i: number, n: number, r2: number): number {
  if (n < 3) return 0;
  if (n === 3 || (i > 0 && i < n - 1)) {
    const k = i === 0 ? 1 : i === n - 1 ? n - 2 : i;
    return ((a[k + 1] as number) - 2 * (a[k] as number) + (a[k - 1] as number)) * r2;
  }
  if (i === 0) {
    return (2 * (a[0] as number) - 5 * (a[1] as number) + 4 * (a[2] as number) - (a[3] as number)) * r2;
  }
  return (
    (2 * (a[n - 1] as number) - 5 * (a[n - 2] as number) + 4 * (a[n - 3] as number) - (a[n - 4] as number)) *
    r2
  );
}

/**
 * Specific force (m/s^2, platform axes) at one seat point seat_m (platform frame, m) along a pose track.
 * The same differences and formula as platformMotion + seatForceFromMotion, fused per sample so a long
 * track allocates only the three output arrays; for several seats use those two instead.
 */
export function seatSpecificForce(
  pose: PoseOffsetTrack,
  seat_m: readonly [number, number, number],
): SeatForce {
  const n = checkPose(pose);
  checkSeat(seat_m);
  const rate = pose.rate_hz;
  const h = 0.5 * rate;
  const r2 = rate * rate;
  const [rx, ry, rz] = seat_m;
  const { x_m, y_m, z_m, roll_rad, pitch_rad, yaw_rad } = pose;
  const fx = new Float64Array(n);
  const fy = new Float64Array(n);
  const fz = new Float64Array(n);
  const R = new Float64Array(9);
  for (let i = 0; i < n; i++) {
    const pitch = pitch_rad[i] as number;
    const yaw = yaw_rad[i] as number;
    rotationInto(roll_rad[i] as number, pitch, yaw, R, 0);
    const cp = Math.cos(pitch);
    const sp = Math.sin(pitch);
    const cy = Math.cos(yaw);
    const sy = Math.sin(yaw);
    const dr = d1At(roll_rad, i, n, h);
    const dp = d1At(pitch_rad, i, n, h);
    const dy = d1At(yaw_rad, i, n, h);
    const ddr = d2At(roll_rad, i, n, r2);
    const ddp = d2At(pitch_rad, i, n, r2);
    const ddy = d2At(yaw_rad, i, n, r2);
    const wx = cy * cp * dr - sy * dp;
    const wy = sy * cp * dr + cy * dp;
    const wz = -sp * dr + dy;
    const ax = (-sy * cp * dy - cy * sp * dp) * dr - cy * dy * dp + cy * cp * ddr - sy * ddp;
    const ay = (cy * cp * dy - sy * sp * dp) * dr - sy * dy * dp + sy * cp * ddr + cy * ddp;
    const az = -cp * dp * dr - sp * ddr + ddy;
    const r00 = R[0] as number;
    const r01 = R[1] as number;
    const r02 = R[2] as number;
    const r10 = R[3] as number;
    const r11 = R[4] as number;
    const r12 = R[5] as number;
    const r20 = R[6] as number;
    const r21 = R[7] as number;
    const r22 = R[8] as number;
    const px = r00 * rx + r01 * ry + r02 * rz;
    const py = r10 * rx + r11 * ry + r12 * rz;
    const pz = r20 * rx + r21 * ry + r22 * rz;
    const cx = wy * pz - wz * py;
    const cyy = wz * px - wx * pz;
    const cz = wx * py - wy * px;
    const bx = d2At(x_m, i, n, r2) + (ay * pz - az * py) + (wy * cz - wz * cyy);
    const by = d2At(y_m, i, n, r2) + (az * px - ax * pz) + (wz * cx - wx * cz);
    const bz = d2At(z_m, i, n, r2) + (ax * py - ay * px) + (wx * cyy - wy * cx) + G0;
    fx[i] = r00 * bx + r10 * by + r20 * bz;
    fy[i] = r01 * bx + r11 * by + r21 * bz;
    fz[i] = r02 * bx + r12 * by + r22 * bz;
  }
  return { x: fx, y: fy, z: fz };
}
