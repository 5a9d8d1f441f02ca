import { describe, expect, it } from 'vitest';
import { add, eigs, lusolve, matrix, multiply, norm, rotationMatrix, subtract, transpose } from 'mathjs';
import type { Matrix } from 'mathjs';
import {
  conditionNumberSquare,
  KinematicsError,
  solveInPlace,
  symmetricEigenvaluesInto,
} from '../../../shared/motion/base-geometry';
import {
  hexapodConditionNumbers,
  hexapodForward,
  hexapodGeometry,
  hexapodInverse,
  hexapodJacobianInto,
  hexapodLegAccelerations,
  hexapodLegLengthsInto,
  hexapodLegSpeeds,
  poseRates,
} from '../../../shared/motion/hexapod';
import type { PoseColumns } from '../../../shared/motion/hexapod';
import { rotation } from '../../../shared/motion/rotation';
import { RAD_PER_DEG } from '../../../shared/motion/units';
import { demoHexapodBase } from '../../../shared/schemas/motion-base';
import { makeHexapodBase, makePoseTrack, makeRng, makeSmoothMotion } from '../../factories/motion';

const g = hexapodGeometry(demoHexapodBase);

/** Leg lengths for platform origin p and an arbitrary rotation matrix R, written plainly with mathjs. */
function mathjsLegs(p: number[], R: Matrix): number[] {
  const h0 = demoHexapodBase.neutralHeight_m;
  const origin = matrix([p[0]!, p[1]!, p[2]! + h0]);
  return demoHexapodBase.platformJoints_m.map((P, i) => {
    const L = subtract(
      add(origin, multiply(R, matrix(P))),
      matrix(demoHexapodBase.baseJoints_m[i]!),
    ) as Matrix;
    return norm(L) as number;
  });
}

function randomPose(rng: () => number): number[] {
  // Within the demo base's workspace: +-0.15 m and +-0.12 rad.
  return [0.3, 0.3, 0.3, 0.24, 0.24, 0.24].map((span) => (rng() - 0.5) * span);
}

function poseOf(rows: number[][]): PoseColumns {
  const col = (k: number) => Float64Array.from(rows, (r) => r[k]!);
  return { x_m: col(0), y_m: col(1), z_m: col(2), roll_rad: col(3), pitch_rad: col(4), yaw_rad: col(5) };
}

