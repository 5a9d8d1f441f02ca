// Pieces both motion-base kinds share: the parametric hexapod joint layout, a small dense solver and a
// symmetric eigenvalue routine for Jacobian conditioning, and the error raised when forward
// kinematics cannot find a pose. Everything works in place on Float64Arrays so the per-sample loops of
// the kinematics allocate nothing.

import { RAD_PER_DEG } from './units';

/** Forward kinematics found no pose: which sample (0-based), at what time, and why. */
export class KinematicsError extends Error {
  readonly sampleIndex: number;
  readonly time_s: number | null;
  readonly code: 'noConvergence' | 'singular' | 'noSolution' | 'noPath';

  constructor(sampleIndex: number, time_s: number | null, code: KinematicsError['code'], reason: string) {
    const at = time_s === null ? `sample ${sampleIndex}` : `sample ${sampleIndex} (t = ${time_s} s)`;
    super(`${at}: ${reason}`);
    this.name = 'KinematicsError';
    this.sampleIndex = sampleIndex;
    this.time_s = time_s;
    this.code = code;
  }
}

/**
 * Joint coordinates (m, in the frame they are given in) flattened as [x0, y0, (z0,) x1, ...] with `dim`
 * values per joint; a missing coordinate becomes NaN rather than a zero that could pass for a joint.
 */
export function flattenJoints(joints: readonly (readonly number[])[], dim: 2 | 3): Float64Array {
  const out = new Float64Array(dim * joints.length);
  for (let i = 0; i < joints.length; i++) {
    for (let k = 0; k < dim; k++) out[dim * i + k] = joints[i]?.[k] ?? NaN;
  }
  return out;
}

/** Inputs of the parametric hexapod layout (lengths in m, angles in deg). */
export interface HexapodLayoutParameters {
  baseRadius_m: number;
  platformRadius_m: number;
  baseHalfAngle_deg: number;
  platformHalfAngle_deg: number;
  /** Height of the platform joints in the platform frame (negative: joints below the deck). */
  platformJointZ_m?: number;
}

/**
 * The 12 joints of a symmetric hexapod, base and platform frames, metres. Base joints come in pairs
 * centred at 0, 120 and 240 deg from +x, each joint baseHalfAngle_deg either side of its pair's centre;
 * platform pairs are centred at 60, 180 and 300 deg. Leg 2k joins the base joint at 120k - a_b deg to
 * the platform joint at 120k - 60 + a_p deg, leg 2k+1 the base joint at 120k + a_b to the platform
 * joint at 120k + 60 - a_p, so legs are numbered counter-clockwise seen from above and every leg spans
 * the same angle d = 60 - a_b - a_p deg between its two joints.
 */
export function hexapodJointsFromLayout(p: HexapodLayoutParameters): {
  baseJoints_m: [number, number, number][];
  platformJoints_m: [number, number, number][];
} {
  const ab = p.baseHalfAngle_deg * RAD_PER_DEG;
  const ap = p.platformHalfAngle_deg * RAD_PER_DEG;
  const zp = p.platformJointZ_m ?? 0;
  const third = (2 * Math.PI) / 3;
  const sixth = Math.PI / 3;
  const baseJoints_m: [number, number, number][] = [];
  const platformJoints_m: [number, number, number][] = [];
  for (let k = 0; k < 3; k++) {
    const c = k * third;
    const b0 = c - ab;
    const b1 = c + ab;
    const p0 = c - sixth + ap;
    const p1 = c + sixth - ap;
    baseJoints_m.push([p.baseRadius_m * Math.cos(b0), p.baseRadius_m * Math.sin(b0), 0]);
    baseJoints_m.push([p.baseRadius_m * Math.cos(b1), p.baseRadius_m * Math.sin(b1), 0]);
    platformJoints_m.push([p.platformRadius_m * Math.cos(p0), p.platformRadius_m * Math.sin(p0), zp]);
    platformJoints_m.push([p.platformRadius_m * Math.cos(p1), p.platformRadius_m * Math.sin(p1), zp]);
  }
  return { baseJoints_m, platformJoints_m };
}

/**
 * Solves the n x n system a x = b in place by Gaussian elimination with partial pivoting (a row-major,
 * destroyed; x written over b). Returns false, leaving b undefined, when a pivot falls below 1e-13
 * times the largest entry of a (numerically singular).
 */
