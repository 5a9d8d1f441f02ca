// 6-6 hexapod kinematics on whole tracks (docs/motion-conventions.md section 2). Poses are offsets from neutral:
// platform origin at (x, y, h0 + z) in the base frame, orientation R = Rz(yaw) Ry(pitch) Rx(roll).
// Leg i: L_i = p + R P_i - B_i, length l_i = |L_i|. All loops run on flat Float64Arrays and allocate
// nothing per sample.

import { FK_MAX_POSE_STEP, FK_SUBSTEP_M, followLegPath, poseStep } from './continuation';
import { KinematicsError, conditionNumberSquare, flattenJoints, solveInPlace } from './base-geometry';
import { eulerRateToBaseOmegaInto, rotationInto } from './rotation';
import { derivative } from './track-derivative';

/** Joint coordinates flattened for the hot loops (metres; base frame and platform frame). */
export interface HexapodGeometry {
  /** B_i as [x0, y0, z0, x1, ...], 18 values, base frame. */
  readonly base: Float64Array;
  /** P_i as [x0, y0, z0, x1, ...], 18 values, platform frame. */
  readonly platform: Float64Array;
  readonly neutralHeight_m: number;
}

/** Pose offsets from neutral, one array per coordinate (m, rad), all the same length. */
export interface PoseColumns {
  x_m: Float64Array;
  y_m: Float64Array;
  z_m: Float64Array;
  roll_rad: Float64Array;
  pitch_rad: Float64Array;
  yaw_rad: Float64Array;
}

/** Time derivatives of PoseColumns: platform origin velocity (m/s, base frame) and angle rates (rad/s). */
export interface PoseRates {
  vx_mps: Float64Array;
  vy_mps: Float64Array;
  vz_mps: Float64Array;
  droll_radps: Float64Array;
  dpitch_radps: Float64Array;
  dyaw_radps: Float64Array;
}

type Joint3 = readonly [number, number, number] | readonly number[];

/** Flattens a validated hexapod base (joints in m) into a HexapodGeometry. */
export function hexapodGeometry(base: {
  baseJoints_m: readonly Joint3[];
  platformJoints_m: readonly Joint3[];
  neutralHeight_m: number;
}): HexapodGeometry {
  if (base.baseJoints_m.length !== 6 || base.platformJoints_m.length !== 6) {
    throw new RangeError('a hexapod needs six base joints and six platform joints');
  }
  return {
    base: flattenJoints(base.baseJoints_m, 3),
    platform: flattenJoints(base.platformJoints_m, 3),
    neutralHeight_m: base.neutralHeight_m,
  };
}

/** Number of samples of a pose, checking all six columns agree. */
export function poseLength(pose: PoseColumns): number {
  const n = pose.x_m.length;
  if (
    pose.y_m.length !== n ||
    pose.z_m.length !== n ||
    pose.roll_rad.length !== n ||
    pose.pitch_rad.length !== n ||
    pose.yaw_rad.length !== n
  ) {
    throw new RangeError('pose columns differ in length');
  }
  return n;
}

/** `count` new zero-filled columns of length n. */
export function newColumns(count: number, n: number): Float64Array[] {
  const out: Float64Array[] = [];
  for (let i = 0; i < count; i++) out.push(new Float64Array(n));
  return out;
}

const rot = new Float64Array(9);

/** Leg lengths (m) of one pose offset (m, rad) into out[offset..offset+5]. */
export function hexapodLegLengthsInto(
  g: HexapodGeometry,
  x: number,
  y: number,
  z: number,
  roll: number,
  pitch: number,
  yaw: number,
  out: Float64Array,
  offset = 0,
): void {
  rotationInto(roll, pitch, yaw, rot, 0);
  const px = x;
  const py = y;
  const pz = z + g.neutralHeight_m;
  const B = g.base;
  const P = g.platform;
  for (let i = 0; i < 6; i++) {
    const qx = P[3 * i] as number;
    const qy = P[3 * i + 1] as number;
    const qz = P[3 * i + 2] as number;
    const lx =
      px + (rot[0] as number) * qx + (rot[1] as number) * qy + (rot[2] as number) * qz - (B[3 * i] as number);
    const ly =
      py +
      (rot[3] as number) * qx +
      (rot[4] as number) * qy +
      (rot[5] as number) * qz -
      (B[3 * i + 1] as number);
    const lz =
      pz +
      (rot[6] as number) * qx +
      (rot[7] as number) * qy +
      (rot[8] as number) * qz -
      (B[3 * i + 2] as number);
    out[offset + i] = Math.sqrt(lx * lx + ly * ly + lz * lz);
  }
}