describe('hexapod inverse kinematics', () => {
  it('gives all legs the closed-form length of a symmetric hexapod at neutral', () => {
    // Source: plane geometry (law of cosines): L = sqrt(Rb^2 + Rp^2 - 2 Rb Rp cos d + h^2), with
    // d = 60 - a_b - a_p deg the angle between a leg's two joints in this layout.
    const cases = [
      {
        baseRadius_m: 1.5,
        platformRadius_m: 1.0,
        baseHalfAngle_deg: 10,
        platformHalfAngle_deg: 10,
        neutralHeight_m: 1.6,
      },
      {
        baseRadius_m: 2.0,
        platformRadius_m: 1.2,
        baseHalfAngle_deg: 7,
        platformHalfAngle_deg: 25,
        neutralHeight_m: 1.9,
      },
      {
        baseRadius_m: 1.2,
        platformRadius_m: 1.1,
        baseHalfAngle_deg: 20,
        platformHalfAngle_deg: 5,
        neutralHeight_m: 1.75,
      },
    ];
    for (const c of cases) {
      const d = (60 - c.baseHalfAngle_deg - c.platformHalfAngle_deg) * RAD_PER_DEG;
      const expected = Math.sqrt(
        c.baseRadius_m ** 2 +
          c.platformRadius_m ** 2 -
          2 * c.baseRadius_m * c.platformRadius_m * Math.cos(d) +
          c.neutralHeight_m ** 2,
      );
      const base = makeHexapodBase({
        ...c,
        leg: { min_m: expected - 0.4, max_m: expected + 0.4, speedMax_mps: 0.7, accelMax_mps2: 9 },
      });
      const out = new Float64Array(6);
      hexapodLegLengthsInto(hexapodGeometry(base), 0, 0, 0, 0, 0, 0, out);
      for (const l of out) expect(l).toBeCloseTo(expected, 13);
    }
  });

  it('matches leg lengths written plainly with mathjs on random poses', () => {
    // Source: mathjs rotationMatrix/multiply/norm computing L_i = p + R P_i - B_i independently.
    const rng = makeRng(11);
    const rows = Array.from({ length: 100 }, () => randomPose(rng));
    const legs = hexapodInverse(g, poseOf(rows));
    rows.forEach((q, s) => {
      const R = multiply(
        multiply(rotationMatrix(q[5]!, matrix([0, 0, 1])), rotationMatrix(q[4]!, matrix([0, 1, 0]))),
        rotationMatrix(q[3]!, matrix([1, 0, 0])),
      ) as Matrix;
      const expected = mathjsLegs(q, R);
      for (let i = 0; i < 6; i++) expect(legs[i]![s]).toBeCloseTo(expected[i]!, 13);
    });
  });

  it('gives leg speeds by the analytic formula that match a central difference of lengths', () => {
    // Source: calculus; central difference (l(t+h) - l(t-h)) / 2h at 10 kHz has error ~ h^2 l''' / 6 < 1e-6 m/s.
    const { time_s, pose, rates } = makePoseTrack(20001, 10_000, makeSmoothMotion(3));
    const speeds = hexapodLegSpeeds(g, pose, rates);
    const legs = hexapodInverse(g, pose);
    let worst = 0;
    let peak = 0;
    for (let i = 0; i < 6; i++) {
      for (let s = 1; s < 20000; s++) {
        const cd = (legs[i]![s + 1]! - legs[i]![s - 1]!) / (time_s[s + 1]! - time_s[s - 1]!);
        worst = Math.max(worst, Math.abs(cd - speeds[i]![s]!));
        peak = Math.max(peak, Math.abs(speeds[i]![s]!));
      }
    }
    expect(peak).toBeGreaterThan(0.05);
    expect(worst).toBeLessThan(1e-6);
  });

  it('derives pose rates from the track itself close to the exact rates', () => {
    // Source: the closed-form derivative of the factory's sinusoids; three-point formula error ~ h^2.
    const { time_s, pose, rates } = makePoseTrack(2001, 1000, makeSmoothMotion(4));
    const numeric = poseRates(time_s, pose);
    const a = hexapodLegSpeeds(g, pose, numeric);
    const b = hexapodLegSpeeds(g, pose, rates);
    for (let i = 0; i < 6; i++)
      for (let s = 0; s < 2001; s++) expect(Math.abs(a[i]![s]! - b[i]![s]!)).toBeLessThan(2e-4);
  });

  it('gives leg accelerations (derivative of speeds) that match a second central difference of lengths', () => {
    // Source: calculus; (l(t+h) - 2 l(t) + l(t-h)) / h^2 against d/dt of the analytic speeds, both O(h^2).
    const { time_s, pose, rates } = makePoseTrack(5001, 1000, makeSmoothMotion(5));
    const acc = hexapodLegAccelerations(time_s, hexapodLegSpeeds(g, pose, rates));
    const legs = hexapodInverse(g, pose);
    const h = 1e-3;
    let worst = 0;
    let peak = 0;
    for (let i = 0; i < 6; i++) {
      for (let s = 1; s < 5000; s++) {
        const dd = (legs[i]![s + 1]! - 2 * legs[i]![s]! + legs[i]![s - 1]!) / (h * h);
        worst = Math.max(worst, Math.abs(dd - acc[i]![s]!));
        peak = Math.max(peak, Math.abs(acc[i]![s]!));
      }
    }
    expect(peak).toBeGreaterThan(0.1);
    expect(worst).toBeLessThan(1e-3);
  });

  it('has a twist Jacobian whose rows match finite differences under small translations and base-frame rotations', () => {
    // Source: mathjs leg lengths with R' = rotationMatrix(eps, axis) * R (a rotation about a base-frame axis through
    // the platform origin), so the twist convention [v; w] in the base frame is checked independently.
    const rng = makeRng(12);
    const J = new Float64Array(36);
    const eps = 1e-6;
    for (let k = 0; k < 10; k++) {
      const q = randomPose(rng);
      hexapodJacobianInto(g, q[0]!, q[1]!, q[2]!, q[3]!, q[4]!, q[5]!, J);
      const R = matrix(
        Array.from({ length: 3 }, (_, r) =>
          Array.from(rotation(q[3]!, q[4]!, q[5]!).subarray(3 * r, 3 * r + 3)),
        ),
      );
      const axes = [
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 1],
      ];
      for (let a = 0; a < 3; a++) {
        const dp = q.slice(0, 3).map((v, j) => v + (j === a ? eps : 0));
        const dm = q.slice(0, 3).map((v, j) => v - (j === a ? eps : 0));
        const lp = mathjsLegs(dp, R);
        const lm = mathjsLegs(dm, R);
        const Rp = multiply(rotationMatrix(eps, matrix(axes[a]!)), R) as Matrix;
        const Rm = multiply(rotationMatrix(-eps, matrix(axes[a]!)), R) as Matrix;
        const rp = mathjsLegs(q, Rp);
        const rm = mathjsLegs(q, Rm);
        for (let i = 0; i < 6; i++) {
          expect(J[6 * i + a]).toBeCloseTo((lp[i]! - lm[i]!) / (2 * eps), 8);
          expect(J[6 * i + 3 + a]).toBeCloseTo((rp[i]! - rm[i]!) / (2 * eps), 8);
        }
      }
    }
  });

  it('computes the Jacobian condition number like mathjs eigs of J^T J', () => {
    // Source: mathjs eigs on J^T J; cond_2(J) = sqrt(lambda_max / lambda_min).
    const rng = makeRng(13);
    const J = new Float64Array(36);
    const scratch = new Float64Array(42);
    for (let k = 0; k < 10; k++) {
      const q = randomPose(rng);
      hexapodJacobianInto(g, q[0]!, q[1]!, q[2]!, q[3]!, q[4]!, q[5]!, J);
      const Jm = matrix(Array.from({ length: 6 }, (_, r) => Array.from(J.subarray(6 * r, 6 * r + 6))));
      const values = (eigs(multiply(transpose(Jm), Jm) as Matrix).values as Matrix).toArray() as number[];
      const expected = Math.sqrt(Math.max(...values) / Math.min(...values));
      expect(conditionNumberSquare(J, 6, scratch) / expected).toBeCloseTo(1, 9);
    }
    const cond = hexapodConditionNumbers(g, poseOf([[0, 0, 0, 0, 0, 0]]));
    expect(cond[0]).toBeGreaterThan(1);
    expect(cond[0]).toBeLessThan(100);
  });

  it('solves small systems and finds eigenvalues like mathjs', () => {
    // Source: mathjs lusolve and eigs on the same random matrices.
    const rng = makeRng(14);
    const n = 6;
    const A = Array.from({ length: n }, () => Array.from({ length: n }, () => rng() - 0.5));
    const b = Array.from({ length: n }, () => rng() - 0.5);
    const x = Float64Array.from(b);
    expect(solveInPlace(Float64Array.from(A.flat()), x, n)).toBe(true);
    const ref = (lusolve(A, b) as number[][]).map((r) => r[0]!);
    for (let i = 0; i < n; i++) expect(x[i]).toBeCloseTo(ref[i]!, 12);
    const S = A.map((row, i) => row.map((v, j) => v + A[j]![i]!));
    const ev = Array.from(symmetricEigenvaluesInto(Float64Array.from(S.flat()), n, new Float64Array(n))).sort(
      (p, q) => p - q,
    );
    const evRef = ((eigs(matrix(S)).values as Matrix).toArray() as number[]).sort((p, q) => p - q);
    for (let i = 0; i < n; i++) expect(ev[i]).toBeCloseTo(evRef[i]!, 12);
    expect(solveInPlace(Float64Array.from([1, 2, 2, 4]), Float64Array.from([1, 1]), 2)).toBe(false);
  });

  it('finds the eigenvalues of diagonal, repeated, tiny and graded symmetric matrices', () => {
    // Source: a similarity Q D Q^T keeps the eigenvalues D (a fact of linear algebra); Q is the
    // orthogonal factor of mathjs's own eigendecomposition of an unrelated random matrix.
    const rng = makeRng(31);
    const sorted = (a: ArrayLike<number>) => Array.from(a).sort((p, q) => p - q);
    for (const n of [1, 2, 3, 6]) {
      const R = Array.from({ length: n }, () => Array.from({ length: n }, () => rng() - 0.5));
      const sym = R.map((row, i) => row.map((v, j) => v + R[j]![i]!));
      const Q = matrix(eigs(matrix(sym)).eigenvectors.map((e) => (e.vector as Matrix).toArray() as number[]));
      const spectra = [
        Array.from({ length: n }, (_, i) => i + 1),
        Array.from({ length: n }, () => 2.5), // all equal
        Array.from({ length: n }, (_, i) => (i < n / 2 ? 1 : 4)), // two clusters
        Array.from({ length: n }, (_, i) => 10 ** -i), // graded down to 1e-5
        Array.from({ length: n }, (_, i) => (i === 0 ? 0 : -i)), // singular, negative
      ];
      for (const D of spectra) {
        const A = multiply(
          multiply(transpose(Q), matrix(D.map((d, i) => D.map((_, j) => (i === j ? d : 0))))),
          Q,
        ) as Matrix;
        const flat = Float64Array.from((A.toArray() as number[][]).flat());
        const got = sorted(symmetricEigenvaluesInto(flat, n, new Float64Array(n)));
        const want = sorted(D);
        for (let i = 0; i < n; i++)
          expect(Math.abs(got[i]! - want[i]!)).toBeLessThan(1e-13 * Math.max(1, ...want.map(Math.abs)));
      }
      // Already diagonal: the values come back untouched.
      const diag = new Float64Array(n * n);
      for (let i = 0; i < n; i++) diag[i * n + i] = 3 - i;
      expect(sorted(symmetricEigenvaluesInto(diag, n, new Float64Array(n)))).toEqual(
        sorted(Array.from({ length: n }, (_, i) => 3 - i)),
      );
    }
  });
});

