// API shapes of the pipeline: tracks, takes, cue runs, profiles, venue settings and API tokens.
import { z } from 'zod';
import { text } from './text';
import { checkResultSchema } from './findings';
import { filmSyncSchema } from './film-sync';
import type { FilmSync } from './film-sync';
import { runParamsSchema } from './run-params';
import { touchupSchema } from './touchup';
import { rampSummarySchema } from './run-outputs';
import { controllerOutputSchema } from './controller-output';

export const TAKE_KINDS = ['vehicle', 'pose', 'legs'] as const;

export const RUN_STATE_LABELS = {
  queued: 'Queued',
  cueing: 'Cueing',
  awaiting_review: 'Awaiting review',
  held_by_budget: 'Held by budget',
  failed: 'Failed',
  cleared: 'Cleared',
  held: 'Held',
  released: 'Released',
  withdrawn: 'Withdrawn',
  superseded: 'Superseded',
} as const;
export type RunStateName = keyof typeof RUN_STATE_LABELS;
export const runStateSchema = z.enum(Object.keys(RUN_STATE_LABELS) as [RunStateName, ...RunStateName[]]);

export const createTrackBody = z.object({
  title: text().trim().min(1, 'required').max(200),
  film: text().trim().max(200).default(''),
});

export const tracksQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  sort: z.enum(['title', 'updatedAt', 'createdAt']).default('updatedAt'),
  dir: z.enum(['asc', 'desc']).default('desc'),
  state: runStateSchema.optional(),
  venueId: z.string().uuid().optional(),
  q: text().trim().max(200).optional(),
});

const uploadQueryFields = z.object({
  fileName: text()
    .trim()
    .min(1, 'required')
    .max(200)
    .regex(/^[^/\\]+\.csv(\.gz)?$/i, 'must be a .csv or .csv.gz file name'),
  // Film sync, optional: the query's text, checked with filmSyncSchema below.
  frameRate: text().optional(),
  startTimecode: text().optional(),
  offset_frames: text().optional(),
});
export type UploadQuery = z.input<typeof uploadQueryFields>;

const given = (v: string | undefined): v is string => v !== undefined && v.trim() !== '';

/**
 * The upload's query: the file name and the take's film sync (null when none of its fields is given;
 * a frame rate is needed once a start timecode or an offset is). Each issue names its query field.
 */
export const uploadQuery = uploadQueryFields.transform((q, ctx) => {
  const out = { fileName: q.fileName, filmSync: null as FilmSync | null };
  if (!given(q.frameRate)) {
    for (const key of ['startTimecode', 'offset_frames'] as const) {
      if (given(q[key])) {
        ctx.addIssue({ code: 'custom', path: ['frameRate'], message: `required when ${key} is given` });
        return z.NEVER;
      }
    }
    return out;
  }
  const r = filmSyncSchema.safeParse({
    frameRate: q.frameRate,
    ...(given(q.startTimecode) ? { startTimecode: q.startTimecode.trim() } : {}),
    ...(given(q.offset_frames) ? { offset_frames: Number(q.offset_frames) } : {}),
  });
  if (!r.success) {
    for (const issue of r.error.issues) {
      ctx.addIssue({ code: 'custom', path: issue.path, message: issue.message });
    }
    return z.NEVER;
  }
  return { ...out, filmSync: r.data };
});

export const requestRunsBody = z.object({
  venueIds: z.array(z.string().uuid()).min(1, 'choose at least one venue'),
  /** Applied to the take before cueing, for these runs only (recorded in each run's parameters). */
  touchup: touchupSchema.optional(),
});
export type RequestRunsBody = z.input<typeof requestRunsBody>;

/** The containers a take's proxy video may have: what browsers play in a <video> element. */
export const PROXY_VIDEO_TYPES = ['video/mp4', 'video/webm'] as const;
export type ProxyVideoType = (typeof PROXY_VIDEO_TYPES)[number];

