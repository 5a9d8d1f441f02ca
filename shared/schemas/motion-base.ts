// Motion base files (docs/motion-conventions.md section 7): one schema used by the CLI, the API, the worker and the
// venue editor. A hexapod may be given by its twelve joints or by the parametric form, which is turned
// into joints here; every base is then checked for geometry that cannot work (coincident joints, a
// neutral pose outside the stroke, a singular neutral pose).

import { z } from 'zod';
import { conditionNumberSquare, hexapodJointsFromLayout } from '../motion/base-geometry';
import { hexapodGeometry, hexapodJacobianInto, hexapodLegLengthsInto } from '../motion/hexapod';
import { planar3Geometry, planar3JacobianInto, planar3LegLengthsInto } from '../motion/planar3';

const vec3 = z.tuple([z.number(), z.number(), z.number()]);
const vec2 = z.tuple([z.number(), z.number()]);

/** Actuator limits shared by all legs (m, m/s, m/s^2). */
export const legLimitsSchema = z.strictObject({
  min_m: z.number().positive(),
  max_m: z.number().positive(),
  speedMax_mps: z.number().positive(),
  accelMax_mps2: z.number().positive(),
  /** Axial force rating of each actuator (N), compression or tension; checked when the base has a payload. */
  forceMax_N: z.number().positive().optional(),
});

/**
 * What the platform carries, riders included, in the platform frame: mass (kg), centre of mass (m)
 * and the inertia tensor about the centre of mass in platform axes (kg m^2), as
 * [Ixx, Iyy, Izz, Ixy, Ixz, Iyz]. Used for the actuator forces (hexapods).
 */
export const payloadSchema = z
  .strictObject({
    mass_kg: z.number().positive(),
    centreOfMass_m: vec3,
    inertia_kgm2: z.tuple([
      z.number().nonnegative(),
      z.number().nonnegative(),
      z.number().nonnegative(),
      z.number(),
      z.number(),
      z.number(),
    ]),
  })
  .superRefine((p, ctx) => {
    // A physical inertia tensor is positive semi-definite: each principal moment at most the sum of the
    // other two (triangle inequality) and the products bounded by the moments.
    const [a, b, c, xy, xz, yz] = p.inertia_kgm2;
    const tri = a <= b + c + 1e-9 && b <= a + c + 1e-9 && c <= a + b + 1e-9;
    const det = a * (b * c - yz * yz) - xy * (xy * c - yz * xz) + xz * (xy * yz - b * xz);
    if (
      !tri ||
      a * b < xy * xy ||
      a * c < xz * xz ||
      b * c < yz * yz ||
      det < -1e-9 * Math.max(1, a * b * c)
    ) {
      ctx.addIssue({
        code: 'custom',
        path: ['inertia_kgm2'],
        message:
          'not a physical inertia tensor (each moment at most the sum of the other two, positive semi-definite)',
      });
    }
  });
export type Payload = z.infer<typeof payloadSchema>;

const common = {
  name: z.string().min(1).max(200).optional(),
  leg: legLimitsSchema,
  controllerRate_hz: z.number().positive().max(100_000),
  /** Rider reference points in the platform frame (m). */
  seats_m: z.array(vec3).min(1).max(64),
  /**
   * The ride maker's sequence from the show back to neutral and park, and what the controller does on
   * an emergency stop, in plain words as the ride maker gives it; absent when none is given.
   */
  park: z.string().trim().min(1).max(4000).optional(),
};

/** Hexapod given by its joints: six base joints (base frame) and six platform joints (platform frame), m. */
export const hexapodBaseSchema = z.strictObject({
  kind: z.literal('hexapod'),
  baseJoints_m: z.array(vec3).length(6),
  platformJoints_m: z.array(vec3).length(6),
  neutralHeight_m: z.number().positive(),
  payload: payloadSchema.optional(),
  ...common,
});

/** Hexapod given by the parametric form (see hexapodJointsFromLayout for the joint layout). */
export const hexapodParametricSchema = z.strictObject({
  kind: z.literal('hexapod'),
  baseRadius_m: z.number().positive(),
  platformRadius_m: z.number().positive(),
  baseHalfAngle_deg: z.number().positive().lt(60),
  platformHalfAngle_deg: z.number().positive().lt(60),
  platformJointZ_m: z.number().optional(),
  neutralHeight_m: z.number().positive(),
  payload: payloadSchema.optional(),
  ...common,
});

/** Planar 3-RPR stage: three base joints and three platform joints, 2-D, m. */
export const planar3BaseSchema = z.strictObject({
  kind: z.literal('planar3'),
  baseJoints_m: z.array(vec2).length(3),
  platformJoints_m: z.array(vec2).length(3),
  ...common,
});

export type HexapodBase = z.infer<typeof hexapodBaseSchema>;
export type HexapodParametricInput = z.input<typeof hexapodParametricSchema>;
export type Planar3Base = z.infer<typeof planar3BaseSchema>;
/** A validated motion base, always in joint form. */
export type MotionBase = HexapodBase | Planar3Base;

