// Releases: a producer releases a cleared run to its venue; the worker builds the package (a zip the
// venue's motion controller loads), and the venue's operators download, acknowledge or report problems.
import { z } from 'zod';
import { text } from './text';
import { personSchema } from './review';

/**
 * building: the worker is making the package; ready: downloadable; failed: the build failed (reason
 * given); superseded: a newer release for the same venue and track is ready (still downloadable, for
 * the record); withdrawn: the producer took it back (never downloadable again).
 */
export const RELEASE_STATES = ['building', 'ready', 'failed', 'superseded', 'withdrawn'] as const;
export const releaseStateSchema = z.enum(RELEASE_STATES);
export type ReleaseState = z.infer<typeof releaseStateSchema>;

export const RELEASE_STATE_LABELS: Record<ReleaseState, string> = {
  building: 'Building package',
  ready: 'Ready',
  failed: 'Build failed',
  superseded: 'Superseded',
  withdrawn: 'Withdrawn',
};

/** The pg-boss payload that asks the worker to build a release's package. The job id is the release id. */
export const buildReleaseJobSchema = z.object({ releaseId: z.string().uuid(), studioId: z.string().uuid() });
export type BuildReleaseJob = z.infer<typeof buildReleaseJobSchema>;

/** POST .../runs/:run/release answers 201 with this; the state moves on to ready or failed. */
export const releaseCreatedSchema = z.object({ id: z.string().uuid(), state: releaseStateSchema });
export type ReleaseCreated = z.infer<typeof releaseCreatedSchema>;

export const withdrawBody = z.object({
  reason: text().trim().min(1, 'say why the release is withdrawn').max(4000),
});
export const problemBody = z.object({
  text: text().trim().min(1, 'describe the problem').max(8000),
});
export const acknowledgeBody = z.object({ note: text().trim().max(2000).default('') });

export const releasesQuery = z.object({
  venueId: z.string().uuid().optional(),
  trackId: z.string().uuid().optional(),
  runId: z.string().uuid().optional(),
  state: releaseStateSchema.optional(),
});

export const acknowledgementSchema = z.object({ by: personSchema, note: z.string(), at: z.string() });
export const problemSchema = z.object({
  id: z.string().uuid(),
  by: personSchema,
  text: z.string(),
  at: z.string(),
});
export type Problem = z.infer<typeof problemSchema>;

export const packageFileSchema = z.object({ name: z.string(), sha256: z.string(), size_bytes: z.number() });

export const releaseSchema = z.object({
  id: z.string().uuid(),
  runId: z.string().uuid(),
  trackId: z.string().uuid(),
  trackTitle: z.string(),
  takeNumber: z.number().int(),
  venueId: z.string().uuid(),
  venueName: z.string(),
  state: releaseStateSchema,
  failureReason: z.string().nullable(),
  releasedBy: personSchema.nullable(),
  releasedAt: z.string(),
  builtAt: z.string().nullable(),
  /** The zip: its file name for downloads, SHA-256 and size, once built. */
  packageName: z.string(),
  packageSha256: z.string().nullable(),
  packageSizeBytes: z.number().nullable(),
  /** The files inside the zip as its manifest lists them (manifest.json itself is not listed). */
  files: z.array(packageFileSchema),
  withdrawnAt: z.string().nullable(),
  withdrawnBy: personSchema.nullable(),
  withdrawReason: z.string().nullable(),
  supersededAt: z.string().nullable(),
  supersededById: z.string().uuid().nullable(),
  acknowledgements: z.array(acknowledgementSchema),
  problems: z.array(problemSchema),
  downloads: z.number().int(),
  lastDownloadAt: z.string().nullable(),
});
export type Release = z.infer<typeof releaseSchema>;