export const proxyVideoSchema = z.object({
  type: z.enum(PROXY_VIDEO_TYPES),
  sizeBytes: z.number(),
  sha256: z.string(),
  uploadedAt: z.string(),
});
export type ProxyVideo = z.infer<typeof proxyVideoSchema>;

export const takeSchema = z.object({
  id: z.string().uuid(),
  trackId: z.string().uuid(),
  number: z.number().int(),
  kind: z.enum(TAKE_KINDS),
  layout: z.enum(['vehicle', 'hexapod', 'planar3']),
  fileName: z.string(),
  sizeBytes: z.number(),
  sha256: z.string(),
  samples: z.number().int(),
  duration_s: z.number(),
  uploadedVia: z.enum(['browser', 'token']),
  /** The picture this take plays against, or null when it was uploaded without film sync. */
  filmSync: filmSyncSchema.nullable(),
  /** A proxy of the ride film to play in step with the motion; null (or absent) when there is none. */
  proxyVideo: proxyVideoSchema.nullable().optional(),
  createdAt: z.string(),
});
export type Take = z.infer<typeof takeSchema>;

/** The answer to an upload: the new take, and the earlier take of the same track with the same SHA-256, if any. */
export const uploadedTakeSchema = takeSchema.extend({
  duplicateOf: z.object({ id: z.string().uuid(), number: z.number().int() }).nullable(),
});
export type UploadedTake = z.infer<typeof uploadedTakeSchema>;

export const useSummarySchema = z.object({ check: z.string(), subject: z.string(), ratio: z.number() });

export const runSummarySchema = z.object({
  id: z.string().uuid(),
  trackId: z.string().uuid(),
  takeId: z.string().uuid(),
  takeNumber: z.number().int(),
  venueId: z.string().uuid(),
  venueName: z.string(),
  state: runStateSchema,
  progress: z.number().int(),
  failureReason: z.string().nullable(),
  lastError: z.string().nullable(),
  attempts: z.number().int(),
  /** Cueing, but its worker has not vouched for it for longer than the server's RUN_STALL_S. */
  stalled: z.boolean(),
  /** While cueing: seconds since its worker last vouched for it; null in any other state. */
  silent_s: z.number().int().nullable(),
  /** Worst use ratio over every check, or null before the run finished. */
  worstRatio: z.number().nullable(),
  worstCheck: z.string().nullable(),
  findingCount: z.number().int().nullable(),
  createdAt: z.string(),
  finishedAt: z.string().nullable(),
});
export type RunSummary = z.infer<typeof runSummarySchema>;

export const runDetailSchema = runSummarySchema.extend({
  trackTitle: z.string(),
  take: takeSchema,
  cueingVersion: z.object({ id: z.string(), name: z.string(), version: z.number() }).nullable(),
  budgetVersion: z.object({ id: z.string(), name: z.string(), version: z.number() }),
  result: checkResultSchema.extend({ notes: z.array(z.string()).optional() }).nullable(),
  budgetIsDemo: z.boolean().nullable(),
  files: z.array(z.object({ name: z.string(), sha256: z.string(), size_bytes: z.number() })),
  /** The run's own parameters: the film offset and the touch-up it was made with. */
  params: runParamsSchema,
  /** The film sync the run plays with (the take's, with the run's offset), or null. */
  filmSync: filmSyncSchema.nullable(),
  /** The ramps from and to neutral around the show (the venue controller's), or null when none. */
  ramp: rampSummarySchema.nullable().optional(),
});
export type RunDetail = z.infer<typeof runDetailSchema>;

export const trackSummarySchema = z.object({
  id: z.string().uuid(),
  title: z.string(),
  film: z.string(),
  takes: z.number().int(),
  createdAt: z.string(),
  updatedAt: z.string(),
  /** Latest run state per venue. */
  venues: z.array(
    z.object({
      venueId: z.string(),
      venueName: z.string(),
      state: runStateSchema,
      worstRatio: z.number().nullable(),
    }),
  ),
});
export type TrackSummary = z.infer<typeof trackSummarySchema>;

