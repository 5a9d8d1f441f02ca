// Geometry of the 3-D motion base preview, computed with three.js's own matrices so the picture does
// not depend on the kinematics code it illustrates.
import type * as Three from 'three';
import type { MotionBase } from '../../../../shared/schemas/motion-base';
import type { RunSeries } from '../../../../shared/schemas/run-series';

export type ThreeModule = typeof Three;

/** A pose offset from neutral (m, rad), angles in the roll-pitch-yaw order of docs/motion-conventions.md section 1. */
export interface PreviewPose {
  x_m: number;
  y_m: number;
  z_m: number;
  roll_rad: number;
  pitch_rad: number;
  yaw_rad: number;
}

const POSE_KEYS = ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const;

/** The pose at bucket `i` of a run's series: the middle of each min/max band (m, rad); absent axes are 0. */
export function poseAtBucket(series: RunSeries, i: number): PreviewPose {
  const pose: PreviewPose = { x_m: 0, y_m: 0, z_m: 0, roll_rad: 0, pitch_rad: 0, yaw_rad: 0 };
  for (const key of POSE_KEYS) {
    const band = series.pose[key];
    const lo = band?.min[i];
    const hi = band?.max[i];
    if (lo !== undefined && hi !== undefined && Number.isFinite(lo) && Number.isFinite(hi))
      pose[key] = (lo + hi) / 2;
  }
  return pose;
}

/**
 * Base joints and platform joints in the base frame (m, x forward, y left, z up), flattened xyz per
 * joint, for a pose offset: platform origin at (x, y, h0 + z) (hexapod) or (x, y, 0) (planar stage),
 * rotated by R = Rz(yaw) Ry(pitch) Rx(roll).
 */
export function previewJoints(
  three: ThreeModule,
  base: MotionBase,
  pose: PreviewPose,
): { base: Float64Array; platform: Float64Array; seats: Float64Array; seatFeet: Float64Array } {
  const n = base.baseJoints_m.length;
  const baseOut = new Float64Array(3 * n);
  const platformOut = new Float64Array(3 * n);
  const hexapod = base.kind === 'hexapod';
  // three.js's 'ZYX' Euler order builds Rz * Ry * Rx, the fixed-axis roll-pitch-yaw order of docs/motion-conventions.md section 1.
  const euler = hexapod
    ? new three.Euler(pose.roll_rad, pose.pitch_rad, pose.yaw_rad, 'ZYX')
    : new three.Euler(0, 0, pose.yaw_rad, 'ZYX');
  const transform = new three.Matrix4().makeRotationFromEuler(euler);
  transform.setPosition(pose.x_m, pose.y_m, hexapod ? base.neutralHeight_m + pose.z_m : 0);
  const v = new three.Vector3();
  for (let i = 0; i < n; i++) {
    const b = base.baseJoints_m[i] ?? [];
    const p = base.platformJoints_m[i] ?? [];
    baseOut[3 * i] = b[0] ?? 0;
    baseOut[3 * i + 1] = b[1] ?? 0;
    baseOut[3 * i + 2] = b[2] ?? 0;
    v.set(p[0] ?? 0, p[1] ?? 0, p[2] ?? 0).applyMatrix4(transform);
    platformOut[3 * i] = v.x;
    platformOut[3 * i + 1] = v.y;
    platformOut[3 * i + 2] = v.z;
  }
  // The seats ride on the platform: the same transform from the platform frame.
  // Each seat's foot is the point of the platform plane (z = 0 of the platform frame) below it, so a
  // post from foot to seat shows which way the deck carries the rider.
  const seatsOut = new Float64Array(3 * base.seats_m.length);
  const feetOut = new Float64Array(3 * base.seats_m.length);
  base.seats_m.forEach((seat, k) => {
    v.set(seat[0] ?? 0, seat[1] ?? 0, seat[2] ?? 0).applyMatrix4(transform);
    seatsOut[3 * k] = v.x;
    seatsOut[3 * k + 1] = v.y;
    seatsOut[3 * k + 2] = v.z;
    v.set(seat[0] ?? 0, seat[1] ?? 0, 0).applyMatrix4(transform);
    feetOut[3 * k] = v.x;
    feetOut[3 * k + 1] = v.y;
    feetOut[3 * k + 2] = v.z;
  });
  return { base: baseOut, platform: platformOut, seats: seatsOut, seatFeet: feetOut };
}

/** Leg lengths (m) between matching base and platform joints from previewJoints. */
export function previewLegLengths(joints: { base: Float64Array; platform: Float64Array }): Float64Array {
  const n = joints.base.length / 3;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const dx = (joints.platform[3 * i] as number) - (joints.base[3 * i] as number);
    const dy = (joints.platform[3 * i + 1] as number) - (joints.base[3 * i + 1] as number);
    const dz = (joints.platform[3 * i + 2] as number) - (joints.base[3 * i + 2] as number);
    out[i] = Math.sqrt(dx * dx + dy * dy + dz * dz);
  }
  return out;
}
