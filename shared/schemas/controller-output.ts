// How a venue's motion controller takes its track: actuator positions from the fully retracted length,
// optionally as encoder counts, with a ramp from neutral before the show and back after it. Part of a
// venue's motion base settings; used by the package builder, the CLI and the venue editor.
import { z } from 'zod';

export const RAMP_PROFILES = ['quintic', 'raisedCosine'] as const;
export const rampProfileSchema = z.enum(RAMP_PROFILES);
export type RampProfile = z.infer<typeof rampProfileSchema>;

export const controllerOutputSchema = z.strictObject({
  /** Encoder counts = round(position_mm x countsPerMm + zeroOffset_counts); absent: millimetres only. */
  encoder: z
    .strictObject({
      countsPerMm: z.number().positive().max(1e6),
      zeroOffset_counts: z.number().int().min(-2_147_483_648).max(2_147_483_647).default(0),
    })
    .optional(),
  /** Ramp from neutral at rest to the show's first pose and back after its last (s; 0 = none). */
  ramp: z
    .strictObject({
      duration_s: z.number().min(0).max(120).default(3),
      profile: rampProfileSchema.default('quintic'),
    })
    .default({ duration_s: 3, profile: 'quintic' }),
});
export type ControllerOutput = z.infer<typeof controllerOutputSchema>;

/** Settings used when a venue has none: millimetres, a 3 s quintic ramp (a Legwork default, not a standard). */
export const DEFAULT_CONTROLLER_OUTPUT: ControllerOutput = controllerOutputSchema.parse({});
