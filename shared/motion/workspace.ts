// Reachable workspace of a motion base at neutral orientation, one degree of freedom at a time
// (docs/motion-conventions.md sections 1-2 for the axes and poses): for each axis and each direction,
// the largest displacement from neutral, along that axis alone, for which inverse kinematics keeps
// every leg within its stroke [leg.min_m, leg.max_m]. The motion base schema defines no other limit
// (no joint angles), so the legs' stroke is the only one checked.
//
// Method: march outward from neutral in small steps until some leg leaves its stroke, then bisect the
// last step. The excursion is the edge of the reachable stretch that contains neutral; a feasible
// stretch beyond an infeasible one does not count (the platform could not get there along the axis).

import type { HexapodBase, MotionBase, Planar3Base } from '../schemas/motion-base';
import { hexapodGeometry, hexapodLegLengthsInto } from './hexapod';
import { planar3Geometry, planar3LegLengthsInto } from './planar3';
import { DEG_PER_RAD, RAD_PER_DEG } from './units';

export const HEXAPOD_AXES = ['surge', 'sway', 'heave', 'roll', 'pitch', 'yaw'] as const;
export const PLANAR3_AXES = ['surge', 'sway', 'yaw'] as const;
export type WorkspaceAxis = (typeof HEXAPOD_AXES)[number];

/** Which leg stops the motion at one end of an axis, and at which end of its stroke. */
export interface LimitingLeg {
  /** 0-based leg index. */
  leg: number;
  end: 'min' | 'max';
  /** The leg's length at the extreme (m). */
  length_m: number;
}

/** One direction of one axis: how far it reaches (m or deg, always >= 0) and what stops it. */
export interface WorkspaceEnd {
  /** Largest displacement from neutral in this direction (m for surge/sway/heave, deg for angles). */
  reach: number;
  /** The leg at its limit there; null when the search range ended first (`reach` is then a lower bound). */
  limitedBy: LimitingLeg | null;
}

export interface WorkspaceRow {
  axis: WorkspaceAxis;
  unit: 'm' | 'deg';
  /** Toward negative values of the axis (e.g. heave down, negative roll). */
  negative: WorkspaceEnd;
  /** Toward positive values of the axis (e.g. heave up, positive roll). */
  positive: WorkspaceEnd;
}

export interface WorkspaceOptions {
  /** Search step while marching outward: translations (m), default 0.005. */
  step_m?: number;
  /** Search step while marching outward: rotations (rad), default 0.25 deg. */
  step_rad?: number;
  /** Bisection stops when the bracket is narrower than this (m or rad), default 1e-10. */
  tolerance?: number;
}

const DEFAULT_STEP_M = 0.005;
const DEFAULT_STEP_RAD = 0.25 * RAD_PER_DEG;
const DEFAULT_TOLERANCE = 1e-10;
/** Rotations are searched up to a half turn either way. */
const MAX_ANGLE_RAD = Math.PI;

/** Leg lengths at a displacement `t` (m or rad) along one axis into `out`. */
type LegsAt = (t: number, out: Float64Array) => void;

/** The first leg outside [min, max] in `legs`, or null when all are within. */
function violation(legs: Float64Array, min_m: number, max_m: number): LimitingLeg | null {
  for (let i = 0; i < legs.length; i++) {
    const l = legs[i] as number;
    if (!(l >= min_m)) return { leg: i, end: 'min', length_m: l };
    if (!(l <= max_m)) return { leg: i, end: 'max', length_m: l };
  }
  return null;
}

/** The leg closest to leaving its stroke in the direction the bracket left it. */
function limitingAt(legs: Float64Array, min_m: number, max_m: number, broken: LimitingLeg): LimitingLeg {
  let best = broken.leg;
  let bestGap = Infinity;
  for (let i = 0; i < legs.length; i++) {
    const l = legs[i] as number;
    const gap = Math.min(l - min_m, max_m - l);
    if (gap < bestGap) {
      bestGap = gap;
      best = i;
    }
  }
  const l = legs[best] as number;
  return { leg: best, end: l - min_m < max_m - l ? 'min' : 'max', length_m: l };
}

/**
 * Reach in direction `sign` along one axis: march by `step` up to `range`, then bisect the step in
 * which a leg first left [min_m, max_m].
 */