/**
 * Inverse kinematics of a pose track: six leg-length columns (m), written into `out` when given.
 * `rotation` may hold the pose's rotation matrices already (rotationInto, row-major, 9 per sample, as
 * platformMotion keeps them); they are then read instead of being computed again.
 */
export function hexapodInverse(
  g: HexapodGeometry,
  pose: PoseColumns,
  out?: Float64Array[],
  rotation?: Float64Array,
): Float64Array[] {
  const n = poseLength(pose);
  if (rotation && rotation.length < 9 * n) {
    throw new RangeError(`hexapodInverse: ${rotation.length / 9} rotation matrices for ${n} poses`);
  }
  const legs = out ?? newColumns(6, n);
  const l0 = legs[0];
  const l1 = legs[1];
  const l2 = legs[2];
  const l3 = legs[3];
  const l4 = legs[4];
  const l5 = legs[5];
  if (!l0 || !l1 || !l2 || !l3 || !l4 || !l5 || legs.some((c) => c.length < n)) {
    throw new RangeError('hexapodInverse: need six output columns of the track length');
  }
  const B = g.base;
  const P = g.platform;
  const h0 = g.neutralHeight_m;
  const { x_m, y_m, z_m, roll_rad, pitch_rad, yaw_rad } = pose;
  const r = rot;
  const R = rotation ?? r;
  for (let s = 0; s < n; s++) {
    let m = 9 * s;
    if (!rotation) {
      rotationInto(roll_rad[s] as number, pitch_rad[s] as number, yaw_rad[s] as number, r, 0);
      m = 0;
    }
    const px = x_m[s] as number;
    const py = y_m[s] as number;
    const pz = (z_m[s] as number) + h0;
    const r0 = R[m] as number;
    const r1 = R[m + 1] as number;
    const r2 = R[m + 2] as number;
    const r3 = R[m + 3] as number;
    const r4 = R[m + 4] as number;
    const r5 = R[m + 5] as number;
    const r6 = R[m + 6] as number;
    const r7 = R[m + 7] as number;
    const r8 = R[m + 8] as number;
    for (let i = 0; i < 6; i++) {
      const qx = P[3 * i] as number;
      const qy = P[3 * i + 1] as number;
      const qz = P[3 * i + 2] as number;
      const lx = px + r0 * qx + r1 * qy + r2 * qz - (B[3 * i] as number);
      const ly = py + r3 * qx + r4 * qy + r5 * qz - (B[3 * i + 1] as number);
      const lz = pz + r6 * qx + r7 * qy + r8 * qz - (B[3 * i + 2] as number);
      (legs[i] as Float64Array)[s] = Math.sqrt(lx * lx + ly * ly + lz * lz);
    }
  }
  return legs;
}

/** Pose rates (m/s, rad/s) of a pose track by the three-point derivative on its (uneven) time grid. */
export function poseRates(time_s: Float64Array, pose: PoseColumns): PoseRates {
  poseLength(pose);
  return {
    vx_mps: derivative(time_s, pose.x_m),
    vy_mps: derivative(time_s, pose.y_m),
    vz_mps: derivative(time_s, pose.z_m),
    droll_radps: derivative(time_s, pose.roll_rad),
    dpitch_radps: derivative(time_s, pose.pitch_rad),
    dyaw_radps: derivative(time_s, pose.yaw_rad),
  };
}

const omegaMat = new Float64Array(9);

/**
 * Leg speeds (m/s) from poses and pose rates by the analytic formula
 * dl_i/dt = (L_i / l_i) . (v + w x (R P_i)), with w = E(pitch, yaw) [droll, dpitch, dyaw] in the base frame.
 */
