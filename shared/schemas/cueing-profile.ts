// A cueing profile: the versioned parameter set of the classical washout (docs/motion-conventions.md section 4).
// Filter frequencies are in rad/s as in the washout literature; angles and angle rates are in degrees
// because people write and review these files; shared/motion/washout.ts converts to SI.
//
// The defaults are common practice for motion bases of this size, not a standard, and say so wherever
// they are shown. Every section of a profile file may be left out to take the default section; inside
// a section every field is required, and unknown keys are errors so a misspelt field is never ignored.

import { z } from 'zod';
import { formatJsonPath, lineColumn, nearestValueOffset, scanJson } from './json-input';

/** The profile format version this code reads and writes. */
export const CUEING_PROFILE_VERSION = 1;

const positive = (max: number) => z.number().positive().max(max);

const limiterSchema = z.strictObject({
  /** Output never exceeds this magnitude. */
  limit: positive(1000),
  /** Fraction of the limit below which the limiter is exactly linear (gain 1); above it tanh bends toward the limit. */
  knee: z.number().min(0).max(0.99),
});

const axesOf = <T extends z.ZodType>(t: T) => z.strictObject({ x: t, y: t, z: t });

const translationalSecondOrder = z.strictObject({
  order: z.literal(2),
  naturalFrequency_radps: positive(100),
  damping: positive(5),
});
const translationalThirdOrder = z.strictObject({
  order: z.literal(3),
  naturalFrequency_radps: positive(100),
  damping: positive(5),
  /** First-order break frequency; this pole returns the platform to neutral after a sustained input. */
  breakFrequency_radps: positive(100),
});
const translationalHighPass = z.discriminatedUnion('order', [
  translationalSecondOrder,
  translationalThirdOrder,
]);

const rotationalFirstOrder = z.strictObject({ order: z.literal(1), frequency_radps: positive(100) });
const rotationalSecondOrder = z.strictObject({
  order: z.literal(2),
  frequency_radps: positive(100),
  damping: positive(5),
});
const rotationalHighPass = z.discriminatedUnion('order', [rotationalFirstOrder, rotationalSecondOrder]);

const scaleSchema = z.strictObject({
  surge: z.number().min(0).max(2),
  sway: z.number().min(0).max(2),
  heave: z.number().min(0).max(2),
  roll: z.number().min(0).max(2),
  pitch: z.number().min(0).max(2),
  yaw: z.number().min(0).max(2),
});

const inputLimitSchema = z.strictObject({
  /** Soft limit on the scaled specific force deviation from rest, m/s^2. */
  specificForce_mps2: limiterSchema,
  /** Soft limit on the scaled angular velocity, rad/s. */
  angularRate_radps: limiterSchema,
});

/** Default tilt angular acceleration limit, deg/s^2 (common practice: the 3 deg/s rate is reached in 0.6 s). */
export const DEFAULT_TILT_ACCEL_LIMIT_DEGPS2 = 5;

const tiltSchema = z.strictObject({
  lowPassFrequency_radps: positive(100),
  damping: positive(5),
  rateLimit_degps: positive(30),
  /** Limit on the tilt's angular acceleration; profiles stored before it existed take the default. */
  accelLimit_degps2: positive(1000).default(DEFAULT_TILT_ACCEL_LIMIT_DEGPS2),
  angleLimit_deg: positive(30),
});

// Roll and pitch stay well clear of the Euler-rate singularity at 90 deg.
const poseLimitSchema = z.strictObject({
  x_m: positive(5),
  y_m: positive(5),
  z_m: positive(5),
  roll_deg: positive(45),
  pitch_deg: positive(45),
  yaw_deg: positive(180),
  knee: z.number().min(0).max(0.99),
});

const point3 = z.tuple([
  z.number().min(-10).max(10),
  z.number().min(-10).max(10),
  z.number().min(-10).max(10),
]);

/** Common-practice defaults (not a standard); Reid and Nahon's structure with values for a mid-size ride hexapod. */
export const DEFAULT_CUEING_PROFILE = {
  version: CUEING_PROFILE_VERSION,
  name: 'Legwork default (common practice, not a standard)',
  scale: { surge: 0.6, sway: 0.6, heave: 0.5, roll: 0.6, pitch: 0.6, yaw: 0.6 },
  inputLimit: {
    specificForce_mps2: { limit: 4, knee: 0.8 },
    angularRate_radps: { limit: 0.8, knee: 0.8 },
  },
  translational: {
    x: { order: 3, naturalFrequency_radps: 2.5, damping: 1, breakFrequency_radps: 0.5 },
    y: { order: 3, naturalFrequency_radps: 2.5, damping: 1, breakFrequency_radps: 0.5 },
    z: { order: 3, naturalFrequency_radps: 4, damping: 1, breakFrequency_radps: 0.5 },
  },
  tilt: {
    lowPassFrequency_radps: 5,
    damping: 1,
    rateLimit_degps: 3,
    accelLimit_degps2: DEFAULT_TILT_ACCEL_LIMIT_DEGPS2,
    angleLimit_deg: 10,
  },
  rotational: {
    x: { order: 2, frequency_radps: 1, damping: 1 },
    y: { order: 2, frequency_radps: 1, damping: 1 },
    z: { order: 2, frequency_radps: 1, damping: 1 },
  },
  riderReference_m: [0, 0, 1],
  poseLimit: { x_m: 0.25, y_m: 0.25, z_m: 0.18, roll_deg: 18, pitch_deg: 18, yaw_deg: 20, knee: 0.8 },
} as const satisfies z.input<typeof cueingProfileSchemaBase>;

