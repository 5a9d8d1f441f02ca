// Planar three-leg stage (3-RPR, docs/motion-conventions.md section 2): pose (x, y, yaw) in the base plane, leg i
// joins base joint B_i to platform joint P_i, L_i = p + R(yaw) P_i - B_i. The neutral pose is the
// platform origin on the base origin with zero yaw, so pose offsets and poses coincide.

import { FK_MAX_POSE_STEP, FK_SUBSTEP_M, followLegPath, legChange, poseStep } from './continuation';
import { KinematicsError, conditionNumberSquare, flattenJoints, solveInPlace } from './base-geometry';

/** Joints flattened as [x0, y0, x1, y1, x2, y2] (m): base in the base frame, platform in its own. */
export interface Planar3Geometry {
  readonly base: Float64Array;
  readonly platform: Float64Array;
}

/** Planar pose track: platform origin (m, base frame) and yaw (rad), one array each. */
export interface PlanarPoseColumns {
  x_m: Float64Array;
  y_m: Float64Array;
  yaw_rad: Float64Array;
}

/** One planar pose (m, m, rad). */
export interface PlanarPose {
  x_m: number;
  y_m: number;
  yaw_rad: number;
}

type Joint2 = readonly [number, number] | readonly number[];

/** Flattens a validated planar3 base (joints in m) into a Planar3Geometry. */
export function planar3Geometry(base: {
  baseJoints_m: readonly Joint2[];
  platformJoints_m: readonly Joint2[];
}): Planar3Geometry {
  if (base.baseJoints_m.length !== 3 || base.platformJoints_m.length !== 3) {
    throw new RangeError('a planar3 stage needs three base joints and three platform joints');
  }
  return { base: flattenJoints(base.baseJoints_m, 2), platform: flattenJoints(base.platformJoints_m, 2) };
}

/** Leg lengths (m) of one pose (m, m, rad) into out[offset..offset+2]. */
export function planar3LegLengthsInto(
  g: Planar3Geometry,
  x: number,
  y: number,
  yaw: number,
  out: Float64Array,
  offset = 0,
): void {
  const c = Math.cos(yaw);
  const s = Math.sin(yaw);
  const B = g.base;
  const P = g.platform;
  for (let i = 0; i < 3; i++) {
    const qx = P[2 * i] as number;
    const qy = P[2 * i + 1] as number;
    const lx = x + c * qx - s * qy - (B[2 * i] as number);
    const ly = y + s * qx + c * qy - (B[2 * i + 1] as number);
    out[offset + i] = Math.sqrt(lx * lx + ly * ly);
  }
}

/** Inverse kinematics of a planar pose track: three leg-length columns (m). */
export function planar3Inverse(g: Planar3Geometry, pose: PlanarPoseColumns): Float64Array[] {
  const n = pose.x_m.length;
  if (pose.y_m.length !== n || pose.yaw_rad.length !== n)
    throw new RangeError('pose columns differ in length');
  const legs = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
  const B = g.base;
  const P = g.platform;
  for (let s = 0; s < n; s++) {
    const yaw = pose.yaw_rad[s] as number;
    const c = Math.cos(yaw);
    const si = Math.sin(yaw);
    const x = pose.x_m[s] as number;
    const y = pose.y_m[s] as number;
    for (let i = 0; i < 3; i++) {
      const qx = P[2 * i] as number;
      const qy = P[2 * i + 1] as number;
      const lx = x + c * qx - si * qy - (B[2 * i] as number);
      const ly = y + si * qx + c * qy - (B[2 * i + 1] as number);
      (legs[i] as Float64Array)[s] = Math.sqrt(lx * lx + ly * ly);
    }
  }
  return legs;
}

/**
 * 3x3 Jacobian (row-major into out) from the planar twist [vx, vy, wz] (m/s, m/s, rad/s, base frame) to
 * leg speeds: row i = [u_x, u_y, ((R P_i) x u)_z] with u the unit vector of leg i.
 */
export function planar3JacobianInto(
  g: Planar3Geometry,
  x: number,
  y: number,
  yaw: number,
  out: Float64Array,
): void {
  const c = Math.cos(yaw);
  const s = Math.sin(yaw);
  const B = g.base;
  const P = g.platform;
  for (let i = 0; i < 3; i++) {
    const qx = P[2 * i] as number;
    const qy = P[2 * i + 1] as number;
    const ax = c * qx - s * qy;
    const ay = s * qx + c * qy;
    const lx = x + ax - (B[2 * i] as number);
    const ly = y + ay - (B[2 * i + 1] as number);
    const inv = 1 / Math.sqrt(lx * lx + ly * ly);
    out[3 * i] = lx * inv;
    out[3 * i + 1] = ly * inv;
    out[3 * i + 2] = (ax * ly - ay * lx) * inv;
  }
}

