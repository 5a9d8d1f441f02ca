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

// Work space of symmetricEigenvaluesInto, kept between calls (it runs once per sample of a track).
let eigenScratch = new Float64Array(18);

/**
 * Eigenvalues of the symmetric n x n matrix a (row-major, destroyed), written unsorted into
 * out[0..n-1]: Householder reduction to tridiagonal form, then the implicit QL iteration with
 * Wilkinson's shift on the tridiagonal (Golub and Van Loan, "Matrix Computations", 8.3; Wilkinson and
 * Reinsch, "Handbook for Automatic Computation" II, procedure tql1). Backward stable: each eigenvalue
 * is within a few ulps of the largest in magnitude.
 */
export function symmetricEigenvaluesInto(a: Float64Array, n: number, out: Float64Array): Float64Array {
  const d = out;
  if (eigenScratch.length < 3 * n) eigenScratch = new Float64Array(3 * n);
  const e = eigenScratch.subarray(0, n); // e[i] couples d[i] and d[i + 1]; e[n - 1] = 0
  const v = eigenScratch.subarray(n, 2 * n);
  const p = eigenScratch.subarray(2 * n, 3 * n);
  for (let k = 0; k < n - 2; k++) {
    // The reflector that zeroes column k below its subdiagonal, applied to the trailing block.
    let norm2 = 0;
    for (let i = k + 1; i < n; i++) norm2 += (a[i * n + k] as number) ** 2;
    const x0 = a[(k + 1) * n + k] as number;
    const tail = norm2 - x0 * x0;
    if (!(tail > 0)) {
      e[k] = x0;
      continue;
    }
    const alpha = x0 >= 0 ? -Math.sqrt(norm2) : Math.sqrt(norm2);
    for (let i = k + 1; i < n; i++) v[i] = a[i * n + k] as number;
    v[k + 1] = x0 - alpha;
    const vv = tail + (v[k + 1] as number) ** 2;
    const beta = 2 / vv;
    // p = beta A v, K = beta (v . p) / 2, q = p - K v; A <- A - v q^T - q v^T.
    let vp = 0;
    for (let i = k + 1; i < n; i++) {
      let s = 0;
      for (let j = k + 1; j < n; j++) s += (a[i * n + j] as number) * (v[j] as number);
      s *= beta;
      p[i] = s;
      vp += (v[i] as number) * s;
    }
    const K = (beta * vp) / 2;
    for (let i = k + 1; i < n; i++) p[i] = (p[i] as number) - K * (v[i] as number);
    for (let i = k + 1; i < n; i++) {
      const vi = v[i] as number;
      const qi = p[i] as number;
      for (let j = k + 1; j <= i; j++) {
        const x = (a[i * n + j] as number) - vi * (p[j] as number) - qi * (v[j] as number);
        a[i * n + j] = x;
        a[j * n + i] = x;
      }
    }
    e[k] = alpha;
  }
  for (let i = 0; i < n; i++) d[i] = a[i * n + i] as number;
  if (n >= 2) e[n - 2] = a[(n - 1) * n + (n - 2)] as number;
  e[n - 1] = 0;
  for (let l = 0; l < n; l++) {
    for (let iter = 0; ; iter++) {
      let m = l;
      for (; m < n - 1; m++) {
        const dd = Math.abs(d[m] as number) + Math.abs(d[m + 1] as number);
        if (Math.abs(e[m] as number) <= Number.EPSILON * dd) break;
      }
      if (m === l) break;
      if (iter === 60) {
        // Only a matrix holding NaN gets here; its eigenvalues are not numbers either.
        out.fill(NaN);
        return out;
      }
      let g = ((d[l + 1] as number) - (d[l] as number)) / (2 * (e[l] as number));
      let r = Math.sqrt(g * g + 1);
      g = (d[m] as number) - (d[l] as number) + (e[l] as number) / (g + (g >= 0 ? r : -r));
      let s = 1;
      let c = 1;
      let shift = 0;
      let i = m - 1;
      for (; i >= l; i--) {
        const f = s * (e[i] as number);
        const b = c * (e[i] as number);
        r = Math.sqrt(f * f + g * g);
        e[i + 1] = r;
        if (r === 0) {
          // Deflation inside the sweep: undo the last shift and start again from l.
          d[i + 1] = (d[i + 1] as number) - shift;
          e[m] = 0;
          break;
        }
        s = f / r;
        c = g / r;
        g = (d[i + 1] as number) - shift;
        r = ((d[i] as number) - g) * s + 2 * c * b;
        shift = s * r;
        d[i + 1] = g + shift;
        g = c * r - b;
      }
      if (r === 0 && i >= l) continue;
      d[l] = (d[l] as number) - shift;
      e[l] = g;
      e[m] = 0;
    }
  }
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