export function hexapodLegSpeeds(
  g: HexapodGeometry,
  pose: PoseColumns,
  rates: PoseRates,
  out?: Float64Array[],
): Float64Array[] {
  const n = poseLength(pose);
  const speeds = out ?? newColumns(6, n);
  const B = g.base;
  const P = g.platform;
  const h0 = g.neutralHeight_m;
  const r = rot;
  const E = omegaMat;
  for (let s = 0; s < n; s++) {
    const roll = pose.roll_rad[s] as number;
    const pitch = pose.pitch_rad[s] as number;
    const yaw = pose.yaw_rad[s] as number;
    rotationInto(roll, pitch, yaw, r, 0);
    eulerRateToBaseOmegaInto(pitch, yaw, E);
    const dr = rates.droll_radps[s] as number;
    const dp = rates.dpitch_radps[s] as number;
    const dy = rates.dyaw_radps[s] as number;
    const wx = (E[0] as number) * dr + (E[1] as number) * dp + (E[2] as number) * dy;
    const wy = (E[3] as number) * dr + (E[4] as number) * dp + (E[5] as number) * dy;
    const wz = (E[6] as number) * dr + (E[7] as number) * dp + (E[8] as number) * dy;
    const vx = rates.vx_mps[s] as number;
    const vy = rates.vy_mps[s] as number;
    const vz = rates.vz_mps[s] as number;
    const px = pose.x_m[s] as number;
    const py = pose.y_m[s] as number;
    const pz = (pose.z_m[s] as number) + h0;
    for (let i = 0; i < 6; i++) {
      const qx = P[3 * i] as number;
      const qy = P[3 * i + 1] as number;
      const qz = P[3 * i + 2] as number;
      const ax = (r[0] as number) * qx + (r[1] as number) * qy + (r[2] as number) * qz;
      const ay = (r[3] as number) * qx + (r[4] as number) * qy + (r[5] as number) * qz;
      const az = (r[6] as number) * qx + (r[7] as number) * qy + (r[8] as number) * qz;
      const lx = px + ax - (B[3 * i] as number);
      const ly = py + ay - (B[3 * i + 1] as number);
      const lz = pz + az - (B[3 * i + 2] as number);
      const l = Math.sqrt(lx * lx + ly * ly + lz * lz);
      // Joint velocity v + w x (R P_i), projected on the leg's unit vector.
      const jx = vx + wy * az - wz * ay;
      const jy = vy + wz * ax - wx * az;
      const jz = vz + wx * ay - wy * ax;
      (speeds[i] as Float64Array)[s] = (lx * jx + ly * jy + lz * jz) / l;
    }
  }
  return speeds;
}

/** Leg accelerations (m/s^2): the three-point time derivative of leg speeds (m/s) on the track's grid. */
export function hexapodLegAccelerations(
  time_s: Float64Array,
  speeds: readonly Float64Array[],
): Float64Array[] {
  return speeds.map((v) => derivative(time_s, v));
}

/**
 * 6x6 Jacobian (row-major into out) mapping the twist [v; w] (platform origin velocity, m/s, and
 * angular velocity, rad/s, both in the base frame) to leg speeds: row i = [u_i, (R P_i) x u_i] with u_i
 * the unit vector of leg i, base frame, since dl_i/dt = u_i . v + ((R P_i) x u_i) . w.
 */