const cueingProfileSchemaBase = z.strictObject({
  version: z.literal(CUEING_PROFILE_VERSION),
  name: z.string().trim().min(1).max(120),
  /** Per-axis gains: surge/sway/heave on specific force, roll/pitch/yaw on angular velocity. */
  scale: scaleSchema,
  inputLimit: inputLimitSchema,
  /** Translational high-pass per platform axis. */
  translational: axesOf(translationalHighPass),
  tilt: tiltSchema,
  /** Rotational high-pass per axis (x roll, y pitch, z yaw). */
  rotational: axesOf(rotationalHighPass),
  /**
   * Rider reference point in the platform frame, m: where the vehicle track's specific force applies
   * and where the cued result is reported as felt force. Rotations are about the platform origin.
   */
  riderReference_m: point3,
  /** Soft limit on the pose offsets: the cued pose never leaves these bounds. */
  poseLimit: poseLimitSchema,
});

/** The cueing profile schema: sections left out take the defaults. */
export const cueingProfileSchema = z.strictObject({
  version: cueingProfileSchemaBase.shape.version,
  name: cueingProfileSchemaBase.shape.name,
  scale: scaleSchema.default(DEFAULT_CUEING_PROFILE.scale),
  inputLimit: inputLimitSchema.default(DEFAULT_CUEING_PROFILE.inputLimit),
  translational: axesOf(translationalHighPass).default(DEFAULT_CUEING_PROFILE.translational),
  tilt: tiltSchema.default(DEFAULT_CUEING_PROFILE.tilt),
  rotational: axesOf(rotationalHighPass).default(DEFAULT_CUEING_PROFILE.rotational),
  riderReference_m: point3.default([...DEFAULT_CUEING_PROFILE.riderReference_m]),
  poseLimit: poseLimitSchema.default(DEFAULT_CUEING_PROFILE.poseLimit),
});

/** A validated cueing profile. */
export type CueingProfile = z.infer<typeof cueingProfileSchema>;

/** One problem in a profile: the dotted path of the field and what is wrong with it. */
export interface ProfileIssue {
  path: string;
  message: string;
  /** 1-based line and column in the source text, when the profile came from JSON text. */
  line?: number;
  column?: number;
}

/** Result of parsing a profile. */
export type ProfileParseResult = { ok: true; profile: CueingProfile } | { ok: false; issues: ProfileIssue[] };

function pathString(path: readonly PropertyKey[]): string {
  return path.length === 0 ? '(profile)' : formatJsonPath(path);
}

function toIssue(i: z.core.$ZodIssue): ProfileIssue {
  return {
    path: pathString(i.path),
    message:
      i.code === 'invalid_type' && /received undefined$/.test(i.message)
        ? 'required field is missing'
        : i.message,
  };
}

/** Validates an already parsed value as a cueing profile; every bad field is named by its path. */
export function parseCueingProfile(input: unknown): ProfileParseResult {
  const r = cueingProfileSchema.safeParse(input);
  if (r.success) return { ok: true, profile: r.data };
  return { ok: false, issues: r.error.issues.map(toIssue) };
}

/** The default profile as a validated object (a fresh copy each call). */
export function defaultCueingProfile(): CueingProfile {
  const r = parseCueingProfile(structuredClone(DEFAULT_CUEING_PROFILE));
  if (!r.ok) throw new Error(`default cueing profile is invalid: ${JSON.stringify(r.issues)}`);
  return r.profile;
}

/** Parses a profile from JSON text; syntax errors and bad fields come back with line and column. */
export function parseCueingProfileJson(text: string): ProfileParseResult {
  const scan = scanJson(text);
  if (!scan.ok) {
    return {
      ok: false,
      issues: [
        { path: '(profile)', message: `not valid JSON: ${scan.reason}`, ...lineColumn(text, scan.offset) },
      ],
    };
  }
  const r = cueingProfileSchema.safeParse(JSON.parse(text));
  if (r.success) return { ok: true, profile: r.data };
  return {
    ok: false,
    issues: r.error.issues.map((i) => {
      const at = nearestValueOffset(scan.positions, i.path);
      return at === undefined ? toIssue(i) : { ...toIssue(i), ...lineColumn(text, at) };
    }),
  };
}