function reachAlong(
  legsAt: LegsAt,
  count: number,
  min_m: number,
  max_m: number,
  sign: 1 | -1,
  step: number,
  range: number,
  tolerance: number,
): WorkspaceEnd {
  const legs = new Float64Array(count);
  legsAt(0, legs);
  if (violation(legs, min_m, max_m)) return { reach: 0, limitedBy: null };
  let lo = 0;
  let hi = NaN;
  let broken: LimitingLeg | null = null;
  for (let t = step; t <= range + 1e-12; t += step) {
    legsAt(sign * t, legs);
    broken = violation(legs, min_m, max_m);
    if (broken) {
      hi = t;
      break;
    }
    lo = t;
  }
  if (!broken) return { reach: lo, limitedBy: null };
  while (hi - lo > tolerance) {
    const mid = 0.5 * (lo + hi);
    legsAt(sign * mid, legs);
    const v = violation(legs, min_m, max_m);
    if (v) {
      hi = mid;
      broken = v;
    } else lo = mid;
  }
  legsAt(sign * lo, legs);
  return { reach: lo, limitedBy: limitingAt(legs, min_m, max_m, broken) };
}

function row(
  axis: WorkspaceAxis,
  legsAt: LegsAt,
  count: number,
  leg: { min_m: number; max_m: number },
  angular: boolean,
  range: number,
  options: WorkspaceOptions,
): WorkspaceRow {
  const step = angular ? (options.step_rad ?? DEFAULT_STEP_RAD) : (options.step_m ?? DEFAULT_STEP_M);
  const tolerance = options.tolerance ?? DEFAULT_TOLERANCE;
  const end = (sign: 1 | -1): WorkspaceEnd => {
    const e = reachAlong(legsAt, count, leg.min_m, leg.max_m, sign, step, range, tolerance);
    return angular ? { ...e, reach: e.reach * DEG_PER_RAD } : e;
  };
  return { axis, unit: angular ? 'deg' : 'm', negative: end(-1), positive: end(1) };
}

/** Largest distance between a base joint and a platform joint (m): no leg can translate farther than this plus its max. */
function translationRange(base: { baseJoints_m: readonly (readonly number[])[] }, max_m: number): number {
  let r = 0;
  for (const j of base.baseJoints_m) r = Math.max(r, Math.hypot(...j));
  return 2 * (r + max_m);
}

/** Workspace of a hexapod at neutral orientation: surge, sway, heave (m) and roll, pitch, yaw (deg). */
export function hexapodWorkspace(base: HexapodBase, options: WorkspaceOptions = {}): WorkspaceRow[] {
  const g = hexapodGeometry(base);
  const range_m = translationRange(base, base.leg.max_m) + base.neutralHeight_m;
  const axes: [WorkspaceAxis, LegsAt, boolean][] = [
    ['surge', (t, out) => hexapodLegLengthsInto(g, t, 0, 0, 0, 0, 0, out), false],
    ['sway', (t, out) => hexapodLegLengthsInto(g, 0, t, 0, 0, 0, 0, out), false],
    ['heave', (t, out) => hexapodLegLengthsInto(g, 0, 0, t, 0, 0, 0, out), false],
    ['roll', (t, out) => hexapodLegLengthsInto(g, 0, 0, 0, t, 0, 0, out), true],
    ['pitch', (t, out) => hexapodLegLengthsInto(g, 0, 0, 0, 0, t, 0, out), true],
    ['yaw', (t, out) => hexapodLegLengthsInto(g, 0, 0, 0, 0, 0, t, out), true],
  ];
  return axes.map(([axis, legsAt, angular]) =>
    row(axis, legsAt, 6, base.leg, angular, angular ? MAX_ANGLE_RAD : range_m, options),
  );
}

/** Workspace of a planar three-leg stage: surge and sway (m) and yaw (deg), its own three axes. */
export function planar3Workspace(base: Planar3Base, options: WorkspaceOptions = {}): WorkspaceRow[] {
  const g = planar3Geometry(base);
  const range_m = translationRange(base, base.leg.max_m);
  const axes: [WorkspaceAxis, LegsAt, boolean][] = [
    ['surge', (t, out) => planar3LegLengthsInto(g, t, 0, 0, out), false],
    ['sway', (t, out) => planar3LegLengthsInto(g, 0, t, 0, out), false],
    ['yaw', (t, out) => planar3LegLengthsInto(g, 0, 0, t, out), true],
  ];
  return axes.map(([axis, legsAt, angular]) =>
    row(axis, legsAt, 3, base.leg, angular, angular ? MAX_ANGLE_RAD : range_m, options),
  );
}

/** Workspace of a validated motion base (either kind), one row per axis the base moves in. */
export function motionBaseWorkspace(base: MotionBase, options: WorkspaceOptions = {}): WorkspaceRow[] {
  return base.kind === 'hexapod' ? hexapodWorkspace(base, options) : planar3Workspace(base, options);
}
