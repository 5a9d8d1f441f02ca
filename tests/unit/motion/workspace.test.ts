// The reachable workspace (shared/motion/workspace.ts) checked with leg lengths computed another way:
// the joints moved with mathjs's rotation matrices (mathjs rotationMatrix, right-handed rotation
// about a unit axis), not with the kinematics code the workspace search uses.
import { describe, expect, it } from 'vitest';
import { add, matrix, multiply, norm, rotationMatrix, subtract } from 'mathjs';
import type { Matrix } from 'mathjs';
import { hexapodWorkspace, motionBaseWorkspace, planar3Workspace } from '../../../shared/motion/workspace';
import type { WorkspaceAxis, WorkspaceRow } from '../../../shared/motion/workspace';
import { RAD_PER_DEG } from '../../../shared/motion/units';
import {
  demoHexapodBase,
  demoHexapodInput,
  demoPlanar3Base,
  parseMotionBase,
} from '../../../shared/schemas/motion-base';
import type { HexapodBase, Planar3Base } from '../../../shared/schemas/motion-base';

const AXIS_OF: Record<string, [number, number, number]> = {
  surge: [1, 0, 0],
  sway: [0, 1, 0],
  heave: [0, 0, 1],
  roll: [1, 0, 0],
  pitch: [0, 1, 0],
  yaw: [0, 0, 1],
};
const ANGULAR = new Set<WorkspaceAxis>(['roll', 'pitch', 'yaw']);

/** Hexapod leg lengths (m) for a displacement along one axis (m, or deg for angles), with mathjs. */
function hexLegs(base: HexapodBase, axis: WorkspaceAxis, value: number): number[] {
  const dir = AXIS_OF[axis]!;
  const angular = ANGULAR.has(axis);
  const R = angular
    ? rotationMatrix(value * RAD_PER_DEG, matrix(dir))
    : matrix([
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 1],
      ]);
  const t = angular ? [0, 0, 0] : dir.map((d) => d * value);
  const origin = matrix([t[0]!, t[1]!, t[2]! + base.neutralHeight_m]);
  return base.platformJoints_m.map((P, i) => {
    const L = subtract(
      add(origin, multiply(R as Matrix, matrix(P))),
      matrix(base.baseJoints_m[i]!),
    ) as Matrix;
    return norm(L) as number;
  });
}

/** Planar stage leg lengths (m) for surge/sway (m) or yaw (deg), with mathjs in the plane z = 0. */
function planarLegs(base: Planar3Base, axis: WorkspaceAxis, value: number): number[] {
  const dir = AXIS_OF[axis]!;
  const angular = axis === 'yaw';
  const R = angular
    ? rotationMatrix(value * RAD_PER_DEG, matrix([0, 0, 1]))
    : matrix([
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 1],
      ]);
  const origin = matrix(angular ? [0, 0, 0] : dir.map((d) => d * value));
  return base.platformJoints_m.map((P, i) => {
    const B = base.baseJoints_m[i]!;
    const L = subtract(
      add(origin, multiply(R as Matrix, matrix([P[0], P[1], 0]))),
      matrix([B[0], B[1], 0]),
    ) as Matrix;
    return norm(L) as number;
  });
}

/** Worst excess over the stroke (m): > 0 when some leg is beyond [min, max], <= 0 when all are within. */
function excess(legs: number[], leg: { min_m: number; max_m: number }): number {
  return Math.max(...legs.map((l) => Math.max(leg.min_m - l, l - leg.max_m)));
}

function checkExtremes(
  rows: WorkspaceRow[],
  legsAt: (axis: WorkspaceAxis, value: number) => number[],
  leg: { min_m: number; max_m: number },
) {
  for (const r of rows) {
    for (const [sign, end] of [
      [-1, r.negative],
      [1, r.positive],
    ] as const) {
      const at = legsAt(r.axis, sign * end.reach);
      const label = `${r.axis} ${sign > 0 ? '+' : '-'}${end.reach} ${r.unit}`;
      expect(end.limitedBy, label).not.toBeNull();
      // At the extreme: no leg beyond its stroke, and at least one at its limit within 1e-6 m.
      expect(excess(at, leg), label).toBeLessThanOrEqual(1e-9);
      expect(excess(at, leg), label).toBeGreaterThan(-1e-6);
      const limiting = end.limitedBy!;
      const limit = limiting.end === 'min' ? leg.min_m : leg.max_m;
      expect(Math.abs(at[limiting.leg]! - limit), label).toBeLessThan(1e-6);
      // A little beyond (1e-4 m or 1e-4 deg), some leg is past its stroke.
      const beyond = legsAt(r.axis, sign * (end.reach + 1e-4));
      expect(excess(beyond, leg), `${label} + 1e-4`).toBeGreaterThan(0);
    }
  }
}

