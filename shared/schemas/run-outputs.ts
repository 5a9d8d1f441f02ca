// The contract of a cue run's outputs, written once: the job payload that asks for a run, the package
// layout (file names and content types), the manifest's file entries and the summary stored with the
// run (the typed `cue_runs.summary` column). The worker, `legwork process`, the server routes, the
// client and the tests all use these.
import { z } from 'zod';
import { comfortSummarySchema, findingSchema, useSchema } from './findings';

/** The pg-boss payload of a cue run: which run, of which studio. The job id is the run id. */
export const cueRunJobSchema = z.object({ runId: z.string().uuid(), studioId: z.string().uuid() });
export type CueRunJob = z.infer<typeof cueRunJobSchema>;

/**
 * The files of a package, in the order they are written, with their content types. manifest.json comes
 * last: it lists every other file's SHA-256 and size, so it cannot list itself.
 */
export const PACKAGE_FILES = [
  {
    name: 'legs.csv',
    contentType: 'text/csv',
    describes: 'leg lengths at the controller rate (time_s, leg1_m ..)',
  },
  {
    name: 'pose.csv',
    contentType: 'text/csv',
    describes: 'pose offsets from neutral at the controller rate',
  },
  {
    name: 'seat_force.csv',
    contentType: 'text/csv',
    describes:
      'specific force at each seat, platform frame, before the rider low-pass (time_s, seat1_fx_mps2 ..)',
  },
  {
    name: 'leg_force.csv',
    contentType: 'text/csv',
    describes:
      'axial force of each leg, compression positive, when the base has a payload (time_s, leg1_N ..)',
  },
  { name: 'findings.json', contentType: 'application/json', describes: 'findings, uses and comfort figures' },
  {
    name: 'spectra.json',
    contentType: 'application/json',
    describes: "Welch PSD per axis of the rider's specific force, 0.1-0.5 Hz band marked",
  },
  { name: 'report.txt', contentType: 'text/plain', describes: 'a plain-language summary with the cautions' },
  {
    name: 'manifest.json',
    contentType: 'application/json',
    describes: "every file's SHA-256 and size, and every parameter of the run",
  },
] as const;
export type PackageFileName = (typeof PACKAGE_FILES)[number]['name'];

/** Chart series of a run: beside the package (the run page draws from it), not listed in the manifest. */
export const SERIES_FILE = { name: 'series.json', contentType: 'application/json' } as const;

/** Every file a run leaves in storage: the package and the chart series. */
export const RUN_FILES: readonly { name: string; contentType: string }[] = [...PACKAGE_FILES, SERIES_FILE];

/** Content type of a run file by name, or null for a name that is not one of a run's files. */
export function runFileContentType(name: string): string | null {
  return RUN_FILES.find((f) => f.name === name)?.contentType ?? null;
}

/** A file's entry in the manifest and in the stored summary. */
export const manifestFileSchema = z.object({
  name: z.string().min(1),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  size_bytes: z.number().int().nonnegative(),
});
export type ManifestFile = z.infer<typeof manifestFileSchema>;

/** What the cueing did besides the pose: whether a limiter engaged (the cued motion is then not the input's). */
export const cueingSummarySchema = z.object({
  /** True when a smooth limiter of the washout engaged at least once. */
  saturated: z.boolean(),
  /** Plain-language detail (which limiter, for how long), empty when nothing saturated. */
  detail: z.string(),
});
export type CueingSummary = z.infer<typeof cueingSummarySchema>;

/** The ramps from and to neutral a run carries (venue controller settings), in seconds. */
export const rampSummarySchema = z.object({
  in_s: z.number().nonnegative(),
  out_s: z.number().nonnegative(),
  profile: z.enum(['quintic', 'raisedCosine']),
});
export type RampSummaryStored = z.infer<typeof rampSummarySchema>;

/** The summary stored with a finished run (`cue_runs.summary`): what lists, the run page and reviews need. */
export const storedRunSummarySchema = z.object({
  within: z.boolean(),
  exitCode: z.union([z.literal(0), z.literal(3), z.literal(4)]),
  uses: z.array(useSchema),
  findings: z.array(findingSchema),
  comfort: comfortSummarySchema.nullable(),
  notes: z.array(z.string()),
  rate_hz: z.number().positive(),
  samples: z.number().int().nonnegative(),
  duration_s: z.number().nonnegative(),
  budgetIsDemo: z.boolean(),
  /** Vehicle takes only; absent for pose and legs takes and for runs stored before it was recorded. */
  cueing: cueingSummarySchema.nullable().optional(),
  /** Ramps from and to neutral around the show; absent for runs with none or stored before they existed. */
  ramp: rampSummarySchema.optional(),
  /** Every file the run wrote, the manifest and the chart series included. */
  files: z.array(manifestFileSchema),
});
export type StoredRunSummary = z.infer<typeof storedRunSummarySchema>;