export function solveInPlace(a: Float64Array, b: Float64Array, n: number): boolean {
  let scale = 0;
  for (let i = 0; i < n * n; i++) {
    const v = Math.abs(a[i] as number);
    if (v > scale) scale = v;
  }
  if (!(scale > 0) || !Number.isFinite(scale)) return false;
  const tiny = 1e-13 * scale;
  for (let k = 0; k < n; k++) {
    let piv = k;
    let best = Math.abs(a[k * n + k] as number);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(a[i * n + k] as number);
      if (v > best) {
        best = v;
        piv = i;
      }
    }
    if (!(best > tiny)) return false;
    if (piv !== k) {
      for (let j = k; j < n; j++) {
        const t = a[k * n + j] as number;
        a[k * n + j] = a[piv * n + j] as number;
        a[piv * n + j] = t;
      }
      const t = b[k] as number;
      b[k] = b[piv] as number;
      b[piv] = t;
    }
    const akk = a[k * n + k] as number;
    for (let i = k + 1; i < n; i++) {
      const f = (a[i * n + k] as number) / akk;
      if (f === 0) continue;
      for (let j = k + 1; j < n; j++) a[i * n + j] = (a[i * n + j] as number) - f * (a[k * n + j] as number);
      b[i] = (b[i] as number) - f * (b[k] as number);
    }
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i] as number;
    for (let j = i + 1; j < n; j++) s -= (a[i * n + j] as number) * (b[j] as number);
    b[i] = s / (a[i * n + i] as number);
  }
  return true;
}

/**
 * Eigenvalues of the symmetric n x n matrix a (row-major, destroyed) by cyclic Jacobi rotations,
 * written unsorted into out[0..n-1]. Accurate to a few ulps of the largest eigenvalue.
 */
export function symmetricEigenvaluesInto(a: Float64Array, n: number, out: Float64Array): Float64Array {
  for (let sweep = 0; sweep < 60; sweep++) {
    let off = 0;
    let diag = 0;
    for (let i = 0; i < n; i++) {
      diag += (a[i * n + i] as number) ** 2;
      for (let j = i + 1; j < n; j++) off += (a[i * n + j] as number) ** 2;
    }
    if (off <= 1e-32 * diag || off === 0) break;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q] as number;
        if (apq === 0) continue;
        const app = a[p * n + p] as number;
        const aqq = a[q * n + q] as number;
        // Rutishauser's stable form of the rotation that zeroes a[p][q].
        const theta = (aqq - app) / (2 * apq);
        const t = (theta >= 0 ? 1 : -1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p] as number;
          const akq = a[k * n + q] as number;
          a[k * n + p] = c * akp - s * akq;
          a[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k] as number;
          const aqk = a[q * n + k] as number;
          a[p * n + k] = c * apk - s * aqk;
          a[q * n + k] = s * apk + c * aqk;
        }
      }
    }
  }
  for (let i = 0; i < n; i++) out[i] = a[i * n + i] as number;
  return out;
}

/**
 * 2-norm condition number of the square n x n matrix j (row-major, untouched): sqrt of the ratio of
 * the extreme eigenvalues of j^T j. Squaring limits it to about 1e7 before round-off dominates, ample
 * for flagging near-singular poses. Returns Infinity for a singular matrix. Needs scratch of n*n + n.
 */
export function conditionNumberSquare(j: Float64Array, n: number, scratch: Float64Array): number {
  for (let r = 0; r < n; r++) {
    for (let c = r; c < n; c++) {
      let s = 0;
      for (let k = 0; k < n; k++) s += (j[k * n + r] as number) * (j[k * n + c] as number);
      scratch[r * n + c] = s;
      scratch[c * n + r] = s;
    }
  }
  const eig = scratch.subarray(n * n, n * n + n);
  symmetricEigenvaluesInto(scratch, n, eig);
  let lo = Infinity;
  let hi = 0;
  for (let i = 0; i < n; i++) {
    const v = eig[i] as number;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (!(hi > 0)) return Infinity;
  if (!(lo > hi * 1e-28)) return Infinity;
  return Math.sqrt(hi / lo);
}