export function hexapodJacobianInto(
  g: HexapodGeometry,
  x: number,
  y: number,
  z: number,
  roll: number,
  pitch: number,
  yaw: number,
  out: Float64Array,
): void {
  rotationInto(roll, pitch, yaw, rot, 0);
  const pz = z + g.neutralHeight_m;
  const B = g.base;
  const P = g.platform;
  const r = rot;
  for (let i = 0; i < 6; i++) {
    const qx = P[3 * i] as number;
    const qy = P[3 * i + 1] as number;
    const qz = P[3 * i + 2] as number;
    const ax = (r[0] as number) * qx + (r[1] as number) * qy + (r[2] as number) * qz;
    const ay = (r[3] as number) * qx + (r[4] as number) * qy + (r[5] as number) * qz;
    const az = (r[6] as number) * qx + (r[7] as number) * qy + (r[8] as number) * qz;
    const lx = x + ax - (B[3 * i] as number);
    const ly = y + ay - (B[3 * i + 1] as number);
    const lz = pz + az - (B[3 * i + 2] as number);
    const inv = 1 / Math.sqrt(lx * lx + ly * ly + lz * lz);
    const ux = lx * inv;
    const uy = ly * inv;
    const uz = lz * inv;
    const o = 6 * i;
    out[o] = ux;
    out[o + 1] = uy;
    out[o + 2] = uz;
    out[o + 3] = ay * uz - az * uy;
    out[o + 4] = az * ux - ax * uz;
    out[o + 5] = ax * uy - ay * ux;
  }
}

/**
 * 2-norm condition number of the twist Jacobian (hexapodJacobianInto) at each pose of a track. The
 * twist mixes m/s and rad/s, so the number depends on that choice of units; it is used as a relative
 * measure of closeness to a singular pose.
 */
export function hexapodConditionNumbers(
  g: HexapodGeometry,
  pose: PoseColumns,
  out?: Float64Array,
): Float64Array {
  const n = poseLength(pose);
  const res = out ?? new Float64Array(n);
  const J = new Float64Array(36);
  const scratch = new Float64Array(42);
  for (let s = 0; s < n; s++) {
    hexapodJacobianInto(
      g,
      pose.x_m[s] as number,
      pose.y_m[s] as number,
      pose.z_m[s] as number,
      pose.roll_rad[s] as number,
      pose.pitch_rad[s] as number,
      pose.yaw_rad[s] as number,
      J,
    );
    res[s] = conditionNumberSquare(J, 6, scratch);
  }
  return res;
}

/** Options for hexapod forward kinematics. */
export interface HexapodForwardOptions {
  /** Stop when every leg residual is below this (m); default 1e-12. */
  tolerance_m?: number;
  /** Newton iterations allowed per sample; default 40. */
  maxIterations?: number;
  /** Pose offset [x, y, z, roll, pitch, yaw] (m, rad) that starts the first sample; default neutral. */
  start?: readonly number[];
  /** Sample times, only to name the time in error messages. */
  time_s?: Float64Array;
}

/** Scratch memory for hexapodForwardPose, so a track loop allocates nothing. */
export interface ForwardWorkspace {
  readonly jac: Float64Array;
  readonly rhs: Float64Array;
  readonly rot: Float64Array;
  readonly omega: Float64Array;
}

/** Fresh scratch memory for hexapodForwardPose. */
export function newForwardWorkspace(): ForwardWorkspace {
  return {
    jac: new Float64Array(36),
    rhs: new Float64Array(6),
    rot: new Float64Array(9),
    omega: new Float64Array(9),
  };
}

/**
 * Newton-Raphson for one pose: refines q = [x, y, z, roll, pitch, yaw] (pose offset, m and rad; the
 * start guess, overwritten with the result) until leg lengths (m) match `legs[legOffset..+5]` within
 * tolerance_m. The Jacobian dl/dq is the twist Jacobian (hexapodJacobianInto) times
 * blockdiag(I, E(pitch, yaw)); both come from the same leg vectors as the residual, one rotation per
 * iteration. Returns the Newton steps taken, -1 when the Jacobian is singular, -2 when the iterations
 * ran out; ws.rhs then holds minus the last residuals.
 */
