// The 3-D preview places the platform with three.js's matrices; its leg lengths must equal those of
// Legwork's own inverse kinematics (shared/motion), which builds R = Rz Ry Rx by hand. Two independent
// computations of docs/motion-conventions.md sections 1 and 2 agreeing is the check.
import * as three from 'three';
import { describe, expect, it } from 'vitest';
import { demoHexapodBase, demoPlanar3Base } from '../../../shared/schemas/motion-base';
import { hexapodGeometry, hexapodLegLengthsInto } from '../../../shared/motion/hexapod';
import { planar3Geometry, planar3LegLengthsInto } from '../../../shared/motion/planar3';
import type { RunSeries } from '../../../shared/schemas/run-series';
import {
  poseAtBucket,
  previewJoints,
  previewLegLengths,
} from '../../../src/features/runs/utils/preview-geometry';

const POSES = [
  { x_m: 0, y_m: 0, z_m: 0, roll_rad: 0, pitch_rad: 0, yaw_rad: 0 },
  { x_m: 0.08, y_m: -0.05, z_m: 0.04, roll_rad: 0.1, pitch_rad: -0.15, yaw_rad: 0.2 },
  { x_m: -0.12, y_m: 0.1, z_m: -0.06, roll_rad: -0.2, pitch_rad: 0.12, yaw_rad: -0.3 },
];

describe('3-D preview geometry', () => {
  it('gives the hexapod leg lengths of the kinematics code at several poses', () => {
    const g = hexapodGeometry(demoHexapodBase);
    const expected = new Float64Array(6);
    for (const pose of POSES) {
      hexapodLegLengthsInto(
        g,
        pose.x_m,
        pose.y_m,
        pose.z_m,
        pose.roll_rad,
        pose.pitch_rad,
        pose.yaw_rad,
        expected,
      );
      const legs = previewLegLengths(previewJoints(three, demoHexapodBase, pose));
      expect(legs).toHaveLength(6);
      for (let i = 0; i < 6; i++) expect(legs[i]).toBeCloseTo(expected[i]!, 9);
    }
  });

  it('gives the planar stage leg lengths of the kinematics code (x, y, yaw only)', () => {
    const g = planar3Geometry(demoPlanar3Base);
    const expected = new Float64Array(3);
    for (const pose of POSES) {
      planar3LegLengthsInto(g, pose.x_m, pose.y_m, pose.yaw_rad, expected);
      const legs = previewLegLengths(previewJoints(three, demoPlanar3Base, pose));
      for (let i = 0; i < 3; i++) expect(legs[i]).toBeCloseTo(expected[i]!, 9);
    }
  });

  it('puts a symmetric hexapod at neutral with all legs equal to the plane-geometry length', () => {
    // Plane geometry (law of cosines): L = sqrt(Rb^2 + Rp^2 - 2 Rb Rp cos d + h^2), with d the
    // angle between a leg's two joints; the demo base has Rb 1.5 m, Rp 1.0 m, h 1.6 m.
    const legs = previewLegLengths(previewJoints(three, demoHexapodBase, POSES[0]!));
    const b = demoHexapodBase.baseJoints_m[0]!;
    const p = demoHexapodBase.platformJoints_m[0]!;
    const d = Math.atan2(b[1], b[0]) - Math.atan2(p[1], p[0]);
    const L = Math.sqrt(1.5 ** 2 + 1.0 ** 2 - 2 * 1.5 * 1.0 * Math.cos(d) + 1.6 ** 2);
    for (const l of legs) expect(l).toBeCloseTo(L, 9);
  });

  it('reads the pose of a bucket as the middle of each band, and zero for axes the base lacks', () => {
    const band = (lo: number, hi: number) => ({ min: [0, lo], max: [0, hi] });
    const series = {
      pose: { x_m: band(0.1, 0.2), y_m: band(-0.2, 0), yaw_rad: band(0.05, 0.07) },
    } as unknown as RunSeries;
    const pose = poseAtBucket(series, 1);
    expect(pose.x_m).toBeCloseTo(0.15, 12);
    expect(pose.y_m).toBeCloseTo(-0.1, 12);
    expect(pose.yaw_rad).toBeCloseTo(0.06, 12);
    expect(pose.z_m).toBe(0);
    expect(pose.roll_rad).toBe(0);
  });
});