describe('hexapod forward kinematics', () => {
  it('recovers random poses within the workspace from their leg lengths, starting at neutral', () => {
    // Source: our IK is checked against mathjs above; FK(IK(q)) = q is the defining property of FK.
    const rng = makeRng(21);
    for (let k = 0; k < 300; k++) {
      const q = randomPose(rng);
      const legs = hexapodInverse(g, poseOf([q]));
      const back = hexapodForward(g, legs);
      const got = [
        back.x_m[0],
        back.y_m[0],
        back.z_m[0],
        back.roll_rad[0],
        back.pitch_rad[0],
        back.yaw_rad[0],
      ];
      for (let j = 0; j < 6; j++) expect(Math.abs(got[j]! - q[j]!)).toBeLessThan(1e-9);
    }
  });

  it('tracks a smooth uneven-rate track by continuity', () => {
    // Source: FK(IK(track)) = track, sample by sample.
    const { time_s, pose } = makePoseTrack(3000, 100, makeSmoothMotion(22));
    // Make the spacing uneven: drop every third sample.
    const keep = Array.from({ length: 3000 }, (_, i) => i).filter((i) => i % 3 !== 1);
    const pick = (a: Float64Array) => Float64Array.from(keep, (i) => a[i]!);
    const p2: PoseColumns = {
      x_m: pick(pose.x_m),
      y_m: pick(pose.y_m),
      z_m: pick(pose.z_m),
      roll_rad: pick(pose.roll_rad),
      pitch_rad: pick(pose.pitch_rad),
      yaw_rad: pick(pose.yaw_rad),
    };
    const back = hexapodForward(g, hexapodInverse(g, p2), { time_s: pick(time_s) });
    for (const k of ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const) {
      for (let s = 0; s < keep.length; s++) expect(Math.abs(back[k][s]! - p2[k][s]!)).toBeLessThan(1e-9);
    }
  });

  it('throws a KinematicsError naming the sample and time for unreachable leg lengths', () => {
    // Source: geometry; legs of 0.2 m cannot span base and platform joint circles 0.5 m apart in radius.
    const { time_s, pose } = makePoseTrack(10, 100, makeSmoothMotion(23));
    const legs = hexapodInverse(g, pose);
    for (const l of legs) l[6] = 0.2;
    let err: unknown;
    try {
      hexapodForward(g, legs, { time_s });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(KinematicsError);
    expect((err as KinematicsError).sampleIndex).toBe(6);
    expect((err as Error).message).toMatch(/sample 6 \(t = 0\.06 s\)/);
  });
});