export function hexapodForwardPose(
  g: HexapodGeometry,
  legs: Float64Array,
  legOffset: number,
  q: Float64Array,
  ws: ForwardWorkspace,
  tolerance_m = 1e-12,
  maxIterations = 40,
): number {
  const { jac, rhs, rot: r, omega } = ws;
  const B = g.base;
  const P = g.platform;
  const h0 = g.neutralHeight_m;
  // The leg-vector loop below repeats the one in hexapodLegSpeeds and hexapodLegLengthsInto on purpose:
  // inlined here it keeps FK of a 600,000-sample track free of calls and allocations per iteration
  // (npm run bench, hexapod-fk); the shared IK tests hold all three to the same lengths.
  for (let it = 0; it <= maxIterations; it++) {
    const px = q[0] as number;
    const py = q[1] as number;
    const pz = (q[2] as number) + h0;
    const pitch = q[4] as number;
    const yaw = q[5] as number;
    rotationInto(q[3] as number, pitch, yaw, r, 0);
    let worst = 0;
    for (let i = 0; i < 6; i++) {
      const qx = P[3 * i] as number;
      const qy = P[3 * i + 1] as number;
      const qz = P[3 * i + 2] as number;
      const ax = (r[0] as number) * qx + (r[1] as number) * qy + (r[2] as number) * qz;
      const ay = (r[3] as number) * qx + (r[4] as number) * qy + (r[5] as number) * qz;
      const az = (r[6] as number) * qx + (r[7] as number) * qy + (r[8] as number) * qz;
      const lx = px + ax - (B[3 * i] as number);
      const ly = py + ay - (B[3 * i + 1] as number);
      const lz = pz + az - (B[3 * i + 2] as number);
      const l = Math.sqrt(lx * lx + ly * ly + lz * lz);
      const f = l - (legs[legOffset + i] as number);
      rhs[i] = -f;
      const af = Math.abs(f);
      if (!(af <= worst)) worst = af;
      const inv = 1 / l;
      const ux = lx * inv;
      const uy = ly * inv;
      const uz = lz * inv;
      const o = 6 * i;
      jac[o] = ux;
      jac[o + 1] = uy;
      jac[o + 2] = uz;
      // Angular part of the twist row, (R P_i) x u_i, kept in jac[o+3..o+5] until E is applied below.
      jac[o + 3] = ay * uz - az * uy;
      jac[o + 4] = az * ux - ax * uz;
      jac[o + 5] = ax * uy - ay * ux;
    }
    if (worst <= tolerance_m) return it;
    if (it === maxIterations || !Number.isFinite(worst)) break;
    eulerRateToBaseOmegaInto(pitch, yaw, omega);
    const e0 = omega[0] as number;
    const e1 = omega[1] as number;
    const e3 = omega[3] as number;
    const e4 = omega[4] as number;
    const e6 = omega[6] as number;
    for (let i = 0; i < 6; i++) {
      const o = 6 * i;
      const cx = jac[o + 3] as number;
      const cy = jac[o + 4] as number;
      const cz = jac[o + 5] as number;
      // d l_i / d angle_k = ((R P_i) x u_i) . (column k of E); E = [[e0, e1, 0], [e3, e4, 0], [e6, 0, 1]].
      jac[o + 3] = cx * e0 + cy * e3 + cz * e6;
      jac[o + 4] = cx * e1 + cy * e4;
      jac[o + 5] = cz;
    }
    if (!solveInPlace(jac, rhs, 6)) return -1;
    for (let k = 0; k < 6; k++) q[k] = (q[k] as number) + (rhs[k] as number);
  }
  return -2;
}

/**
 * Forward kinematics of a leg-length track (six columns, m): pose offsets (m, rad). The first sample
 * is reached from the start pose (default neutral) and each later sample from the one before, so the
 * solution follows one assembly mode. A small leg change (at most FK_SUBSTEP_M) is one Newton solve
 * started from the previous pose extrapolated linearly in time along the last step (falling back to
 * the previous pose itself); a larger change, as between the samples of a coarse file, and any solve
 * that moved the pose by more than FK_MAX_POSE_STEP, is followed by sub-steps (followLegPath). Throws
 * KinematicsError naming the sample when no continuous path reaches it.
 */