describe('hexapod workspace (demo dome)', () => {
  const rows = hexapodWorkspace(demoHexapodBase);
  const byAxis = Object.fromEntries(rows.map((r) => [r.axis, r])) as Record<WorkspaceAxis, WorkspaceRow>;

  it('reports all six axes in m and deg', () => {
    expect(rows.map((r) => [r.axis, r.unit])).toEqual([
      ['surge', 'm'],
      ['sway', 'm'],
      ['heave', 'm'],
      ['roll', 'deg'],
      ['pitch', 'deg'],
      ['yaw', 'deg'],
    ]);
    for (const r of rows) {
      expect(r.negative.reach).toBeGreaterThan(0);
      expect(r.positive.reach).toBeGreaterThan(0);
    }
  });

  it('puts a leg at its stroke limit at every extreme, none beyond, and one beyond a little further', () => {
    checkExtremes(rows, (axis, v) => hexLegs(demoHexapodBase, axis, v), demoHexapodBase.leg);
  });

  it('gives mirror-equal sway, roll and yaw on the symmetric layout', () => {
    // Geometric fact: the parametric layout (base pairs at 0/120/240 deg +- a_b, platform pairs at
    // 60/180/300 deg -+ a_p) is symmetric under the reflection y -> -y, which maps each leg onto its
    // pair partner. The reflection turns sway y into -y, roll phi into -phi and yaw psi into -psi
    // (M Rx(phi) M = Rx(-phi), M Rz(psi) M = Rz(-psi) for M = diag(1, -1, 1)), so the set of leg
    // lengths, and hence the reach, is the same both ways. Surge, heave and pitch are left unchanged
    // by it, and the three-fold layout has no fore-aft mirror, so surge need not be symmetric.
    for (const axis of ['sway', 'roll', 'yaw'] as const) {
      expect(byAxis[axis].positive.reach, axis).toBeCloseTo(byAxis[axis].negative.reach, 8);
    }
    expect(Math.abs(byAxis.surge.positive.reach - byAxis.surge.negative.reach)).toBeGreaterThan(1e-3);
  });

  it('matches the closed form for pure heave', () => {
    // Closed form, from the leg geometry: in this layout every leg spans the angle d = 60 - a_b - a_p
    // deg between its base joint (radius R_b) and platform joint (radius R_p), so its horizontal
    // projection is r = sqrt(R_b^2 + R_p^2 - 2 R_b R_p cos d) (law of cosines), the same for all six
    // legs. Under pure heave z the leg length is L(z) = sqrt(r^2 + (h0 + z_p + z)^2), so the leg
    // reaches L_max at z_up = sqrt(L_max^2 - r^2) - h0 - z_p and L_min at
    // z_down = sqrt(L_min^2 - r^2) - h0 - z_p (all six legs at once).
    const Rb = demoHexapodInput.baseRadius_m;
    const Rp = demoHexapodInput.platformRadius_m;
    const d =
      (60 - demoHexapodInput.baseHalfAngle_deg - demoHexapodInput.platformHalfAngle_deg) * RAD_PER_DEG;
    const r2 = Rb * Rb + Rp * Rp - 2 * Rb * Rp * Math.cos(d);
    const h0 = demoHexapodInput.neutralHeight_m;
    const { min_m, max_m } = demoHexapodInput.leg;
    const up = Math.sqrt(max_m * max_m - r2) - h0;
    const down = h0 - Math.sqrt(min_m * min_m - r2);
    // By hand for the demo numbers: r^2 = 2.25 + 1 - 3 cos 40 deg = 0.95187, so up = 2.08281 - 1.6
    // = 0.48281 m and down = 1.6 - 1.13934 = 0.46066 m.
    expect(up).toBeCloseTo(0.48281, 4);
    expect(down).toBeCloseTo(0.46066, 4);
    expect(byAxis.heave.positive.reach).toBeCloseTo(up, 8);
    expect(byAxis.heave.negative.reach).toBeCloseTo(down, 8);
    expect(byAxis.heave.positive.limitedBy?.end).toBe('max');
    expect(byAxis.heave.negative.limitedBy?.end).toBe('min');
  });

  it('matches the closed form for pure heave with platform joints below the deck', () => {
    const input = { ...demoHexapodInput, platformJointZ_m: -0.1, neutralHeight_m: 1.7 };
    const base = parseMotionBase(input) as HexapodBase;
    const heave = hexapodWorkspace(base).find((r) => r.axis === 'heave')!;
    const r2 = 1.5 ** 2 + 1 - 2 * 1.5 * Math.cos(40 * RAD_PER_DEG);
    expect(heave.positive.reach).toBeCloseTo(Math.sqrt(2.3 ** 2 - r2) - 1.6, 8);
    expect(heave.negative.reach).toBeCloseTo(1.6 - Math.sqrt(1.5 ** 2 - r2), 8);
  });

  it('is a zero reach with no limiting leg when neutral itself is outside the stroke', () => {
    // parseMotionBase refuses such a base; the workspace still answers without a loop.
    const base = { ...demoHexapodBase, leg: { ...demoHexapodBase.leg, max_m: 1.8 } };
    const rows2 = hexapodWorkspace(base);
    for (const r of rows2) expect(r.positive).toEqual({ reach: 0, limitedBy: null });
  });
});

describe('planar stage workspace (demo arcade)', () => {
  const rows = planar3Workspace(demoPlanar3Base);

  it('reports surge, sway and yaw only', () => {
    expect(rows.map((r) => r.axis)).toEqual(['surge', 'sway', 'yaw']);
    expect(motionBaseWorkspace(demoPlanar3Base)).toEqual(rows);
  });

  it('puts a leg at its stroke limit at every extreme, none beyond, and one beyond a little further', () => {
    checkExtremes(rows, (axis, v) => planarLegs(demoPlanar3Base, axis, v), demoPlanar3Base.leg);
  });
});