/** One problem in a motion base: JSON path (e.g. "leg.min_m", "baseJoints_m[2]") and what is wrong. */
export interface MotionBaseIssue {
  path: string;
  message: string;
}

/** A motion base that failed validation; `issues` lists every problem found. */
export class MotionBaseError extends Error {
  readonly issues: readonly MotionBaseIssue[];
  constructor(issues: MotionBaseIssue[]) {
    super(`invalid motion base:\n${issues.map((i) => `  ${i.path}: ${i.message}`).join('\n')}`);
    this.name = 'MotionBaseError';
    this.issues = issues;
  }
}

/** Joints closer than this (m) count as one point. */
export const COINCIDENT_JOINTS_M = 1e-3;
/** A neutral pose whose Jacobian condition number exceeds this is treated as singular. */
export const NEUTRAL_CONDITION_MAX = 1e6;

function formatPath(path: readonly PropertyKey[]): string {
  let s = '';
  for (const p of path) {
    if (typeof p === 'number') s += `[${p}]`;
    else s += s === '' ? String(p) : `.${String(p)}`;
  }
  return s === '' ? '(root)' : s;
}

function fmt(v: number): string {
  return Number(v.toPrecision(6)).toString();
}

function coincident(points: readonly (readonly number[])[], field: string, issues: MotionBaseIssue[]): void {
  for (let i = 0; i < points.length; i++) {
    for (let j = 0; j < i; j++) {
      const a = points[i] ?? [];
      const b = points[j] ?? [];
      let d2 = 0;
      for (let k = 0; k < a.length; k++) d2 += ((a[k] ?? 0) - (b[k] ?? 0)) ** 2;
      if (Math.sqrt(d2) < COINCIDENT_JOINTS_M) {
        issues.push({
          path: `${field}[${i}]`,
          message: `joint ${i + 1} coincides with joint ${j + 1} (${fmt(Math.sqrt(d2))} m apart; at least ${COINCIDENT_JOINTS_M} m needed)`,
        });
      }
    }
  }
}

function strokeIssues(
  leg: HexapodBase['leg'],
  neutral: Float64Array,
  count: number,
  neutralPath: string,
  issues: MotionBaseIssue[],
): void {
  if (leg.min_m >= leg.max_m) {
    issues.push({
      path: 'leg.min_m',
      message: `must be below leg.max_m (${fmt(leg.min_m)} >= ${fmt(leg.max_m)} m)`,
    });
    return;
  }
  for (let i = 0; i < count; i++) {
    const l = neutral[i] as number;
    if (!(l >= leg.min_m && l <= leg.max_m)) {
      issues.push({
        path: neutralPath,
        message: `leg ${i + 1} is ${fmt(l)} m long at the neutral pose, outside the stroke [${fmt(leg.min_m)}, ${fmt(leg.max_m)}] m`,
      });
    }
  }
}

function checkHexapod(b: HexapodBase): MotionBaseIssue[] {
  const issues: MotionBaseIssue[] = [];
  coincident(b.baseJoints_m, 'baseJoints_m', issues);
  coincident(b.platformJoints_m, 'platformJoints_m', issues);
  const g = hexapodGeometry(b);
  const neutral = new Float64Array(6);
  hexapodLegLengthsInto(g, 0, 0, 0, 0, 0, 0, neutral);
  strokeIssues(b.leg, neutral, 6, 'neutralHeight_m', issues);
  if (issues.length === 0) {
    const J = new Float64Array(36);
    hexapodJacobianInto(g, 0, 0, 0, 0, 0, 0, J);
    const cond = conditionNumberSquare(J, 6, new Float64Array(42));
    if (!(cond <= NEUTRAL_CONDITION_MAX)) {
      issues.push({
        path: 'platformJoints_m',
        message: `the geometry is singular at the neutral pose (Jacobian condition number ${Number.isFinite(cond) ? fmt(cond) : 'infinite'}): the platform would not be held in every direction`,
      });
    }
  }
  return issues;
}

function checkPlanar3(b: Planar3Base): MotionBaseIssue[] {
  const issues: MotionBaseIssue[] = [];
  coincident(b.baseJoints_m, 'baseJoints_m', issues);
  coincident(b.platformJoints_m, 'platformJoints_m', issues);
  const g = planar3Geometry(b);
  const neutral = new Float64Array(3);
  planar3LegLengthsInto(g, 0, 0, 0, neutral);
  // A planar stage has no neutral height: a neutral stroke problem is in the joints.
  strokeIssues(b.leg, neutral, 3, 'platformJoints_m', issues);
  if (issues.length === 0) {
    const J = new Float64Array(9);
    planar3JacobianInto(g, 0, 0, 0, J);
    const cond = conditionNumberSquare(J, 3, new Float64Array(12));
    if (!(cond <= NEUTRAL_CONDITION_MAX)) {
      issues.push({
        path: 'platformJoints_m',
        message: `the geometry is singular at the neutral pose (Jacobian condition number ${Number.isFinite(cond) ? fmt(cond) : 'infinite'}), e.g. all three legs meet in one point`,
      });
    }
  }
  return issues;
}

