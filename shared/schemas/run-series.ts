// The decimated chart series of a cue run (series.json in storage, served to the run page): each
// signal reduced to min/max per bucket on one shared time axis, so a 10-minute 1 kHz run draws from
// a few thousand points.
import { z } from 'zod';

const band = z.object({ min: z.array(z.number()), max: z.array(z.number()) });
export type SeriesBand = z.infer<typeof band>;

export const runSeriesSchema = z.object({
  rate_hz: z.number(),
  samples: z.number().int(),
  time_s: z.array(z.number()),
  /** Specific force per axis (m/s^2): the vehicle input (absent for pose and legs takes) and what the first seat feels. */
  force: z.object({
    x: z.object({ input: band.nullable(), cued: band }),
    y: z.object({ input: band.nullable(), cued: band }),
    z: z.object({ input: band.nullable(), cued: band }),
  }),
  /** Pose offsets from neutral (m, rad). */
  pose: z.record(z.string(), band),
  /** Leg lengths (m), leg1 first. */
  legs: z.array(band),
  /** Axial leg forces (N, compression positive), leg1 first, when the base carries a payload. */
  legForce: z.array(band).optional(),
  /** The actuators' force rating (N), when the base gives one. */
  forceMax_N: z.number().optional(),
  /** The stroke band the legs must stay in: [min + margin, max - margin] and the full range (m). */
  stroke: z.object({ min_m: z.number(), max_m: z.number(), margin_m: z.number() }),
  /** Stretches of the input with no samples (over 5 x the median spacing), bridged by interpolation (s). */
  gaps: z.array(z.object({ start_s: z.number(), end_s: z.number() })).optional(),
});
export type RunSeries = z.infer<typeof runSeriesSchema>;