/** 2-norm condition number of the planar twist Jacobian at each pose of a track (mixed m and rad units). */
export function planar3ConditionNumbers(g: Planar3Geometry, pose: PlanarPoseColumns): Float64Array {
  const n = pose.x_m.length;
  const res = new Float64Array(n);
  const J = new Float64Array(9);
  const scratch = new Float64Array(12);
  for (let s = 0; s < n; s++) {
    planar3JacobianInto(g, pose.x_m[s] as number, pose.y_m[s] as number, pose.yaw_rad[s] as number, J);
    res[s] = conditionNumberSquare(J, 3, scratch);
  }
  return res;
}

/** Scratch for planar3ForwardPose. */
interface PlanarWorkspace {
  jac: Float64Array;
  rhs: Float64Array;
  len: Float64Array;
}

function newPlanarWorkspace(): PlanarWorkspace {
  return { jac: new Float64Array(9), rhs: new Float64Array(3), len: new Float64Array(3) };
}

/**
 * Newton-Raphson for one planar pose: refines q = [x, y, yaw] (m, m, rad; overwritten) until the leg
 * lengths match legs[off..off+2] (m) within tolerance_m. Returns iterations, -1 if singular, -2 if
 * not converged.
 */
export function planar3ForwardPose(
  g: Planar3Geometry,
  legs: Float64Array,
  off: number,
  q: Float64Array,
  ws: PlanarWorkspace = newPlanarWorkspace(),
  tolerance_m = 1e-12,
  maxIterations = 40,
): number {
  const { jac, rhs, len } = ws;
  for (let it = 0; it <= maxIterations; it++) {
    const x = q[0] as number;
    const y = q[1] as number;
    const yaw = q[2] as number;
    planar3LegLengthsInto(g, x, y, yaw, len, 0);
    let worst = 0;
    for (let i = 0; i < 3; i++) {
      const f = (len[i] as number) - (legs[off + i] as number);
      rhs[i] = -f;
      const a = Math.abs(f);
      if (!(a <= worst)) worst = a;
    }
    if (worst <= tolerance_m) return it;
    if (it === maxIterations || !Number.isFinite(worst)) break;
    planar3JacobianInto(g, x, y, yaw, jac);
    if (!solveInPlace(jac, rhs, 3)) return -1;
    for (let k = 0; k < 3; k++) q[k] = (q[k] as number) + (rhs[k] as number);
  }
  return -2;
}

const TWO_PI = 2 * Math.PI;
// Subdivisions used to split close root pairs around a local minimum of the mode function.
const REFINE = 512;

/** An angle (rad) wrapped into [-pi, pi). */
export function wrapAngle(a: number): number {
  const w = a - TWO_PI * Math.floor((a + Math.PI) / TWO_PI);
  return w >= Math.PI ? w - TWO_PI : w;
}

const modeDx = new Float64Array(3);
const modeDy = new Float64Array(3);

/**
 * Subtracting leg 1's equation from legs 2 and 3 leaves two equations linear in p:
 * A(yaw) p = c(yaw). By Cramer p = N / D, and leg 1 then requires
 * G(yaw) = |N + D d_1|^2 - D^2 l_1^2 = 0 with d_1 = R P_1 - B_1. Multiplying through by D^2 removes
 * the poles of the plain residual, so G is a smooth trigonometric polynomial whose real roots are the
 * assembly modes' yaw angles. Writes [G, Nx, Ny, D] into out.
 */
function modeFunction(g: Planar3Geometry, l: Float64Array, yaw: number, out: Float64Array): void {
  const c = Math.cos(yaw);
  const s = Math.sin(yaw);
  const B = g.base;
  const P = g.platform;
  const dx = modeDx;
  const dy = modeDy;
  for (let i = 0; i < 3; i++) {
    const qx = P[2 * i] as number;
    const qy = P[2 * i + 1] as number;
    dx[i] = c * qx - s * qy - (B[2 * i] as number);
    dy[i] = s * qx + c * qy - (B[2 * i + 1] as number);
  }
  const d0x = dx[0] as number;
  const d0y = dy[0] as number;
  const n0 = d0x * d0x + d0y * d0y;
  const l0 = l[0] as number;
  const a00 = 2 * ((dx[1] as number) - d0x);
  const a01 = 2 * ((dy[1] as number) - d0y);
  const a10 = 2 * ((dx[2] as number) - d0x);
  const a11 = 2 * ((dy[2] as number) - d0y);
  const l1 = l[1] as number;
  const l2 = l[2] as number;
  const c0 = l1 * l1 - l0 * l0 - ((dx[1] as number) ** 2 + (dy[1] as number) ** 2) + n0;
  const c1 = l2 * l2 - l0 * l0 - ((dx[2] as number) ** 2 + (dy[2] as number) ** 2) + n0;
  const D = a00 * a11 - a01 * a10;
  const Nx = c0 * a11 - a01 * c1;
  const Ny = a00 * c1 - c0 * a10;
  const ex = Nx + D * d0x;
  const ey = Ny + D * d0y;
  out[0] = ex * ex + ey * ey - D * D * l0 * l0;
  out[1] = Nx;
  out[2] = Ny;
  out[3] = D;
}