function zodIssues(error: z.ZodError): MotionBaseIssue[] {
  return error.issues.map((i) => ({ path: formatPath(i.path), message: i.message }));
}

/** Joint form of a parametric hexapod input (lengths m, angles deg); input already schema-checked. */
export function hexapodFromParameters(p: z.infer<typeof hexapodParametricSchema>): HexapodBase {
  const joints = hexapodJointsFromLayout(p);
  const out: HexapodBase = {
    kind: 'hexapod',
    baseJoints_m: joints.baseJoints_m,
    platformJoints_m: joints.platformJoints_m,
    neutralHeight_m: p.neutralHeight_m,
    leg: p.leg,
    controllerRate_hz: p.controllerRate_hz,
    seats_m: p.seats_m,
  };
  if (p.name !== undefined) out.name = p.name;
  if (p.payload !== undefined) out.payload = p.payload;
  return out;
}

/**
 * Validates a motion base (parsed JSON, lengths in m) and returns it in joint form; throws
 * MotionBaseError listing every problem with its JSON path.
 */
export function parseMotionBase(input: unknown): MotionBase {
  if (typeof input !== 'object' || input === null || Array.isArray(input)) {
    throw new MotionBaseError([{ path: '(root)', message: 'expected a JSON object' }]);
  }
  const kind = (input as { kind?: unknown }).kind;
  if (kind === 'hexapod') {
    if ('baseRadius_m' in input) {
      const r = hexapodParametricSchema.safeParse(input);
      if (!r.success) throw new MotionBaseError(zodIssues(r.error));
      const base = hexapodFromParameters(r.data);
      const issues = checkHexapod(base);
      if (issues.length > 0) {
        throw new MotionBaseError(
          issues.map((i) => ({
            path: i.path,
            message: `${i.message} (joints generated from the parametric form)`,
          })),
        );
      }
      return base;
    }
    const r = hexapodBaseSchema.safeParse(input);
    if (!r.success) throw new MotionBaseError(zodIssues(r.error));
    const issues = checkHexapod(r.data);
    if (issues.length > 0) throw new MotionBaseError(issues);
    return r.data;
  }
  if (kind === 'planar3') {
    const r = planar3BaseSchema.safeParse(input);
    if (!r.success) throw new MotionBaseError(zodIssues(r.error));
    const issues = checkPlanar3(r.data);
    if (issues.length > 0) throw new MotionBaseError(issues);
    return r.data;
  }
  throw new MotionBaseError([
    {
      path: 'kind',
      message: `expected "hexapod" or "planar3", got ${kind === undefined ? 'nothing' : JSON.stringify(kind)}`,
    },
  ]);
}

/** Parametric input of the fictional demo hexapod "Harbour Lights Dome" (lengths m, angles deg). */
export const demoHexapodInput = {
  kind: 'hexapod',
  name: 'Harbour Lights Dome',
  baseRadius_m: 1.5,
  platformRadius_m: 1.0,
  baseHalfAngle_deg: 10,
  platformHalfAngle_deg: 10,
  neutralHeight_m: 1.6,
  leg: { min_m: 1.5, max_m: 2.3, speedMax_mps: 0.7, accelMax_mps2: 9 },
  controllerRate_hz: 100,
  seats_m: [
    [0.25, 0.4, 0.9],
    [0.25, -0.4, 0.9],
    [-0.35, 0.4, 0.9],
    [-0.35, -0.4, 0.9],
  ],
} satisfies HexapodParametricInput;

/** The demo hexapod "Harbour Lights Dome" in joint form (fictional; demo numbers only). */
export const demoHexapodBase: HexapodBase = parseMotionBase(demoHexapodInput) as HexapodBase;

/** The fictional demo planar x-y-yaw stage "Tidewater Arcade" (m; demo numbers only). */
export const demoPlanar3Base: Planar3Base = parseMotionBase({
  kind: 'planar3',
  name: 'Tidewater Arcade',
  baseJoints_m: [
    [0, 2],
    [-1.7320508075688772, -1],
    [1.7320508075688772, -1],
  ],
  platformJoints_m: [
    [-0.51961524227066314, 0.3],
    [0, -0.6],
    [0.51961524227066314, 0.3],
  ],
  leg: { min_m: 1.3, max_m: 2.3, speedMax_mps: 0.5, accelMax_mps2: 4 },
  controllerRate_hz: 100,
  seats_m: [
    [0.2, 0.3, 0.8],
    [0.2, -0.3, 0.8],
  ],
}) as Planar3Base;
