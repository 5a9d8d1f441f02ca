// Findings JSON (docs/motion-conventions.md section 7): the output of a budget check, read by the CLI, the worker, the
// review page and the plots that mark each finding's time span.
import { z } from 'zod';

export const CHECK_NAMES = [
  'stroke',
  'legSpeed',
  'legAccel',
  'envelope',
  'jerk',
  'angularSpeed',
  'angularAccel',
  'msdv',
  'wrms',
  'vdv',
  'conditioning',
  'startEnd',
  'outOfBand',
  'legForce',
] as const;
export const checkNameSchema = z.enum(CHECK_NAMES);
export type CheckName = z.infer<typeof checkNameSchema>;

export const severitySchema = z.enum(['hard', 'comfort']);
export type Severity = z.infer<typeof severitySchema>;

/** Hard limits (actuators, rider envelope) cannot be cleared, only cued again; comfort limits can be. */
export const CHECK_SEVERITY: Readonly<Record<CheckName, Severity>> = {
  stroke: 'hard',
  legSpeed: 'hard',
  legAccel: 'hard',
  envelope: 'hard',
  jerk: 'comfort',
  angularSpeed: 'comfort',
  angularAccel: 'comfort',
  msdv: 'comfort',
  wrms: 'comfort',
  vdv: 'comfort',
  conditioning: 'comfort',
  startEnd: 'hard',
  outOfBand: 'comfort',
  legForce: 'hard',
};

/** The unit of each check's value and limit (the unit of the budget key it checks). */
export const CHECK_UNIT: Readonly<Record<CheckName, string>> = {
  stroke: 'm',
  legSpeed: 'm/s',
  legAccel: 'm/s^2',
  // Absolute rows (duration 0) compare g; timed rows compare the time spent outside, in s.
  envelope: 'g or s',
  jerk: 'm/s^3',
  angularSpeed: 'rad/s',
  angularAccel: 'rad/s^2',
  msdv: 'm/s^1.5',
  wrms: 'm/s^2',
  vdv: 'm/s^1.75',
  conditioning: '1',
  // The pose offset or rate that is furthest outside its tolerance; the finding carries its unit.
  startEnd: 'm, rad, m/s or rad/s',
  // The share of an axis' r.m.s. that the anti-alias low-pass removed, against 0.05.
  outOfBand: '1',
  legForce: 'N',
};

const finiteNumber = z.number().refine(Number.isFinite, 'must be finite');

// `axis` and `row` are additions to the findings shape of docs/motion-conventions.md section 7: an envelope finding names the seat (its subject),
// and a reviewer also needs to know which axis and which envelope row it broke.
export const findingSchema = z.object({
  check: checkNameSchema,
  severity: severitySchema,
  subject: z.string().min(1),
  start_s: finiteNumber,
  end_s: finiteNumber,
  value: finiteNumber,
  limit: finiteNumber,
  ratio: finiteNumber,
  axis: z.enum(['x', 'y', 'z']).optional(),
  row: z.number().int().nonnegative().optional(),
  /** startEnd: which pose offset or rate (e.g. "pitch", "x rate") and its unit. */
  quantity: z.string().min(1).optional(),
  unit: z.string().min(1).optional(),
  /** Envelope findings: the whole time (s) the axis spent outside this row's band over the track. */
  totalOutside_s: finiteNumber.optional(),
  /** Envelope findings: how many separate excursions outside this row's band the track has. */
  excursions: z.number().int().nonnegative().optional(),
});
export type Finding = z.infer<typeof findingSchema>;

export const useSchema = z.object({
  check: checkNameSchema,
  subject: z.string().min(1),
  ratio: finiteNumber,
  axis: z.enum(['x', 'y', 'z']).optional(),
  /**
   * The worst value and the limit it was measured against, in the check's unit (absent on envelope
   * uses, whose limit depends on the row and the excursion's duration, and on start/end uses, whose
   * worst quantity may be a position, an angle or a speed).
   */
  value: finiteNumber.optional(),
  limit: finiteNumber.optional(),
  /** Envelope uses: the row that gave the worst ratio, with its whole time outside (s) and excursions. */
  row: z.number().int().nonnegative().optional(),
  totalOutside_s: finiteNumber.optional(),
  excursions: z.number().int().nonnegative().optional(),
});
export type Use = z.infer<typeof useSchema>;

/** Whole-track rider figures behind the wrms and msdv uses (ISO 2631-1), for the report and the review page. */
export const comfortSummarySchema = z.object({
  wrms_mps2: z.object({ x: finiteNumber, y: finiteNumber, z: finiteNumber }),
  wrmsSeat: z.object({ x: z.string(), y: z.string(), z: z.string() }),
  vdv_mps1_75: z.object({ x: finiteNumber, y: finiteNumber, z: finiteNumber }),
  /** The seat with the highest VDV per axis (VDV is reported at its own worst seat). */
  vdvSeat: z.object({ x: z.string(), y: z.string(), z: z.string() }).optional(),
  /** Crest factor (peak / r.m.s. of the weighted signal) at the wrms seat per axis; above 9 the r.m.s. may understate (ISO 2631-1 6.2.1). */
  crestFactor: z.object({ x: finiteNumber, y: finiteNumber, z: finiteNumber }).optional(),
  /** Maximum transient vibration value: the largest 1 s running r.m.s. (ISO 2631-1 6.3.1), m/s^2, at its worst seat. */
  mtvv_mps2: z.object({ x: finiteNumber, y: finiteNumber, z: finiteNumber }).optional(),
  mtvvSeat: z.object({ x: z.string(), y: z.string(), z: z.string() }).optional(),
  msdvZ_mps1_5: finiteNumber,
  msdvSeat: z.string(),
  /** Km * MSDV_z with Km = 1/3 (ISO 2631-1 Annex D): per cent of people who may vomit. */
  vomitShare_pct: finiteNumber,
  /** How the weightings were evaluated (rate used, any band left out). */
  weightingNote: z.string(),
});
export type ComfortSummary = z.infer<typeof comfortSummarySchema>;

export const checkResultSchema = z.object({
  within: z.boolean(),
  findings: z.array(findingSchema),
  uses: z.array(useSchema),
  comfort: comfortSummarySchema.optional(),
  /** Plain-language notes on how the checks were run (a filter left out, a band not covered). */
  notes: z.array(z.string()).optional(),
});
export type CheckResult = z.infer<typeof checkResultSchema>;

/** Exit codes of `legwork check` and `legwork process` (docs/motion-conventions.md section 7). */
export const EXIT_WITHIN = 0;
export const EXIT_BAD_INPUT = 2;
export const EXIT_COMFORT = 3;
export const EXIT_HARD = 4;

/** 0 within budget, 3 over a comfort limit only, 4 over any hard limit. */
export function exitCodeFor(result: Pick<CheckResult, 'findings'>): 0 | 3 | 4 {
  let code: 0 | 3 | 4 = EXIT_WITHIN;
  for (const f of result.findings) {
    if (f.severity === 'hard') return EXIT_HARD;
    code = EXIT_COMFORT;
  }
  return code;
}
