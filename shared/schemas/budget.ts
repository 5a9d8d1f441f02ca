// The motion-safety budget (docs/motion-conventions.md sections 5-7): actuator margin, the rider's acceleration-duration
// envelope and the comfort limits. Written once here and used by the form, the API, the worker and the CLI.
//
// The envelope numbers of a real venue come from its safety engineering and the code that applies
// there (for example ASTM F2291 or EN 13814 / ISO 17842-1); Legwork ships demo numbers only.
import { z } from 'zod';
import { parseJsonWith } from './json-input';

// Re-exported so a budget's users (the editor, the API) find its JSON helpers beside it.
export {
  JsonInputError,
  formatJsonPath,
  formatProblem,
  lineColumn,
  locateJsonPath,
  parseJsonWith,
  scanJson,
} from './json-input';
export type { InputProblem } from './json-input';

export const ENVELOPE_AXES = ['x', 'y', 'z'] as const;
export type EnvelopeAxis = (typeof ENVELOPE_AXES)[number];

/** Specific force of a rider sitting still on a level platform, per axis, in g (z at rest = +1 g). */
export const REST_G: Readonly<Record<EnvelopeAxis, number>> = { x: 0, y: 0, z: 1 };

const finite = (what: string) =>
  z
    .number({ error: (iss) => (iss.input === undefined ? `${what} is missing` : `${what} must be a number`) })
    .refine(Number.isFinite, `${what} must be finite`);

/** One envelope row [duration_s, lower_g, upper_g]: outside [lower, upper] for less than duration_s at a time. */
export const envelopeRowSchema = z.tuple([
  finite('duration_s').refine((d) => d >= 0, 'duration_s must not be negative'),
  finite('lower_g'),
  finite('upper_g'),
]);
export type EnvelopeRow = z.infer<typeof envelopeRowSchema>;

// Row checks sit on each axis (not on the whole budget) so that they run, and are reported, even when
// another part of the file is wrong: zod runs a refinement only on a value that parsed.
const envelopeAxisSchema = (axis: EnvelopeAxis) =>
  z
    .array(envelopeRowSchema)
    .min(1, 'needs at least one row')
    .superRefine((rows, ctx) => {
      const rest = REST_G[axis];
      rows.forEach(([duration_s, lower_g, upper_g], i) => {
        if (!(lower_g < upper_g)) {
          ctx.addIssue({
            code: 'custom',
            path: [i],
            message: `lower_g (${lower_g}) must be less than upper_g (${upper_g})`,
          });
        } else if (!(lower_g < rest && rest < upper_g)) {
          // A rider sitting still must be inside every row, or every ride would fail at the load position.
          ctx.addIssue({
            code: 'custom',
            path: [i],
            message: `[${lower_g}, ${upper_g}] g must contain the at-rest value ${rest} g strictly`,
          });
        }
        const prev = i > 0 ? rows[i - 1] : undefined;
        if (prev && !(duration_s > prev[0])) {
          ctx.addIssue({
            code: 'custom',
            path: [i, 0],
            message: `rows must be sorted by strictly increasing duration_s (${duration_s} after ${prev[0]})`,
          });
        }
      });
    });

const positive = (what: string) => finite(what).refine((v) => v > 0, `${what} must be greater than 0`);

export const comfortLimitsSchema = z.strictObject({
  jerkMax_mps3: positive('jerkMax_mps3'),
  angularSpeedMax_radps: positive('angularSpeedMax_radps'),
  angularAccelMax_radps2: positive('angularAccelMax_radps2'),
  msdvZMax_mps1_5: positive('msdvZMax_mps1_5'),
  wrmsMax_mps2: positive('wrmsMax_mps2'),
  /** Optional VDV limit per axis at the worst seat (ISO 2631-1 fourth-power dose), m/s^1.75. */
  vdvMax_mps1_75: positive('vdvMax_mps1_75').optional(),
  // Dimensionless; a condition number is at least 1, so a limit at or below 1 could never be met.
  conditioningMax: finite('conditioningMax')
    .refine((v) => v > 1, 'conditioningMax must be greater than 1')
    .optional(),
});

/**
 * How far from neutral and how fast the platform may be at the first and the last sample (check
 * "startEnd"). The defaults are the product's choice (common practice is to start and end a show at
 * the home position, at rest), not a standard's value.
 */
export const startEndToleranceSchema = z.strictObject({
  position_m: positive('startEnd.position_m'),
  angle_rad: positive('startEnd.angle_rad'),
  speed_mps: positive('startEnd.speed_mps'),
  angularSpeed_radps: positive('startEnd.angularSpeed_radps'),
});
export type StartEndTolerance = z.infer<typeof startEndToleranceSchema>;

/** Tolerances used when a budget has no startEnd block: 5 mm, 0.25 deg, 10 mm/s, 0.5 deg/s. */
export const DEFAULT_START_END_TOLERANCE: StartEndTolerance = {
  position_m: 0.005,
  angle_rad: (0.25 * Math.PI) / 180,
  speed_mps: 0.01,
  angularSpeed_radps: (0.5 * Math.PI) / 180,
};

export const budgetSchema = z.strictObject({
  name: z.string().trim().min(1).max(200).optional(),
  version: z.union([z.string().trim().min(1).max(50), z.number().int().nonnegative()]).optional(),
  /** Where the numbers come from (the venue's engineering, the applicable code); free text. */
  source: z.string().max(2000).optional(),
  strokeMargin_m: finite('strokeMargin_m').refine((v) => v >= 0, 'strokeMargin_m must not be negative'),
  envelope: z.strictObject({
    x: envelopeAxisSchema('x'),
    y: envelopeAxisSchema('y'),
    z: envelopeAxisSchema('z'),
  }),
  comfort: comfortLimitsSchema,
  /** Neutral-and-at-rest tolerances at the track's ends; DEFAULT_START_END_TOLERANCE when absent. */
  startEnd: startEndToleranceSchema.optional(),
});

export type Budget = z.infer<typeof budgetSchema>;
export type ComfortLimits = z.infer<typeof comfortLimitsSchema>;

/**
 * Demo budget: invented round numbers to try the product with, not taken from any standard or code.
 * A venue's safety reviewer replaces the envelope with the one that applies to the ride.
 */
export const DEMO_BUDGET: Budget = {
  name: 'DEMO budget - invented values, not from any standard',
  version: 1,
  source:
    'Demo numbers shipped with Legwork for trying the product. Replace them with the envelope and limits ' +
    "from the venue's safety engineering and the code that applies to the ride.",
  strokeMargin_m: 0.02,
  envelope: {
    x: [
      [0, -1.0, 1.0],
      [1.0, -0.5, 0.5],
    ],
    y: [
      [0, -0.8, 0.8],
      [1.0, -0.4, 0.4],
    ],
    z: [
      [0, 0.2, 1.8],
      [1.0, 0.5, 1.5],
    ],
  },
  comfort: {
    jerkMax_mps3: 25,
    angularSpeedMax_radps: 0.7,
    angularAccelMax_radps2: 4,
    msdvZMax_mps1_5: 12,
    wrmsMax_mps2: 0.8,
    // The demo bases read about 2.4 (hexapod) and 1.2 (planar stage) at neutral.
    conditioningMax: 50,
  },
};

/** Parses and validates budget JSON text; throws JsonInputError naming every bad field. */
export function parseBudgetText(text: string, file = 'budget.json'): Budget {
  return parseJsonWith(budgetSchema, text, file);
}
