// The decimated chart series of a cue run (series.json in storage, served to the run page): each
// signal reduced to min/max per bucket on one shared time axis, so a 10-minute 1 kHz run draws from
// a few thousand points. Every band has exactly one value per entry of the time axis: a series that
// does not is refused, wherever it is read.
import { z } from 'zod';

const band = z
  .object({ min: z.array(z.number()), max: z.array(z.number()) })
  .refine((b) => b.min.length === b.max.length, 'min and max differ in length');
export type SeriesBand = z.infer<typeof band>;

export const runSeriesSchema = z
  .object({
    rate_hz: z.number(),
    samples: z.number().int(),
    /** Start time of each bucket (s); the last bucket is the last sample alone, at the take's end. */
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
    /** The stroke band the legs must stay in: [min + margin, max - margin], its middle and the full range (m). */
    stroke: z.object({ min_m: z.number(), max_m: z.number(), margin_m: z.number(), mid_m: z.number() }),
    /** Stretches of the input with no samples (over 5 x the median spacing), bridged by interpolation (s). */
    gaps: z.array(z.object({ start_s: z.number(), end_s: z.number() })).optional(),
    /**
     * With a touch-up: every column of the take (SI name, e.g. fx_mps2 or roll_rad) as uploaded and
     * after the touch-up, on this time axis (a column is held at its end value outside its span).
     */
    touchup: z
      .object({ columns: z.array(z.object({ name: z.string(), before: band, after: band })) })
      .optional(),
  })
  .superRefine((s, ctx) => {
    const n = s.time_s.length;
    const check = (b: SeriesBand | null, path: (string | number)[]) => {
      if (b && b.min.length !== n) {
        ctx.addIssue({
          code: 'custom',
          path,
          message: `band of ${b.min.length} values on a time axis of ${n}`,
        });
      }
    };
    for (const axis of ['x', 'y', 'z'] as const) {
      check(s.force[axis].input, ['force', axis, 'input']);
      check(s.force[axis].cued, ['force', axis, 'cued']);
    }
    for (const [k, b] of Object.entries(s.pose)) check(b, ['pose', k]);
    s.legs.forEach((b, i) => check(b, ['legs', i]));
    s.legForce?.forEach((b, i) => check(b, ['legForce', i]));
    s.touchup?.columns.forEach((c, i) => {
      check(c.before, ['touchup', 'columns', i, 'before']);
      check(c.after, ['touchup', 'columns', i, 'after']);
    });
  });
export type RunSeries = z.infer<typeof runSeriesSchema>;