/** Options for planar3AssemblyModes. */
export interface AssemblyModeOptions {
  /** Yaw samples over [-pi, pi) for root bracketing; default 4096. */
  samples?: number;
  /** A mode must reproduce every leg length within this (m); default 1e-10. */
  tolerance_m?: number;
}

/**
 * Every real assembly mode (x, y, yaw; m, m, rad with yaw in [-pi, pi)) of a planar3 stage for leg
 * lengths l1..l3 (m): roots of the mode function (see modeFunction) bracketed by dense sampling of yaw,
 * refined by bisection, then polished by Newton on all three leg equations and de-duplicated.
 */
export function planar3AssemblyModes(
  g: Planar3Geometry,
  l1: number,
  l2: number,
  l3: number,
  options: AssemblyModeOptions = {},
): PlanarPose[] {
  const K = options.samples ?? 4096;
  const tol = options.tolerance_m ?? 1e-10;
  const l = Float64Array.of(l1, l2, l3);
  const buf = new Float64Array(4);
  const vals = new Float64Array(K + 1);
  const yawAt = (k: number): number => -Math.PI + (TWO_PI * k) / K;
  for (let k = 0; k <= K; k++) {
    modeFunction(g, l, yawAt(k), buf);
    vals[k] = buf[0] as number;
  }
  const candidates: number[] = [];
  const bisect = (a: number, b: number, ga: number): number => {
    let lo = a;
    let hi = b;
    let glo = ga;
    for (let it = 0; it < 80 && hi - lo > 1e-15; it++) {
      const mid = 0.5 * (lo + hi);
      modeFunction(g, l, mid, buf);
      const gm = buf[0] as number;
      if (gm === 0) return mid;
      if (gm * glo < 0) hi = mid;
      else {
        lo = mid;
        glo = gm;
      }
    }
    return 0.5 * (lo + hi);
  };
  for (let k = 0; k < K; k++) {
    const ga = vals[k] as number;
    const gb = vals[k + 1] as number;
    if (ga === 0) {
      candidates.push(yawAt(k));
    } else if (ga * gb < 0) {
      candidates.push(bisect(yawAt(k), yawAt(k + 1), ga));
    } else if (k > 0) {
      // Two roots closer than the sampling step (or a touching root) show no sign change: at each local
      // minimum of |G| look again on a grid REFINE times finer, and keep the minimum itself for Newton.
      const gp = Math.abs(vals[k - 1] as number);
      const gc = Math.abs(ga);
      if (gc <= gp && gc <= Math.abs(gb)) {
        const a = yawAt(k - 1);
        const step = (yawAt(k + 1) - a) / REFINE;
        modeFunction(g, l, a, buf);
        let gPrev = buf[0] as number;
        for (let j = 1; j <= REFINE; j++) {
          const y = a + j * step;
          modeFunction(g, l, y, buf);
          const gj = buf[0] as number;
          if (gPrev * gj < 0) candidates.push(bisect(y - step, y, gPrev));
          gPrev = gj;
        }
        candidates.push(yawAt(k));
      }
    }
  }
  const modes: PlanarPose[] = [];
  const q = new Float64Array(3);
  const ws = newPlanarWorkspace();
  for (const yaw of candidates) {
    modeFunction(g, l, yaw, buf);
    const D = buf[3] as number;
    if (!(Math.abs(D) > 0)) continue;
    q[0] = (buf[1] as number) / D;
    q[1] = (buf[2] as number) / D;
    q[2] = yaw;
    if (!Number.isFinite(q[0]) || !Number.isFinite(q[1])) continue;
    const it = planar3ForwardPose(g, l, 0, q, ws, tol * 1e-2, 30);
    if (it < 0) continue;
    const cand: PlanarPose = { x_m: q[0] as number, y_m: q[1] as number, yaw_rad: wrapAngle(q[2] as number) };
    planar3LegLengthsInto(g, cand.x_m, cand.y_m, cand.yaw_rad, ws.len, 0);
    if (
      !(Math.abs((ws.len[0] as number) - l1) <= tol) ||
      !(Math.abs((ws.len[1] as number) - l2) <= tol) ||
      !(Math.abs((ws.len[2] as number) - l3) <= tol)
    ) {
      continue;
    }
    if (!modes.some((m) => poseDistance(m, cand) < 1e-7)) modes.push(cand);
  }
  return modes;
}