export function hexapodForward(
  g: HexapodGeometry,
  legs: readonly Float64Array[],
  options: HexapodForwardOptions = {},
): PoseColumns {
  if (legs.length !== 6) throw new RangeError('hexapodForward: need six leg columns');
  const n = (legs[0] as Float64Array).length;
  if (legs.some((c) => c.length !== n)) throw new RangeError('hexapodForward: leg columns differ in length');
  const tol = options.tolerance_m ?? 1e-12;
  const maxIt = options.maxIterations ?? 40;
  const time = options.time_s;
  const out: PoseColumns = {
    x_m: new Float64Array(n),
    y_m: new Float64Array(n),
    z_m: new Float64Array(n),
    roll_rad: new Float64Array(n),
    pitch_rad: new Float64Array(n),
    yaw_rad: new Float64Array(n),
  };
  const cols = [out.x_m, out.y_m, out.z_m, out.roll_rad, out.pitch_rad, out.yaw_rad] as const;
  const [l0, l1, l2, l3, l4, l5] = legs as [
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
  ];
  const q = new Float64Array(6);
  const prev = new Float64Array(6);
  const prev2 = new Float64Array(6);
  if (options.start) for (let k = 0; k < 6; k++) q[k] = options.start[k] ?? 0;
  prev.set(q);
  // Leg lengths of the previous pose: the start pose's for the first sample.
  const prevLegs = new Float64Array(6);
  hexapodLegLengthsInto(
    g,
    q[0] as number,
    q[1] as number,
    q[2] as number,
    q[3] as number,
    q[4] as number,
    q[5] as number,
    prevLegs,
  );
  const row = new Float64Array(6);
  const ws = newForwardWorkspace();
  const scratch = { target: new Float64Array(6), trial: new Float64Array(6) };
  for (let s = 0; s < n; s++) {
    row[0] = l0[s] as number;
    row[1] = l1[s] as number;
    row[2] = l2[s] as number;
    row[3] = l3[s] as number;
    row[4] = l4[s] as number;
    row[5] = l5[s] as number;
    let dmax = 0;
    for (let i = 0; i < 6; i++) {
      const d = Math.abs((row[i] as number) - (prevLegs[i] as number));
      if (!(d <= dmax)) dmax = d;
    }
    let it = -2;
    if (dmax <= FK_SUBSTEP_M) {
      if (s >= 2) {
        const ratio = time
          ? ((time[s] as number) - (time[s - 1] as number)) /
            ((time[s - 1] as number) - (time[s - 2] as number))
          : 1;
        const w = Number.isFinite(ratio) && ratio > 0 && ratio < 4 ? ratio : 0;
        for (let k = 0; k < 6; k++)
          q[k] = (prev[k] as number) + ((prev[k] as number) - (prev2[k] as number)) * w;
        it = hexapodForwardPose(g, row, 0, q, ws, tol, maxIt);
        if (it >= 0 && poseStep(q, prev) > FK_MAX_POSE_STEP) it = -3;
      }
      if (it < 0) {
        q.set(prev);
        it = hexapodForwardPose(g, row, 0, q, ws, tol, maxIt);
        if (it >= 0 && poseStep(q, prev) > FK_MAX_POSE_STEP) it = -3;
      }
    }
    if (it < 0) {
      q.set(prev);
      const ok =
        Number.isFinite(dmax) &&
        followLegPath(
          prevLegs,
          row,
          q,
          (target, trial) => hexapodForwardPose(g, target, 0, trial, ws, tol, maxIt) >= 0,
          scratch,
        );
      if (!ok) {
        const t = time?.[s] ?? null;
        let worst = 0;
        for (let i = 0; i < 6; i++) worst = Math.max(worst, Math.abs(ws.rhs[i] as number));
        throw new KinematicsError(
          s,
          t,
          'noPath',
          `forward kinematics found no continuous path from the ${s === 0 ? 'start pose' : 'previous sample'} ` +
            `(legs change by up to ${Number.isFinite(dmax) ? dmax.toPrecision(3) : 'an unbounded amount'} m; last leg residual ` +
            `${Number.isFinite(worst) ? worst.toPrecision(3) : 'unbounded'} m): the leg lengths in between pass a singular ` +
            'pose or leave the reachable set, or the file is too coarse to follow',
        );
      }
    }
    prev2.set(s === 0 ? q : prev);
    prev.set(q);
    prevLegs.set(row);
    for (let k = 0; k < 6; k++) (cols[k] as Float64Array)[s] = q[k] as number;
  }
  return out;
}
