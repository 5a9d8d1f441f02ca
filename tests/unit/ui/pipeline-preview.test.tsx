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

  it('stands each seat on a post along the platform normal, as high as the seat sits above the deck', () => {
    // The platform joints of the demo base lie in the deck plane (z = 0 of the platform frame): the
    // normal from the cross product of two joint-to-joint vectors (plain vector algebra) is the
    // direction of every post, and the post's length is the seat's height in the platform frame.
    for (const pose of POSES) {
      const j = previewJoints(three, demoHexapodBase, pose);
      const at = (a: Float64Array, i: number) => [a[3 * i]!, a[3 * i + 1]!, a[3 * i + 2]!] as const;
      const [p0, p1, p2] = [at(j.platform, 0), at(j.platform, 2), at(j.platform, 4)];
      const u = [p1[0] - p0[0], p1[1] - p0[1], p1[2] - p0[2]];
      const w = [p2[0] - p0[0], p2[1] - p0[1], p2[2] - p0[2]];
      const nrm = [
        u[1]! * w[2]! - u[2]! * w[1]!,
        u[2]! * w[0]! - u[0]! * w[2]!,
        u[0]! * w[1]! - u[1]! * w[0]!,
      ];
      const len = Math.hypot(nrm[0]!, nrm[1]!, nrm[2]!);
      const n = nrm.map((c) => (c / len) * Math.sign(nrm[2]!));
      demoHexapodBase.seats_m.forEach((seat, k) => {
        const top = at(j.seats, k);
        const foot = at(j.seatFeet, k);
        const post = [top[0] - foot[0], top[1] - foot[1], top[2] - foot[2]];
        for (let a = 0; a < 3; a++) expect(post[a]).toBeCloseTo(seat[2]! * n[a]!, 9);
        // The foot lies in the deck plane.
        const d = (foot[0] - p0[0]) * n[0]! + (foot[1] - p0[1]) * n[1]! + (foot[2] - p0[2]) * n[2]!;
        expect(d).toBeCloseTo(0, 9);
      });
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