/** Distance between two planar poses: Euclidean over (x, y, yaw) with yaw wrapped, 1 rad counted as 1 m. */
export function poseDistance(a: PlanarPose, b: PlanarPose): number {
  const dx = a.x_m - b.x_m;
  const dy = a.y_m - b.y_m;
  const dw = wrapAngle(a.yaw_rad - b.yaw_rad);
  return Math.sqrt(dx * dx + dy * dy + dw * dw);
}

/** Options for planar3Forward. */
export interface Planar3ForwardOptions {
  /** Pose [x, y, yaw] (m, m, rad) the first sample's mode should be nearest to; default neutral. */
  start?: readonly number[];
  /** Sample times, only to name the time in error messages. */
  time_s?: Float64Array;
  tolerance_m?: number;
}

/**
 * Forward kinematics of a planar leg track (three columns, m), following one assembly mode as the
 * hexapod's does: the first sample is reached from `start` (default neutral) and each later sample
 * from the one before, one Newton solve for a small leg change (at most FK_SUBSTEP_M) that moves the
 * pose by at most FK_MAX_POSE_STEP, else by sub-steps along the leg path (followLegPath). Throws
 * KinematicsError naming the sample when no mode reproduces its legs, or no continuous path reaches it.
 */
export function planar3Forward(
  g: Planar3Geometry,
  legs: readonly Float64Array[],
  options: Planar3ForwardOptions = {},
): PlanarPoseColumns {
  if (legs.length !== 3) throw new RangeError('planar3Forward: need three leg columns');
  const n = (legs[0] as Float64Array).length;
  if (legs.some((c) => c.length !== n)) throw new RangeError('planar3Forward: leg columns differ in length');
  const tol = options.tolerance_m ?? 1e-12;
  const out: PlanarPoseColumns = {
    x_m: new Float64Array(n),
    y_m: new Float64Array(n),
    yaw_rad: new Float64Array(n),
  };
  const q = Float64Array.of(options.start?.[0] ?? 0, options.start?.[1] ?? 0, options.start?.[2] ?? 0);
  const prev = Float64Array.from(q);
  const prevLegs = new Float64Array(3);
  planar3LegLengthsInto(g, q[0] as number, q[1] as number, q[2] as number, prevLegs);
  const row = new Float64Array(3);
  const ws = newPlanarWorkspace();
  const scratch = { target: new Float64Array(3), trial: new Float64Array(3) };
  const solve = (target: Float64Array, trial: Float64Array) =>
    planar3ForwardPose(g, target, 0, trial, ws, tol, 40) >= 0;
  for (let s = 0; s < n; s++) {
    for (let i = 0; i < 3; i++) row[i] = (legs[i] as Float64Array)[s] as number;
    const dmax = legChange(row, prevLegs);
    let ok = false;
    if (dmax <= FK_SUBSTEP_M) {
      q.set(prev);
      ok = solve(row, q) && poseStep(q, prev) <= FK_MAX_POSE_STEP;
    }
    if (!ok) {
      q.set(prev);
      ok = Number.isFinite(dmax) && followLegPath(prevLegs, row, q, solve, scratch);
    }
    if (!ok) {
      const t = options.time_s?.[s] ?? null;
      if (planar3AssemblyModes(g, row[0] as number, row[1] as number, row[2] as number).length === 0) {
        throw new KinematicsError(
          s,
          t,
          'noSolution',
          'no assembly mode reproduces these leg lengths (unreachable)',
        );
      }
      throw new KinematicsError(
        s,
        t,
        'noPath',
        `forward kinematics found no continuous path from the ${s === 0 ? 'start pose' : 'previous sample'} ` +
          `(legs change by up to ${Number.isFinite(dmax) ? dmax.toPrecision(3) : 'an unbounded amount'} m): the leg ` +
          'lengths in between pass a singular pose or leave the reachable set, or the file is too coarse to follow',
      );
    }
    prev.set(q);
    prevLegs.set(row);
    out.x_m[s] = q[0] as number;
    out.y_m[s] = q[1] as number;
    out.yaw_rad[s] = q[2] as number;
  }
  return out;
}