export const trackPageSchema = z.object({
  items: z.array(trackSummarySchema),
  total: z.number().int(),
  page: z.number().int(),
  pageSize: z.number().int(),
});
export type TrackPage = z.infer<typeof trackPageSchema>;

export const trackDetailSchema = z.object({
  id: z.string().uuid(),
  title: z.string(),
  film: z.string(),
  createdAt: z.string(),
  takes: z.array(takeSchema),
  runs: z.array(runSummarySchema),
});
export type TrackDetail = z.infer<typeof trackDetailSchema>;

export const profileKindSchema = z.enum(['cueing', 'budget']);
export const createProfileBody = z.object({
  kind: profileKindSchema,
  name: text().trim().min(1).max(120),
  params: z.unknown(),
  note: text().max(2000).default(''),
});
export const newVersionBody = z.object({ params: z.unknown(), note: text().max(2000).default('') });

export const profileVersionSchema = z.object({
  id: z.string().uuid(),
  version: z.number().int(),
  note: z.string(),
  used: z.boolean(),
  createdAt: z.string(),
  params: z.unknown(),
});
export const profileSchema = z.object({
  id: z.string().uuid(),
  kind: profileKindSchema,
  name: z.string(),
  versions: z.array(profileVersionSchema),
});
export type Profile = z.infer<typeof profileSchema>;

export const VENUE_CHANGE_REASON_MESSAGE = 'say why the venue changes profile (the audit log keeps it)';

/**
 * PUT .../venues/:venue/settings: at least one of the two; null clears it. `reason` says why the venue
 * changes what it uses; the audit event keeps it.
 */
export const venueSettingsBody = z
  .object({
    cueingVersionId: z.string().uuid().nullable().optional(),
    budgetVersionId: z.string().uuid().nullable().optional(),
    // A missing reason reads as an empty one, so both get the same message.
    reason: z.preprocess(
      (v) => (v === undefined || v === null ? '' : v),
      text().trim().min(1, VENUE_CHANGE_REASON_MESSAGE).max(4000, 'at most 4000 characters'),
    ),
  })
  .refine((b) => b.cueingVersionId !== undefined || b.budgetVersionId !== undefined, {
    message: 'give cueingVersionId or budgetVersionId (a profile version id, or null to clear it)',
  });

export const venueDetailSchema = z.object({
  id: z.string().uuid(),
  name: z.string(),
  site: z.string(),
  timeZone: z.string(),
  base: z.unknown(),
  /** How the venue's controller takes its track: ramps from and to neutral, optional encoder counts. */
  controller: controllerOutputSchema,
  cueingVersion: z.object({ id: z.string(), name: z.string(), version: z.number() }).nullable(),
  budgetVersion: z.object({ id: z.string(), name: z.string(), version: z.number() }).nullable(),
});
export type VenueDetail = z.infer<typeof venueDetailSchema>;

/** The body of PUT .../venues/:venue/controller: the whole controller settings (ramp, optional encoder). */
export const venueControllerBody = controllerOutputSchema;

export const createTokenBody = z.object({ name: text().trim().min(1).max(120) });
export const apiTokenSchema = z.object({
  id: z.string().uuid(),
  name: z.string(),
  prefix: z.string(),
  createdAt: z.string(),
  lastUsedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
});
export type ApiToken = z.infer<typeof apiTokenSchema>;

/** A new venue: where it is and its motion base (validated by shared/schemas/motion-base.ts). */
export const createVenueBody = z.object({
  name: text().trim().min(1, 'required').max(200),
  site: text().trim().max(200).default(''),
  timeZone: text().trim().min(1).max(100).default('UTC'),
  base: z.unknown(),
});
export const venueBaseBody = z.object({ base: z.unknown() });
