// Database schema. Every tenant-owned table carries studio_id; queries on them go through
// server/db/scope.ts.
import type { ProxyVideoType } from '../../shared/schemas/pipeline';
import { sql } from 'drizzle-orm';
import {
  bigint,
  bigserial,
  doublePrecision,
  integer,
  index,
  jsonb,
  json,
  pgTable,
  primaryKey,
  text,
  timestamp,
  unique,
  uniqueIndex,
  uuid,
  varchar,
} from 'drizzle-orm/pg-core';
import type { StoredRunSummary } from '../../shared/schemas/run-outputs';
import type { FrameRateId } from '../../shared/motion/timecode';
import type { RunParams } from '../../shared/schemas/run-params';
import type { ControllerOutput } from '../../shared/schemas/controller-output';

const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow();

export const users = pgTable(
  'users',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    passwordHash: text('password_hash'),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('users_email_key').on(t.email)],
);
export type User = typeof users.$inferSelect;

export const studios = pgTable(
  'studios',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    name: text('name').notNull(),
    slug: text('slug').notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('studios_slug_key').on(t.slug)],
);
export type Studio = typeof studios.$inferSelect;

/** The tenant column of every studio-owned table. */
const studioRef = () =>
  uuid('studio_id')
    .notNull()
    .references(() => studios.id, { onDelete: 'cascade' });

export const memberships = pgTable(
  'memberships',
  {
    studioId: studioRef(),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    roles: text('roles').array().notNull(),
    venueIds: uuid('venue_ids')
      .array()
      .notNull()
      .default(sql`'{}'::uuid[]`),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.studioId, t.userId] }), index('memberships_user_idx').on(t.userId)],
);
export type MembershipRow = typeof memberships.$inferSelect;

export const invitations = pgTable(
  'invitations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: studioRef(),
    email: text('email').notNull(),
    roles: text('roles').array().notNull(),
    venueIds: uuid('venue_ids')
      .array()
      .notNull()
      .default(sql`'{}'::uuid[]`),
    tokenHash: text('token_hash').notNull(),
    invitedBy: uuid('invited_by').references(() => users.id, { onDelete: 'set null' }),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    acceptedAt: timestamp('accepted_at', { withTimezone: true }),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('invitations_token_key').on(t.tokenHash),
    index('invitations_studio_idx').on(t.studioId),
  ],
);
export type InvitationRow = typeof invitations.$inferSelect;

export const passwordResets = pgTable(
  'password_resets',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    tokenHash: text('token_hash').notNull(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    usedAt: timestamp('used_at', { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('password_resets_token_key').on(t.tokenHash)],
);

export const venues = pgTable(
  'venues',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: studioRef(),
    name: text('name').notNull(),
    site: text('site').notNull(),
    timeZone: text('time_zone').notNull(),
    /** The motion base as validated JSON (shared/schemas/motion-base.ts). */
    base: jsonb('base').notNull(),
    /**
     * How the venue's motion controller takes its track (shared/schemas/controller-output.ts): ramps
     * from and to neutral, optional encoder counts. Copied into each run's parameters when it is queued.
     */
    controller: jsonb('controller')
      .$type<ControllerOutput>()
      .notNull()
      .default({ ramp: { duration_s: 3, profile: 'quintic' } }),
    createdAt: createdAt(),
  },
  (t) => [index('venues_studio_idx').on(t.studioId)],
);
export type VenueRow = typeof venues.$inferSelect;

/** Append-only: a trigger in the migrations refuses UPDATE and DELETE. */
export const auditEvents = pgTable(
  'audit_events',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    studioId: uuid('studio_id').references(() => studios.id, { onDelete: 'set null' }),
    actorUserId: uuid('actor_user_id'),
    actorEmail: text('actor_email'),
    action: text('action').notNull(),
    subjectType: text('subject_type').notNull(),
    subjectId: text('subject_id'),
    detail: jsonb('detail')
      .notNull()
      .default(sql`'{}'::jsonb`),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('audit_events_studio_idx').on(t.studioId, t.id)],
);

/** express-session rows (connect-pg-simple's layout). */
export const sessions = pgTable(
  'session',
  {
    sid: varchar('sid').primaryKey(),
    sess: json('sess').notNull(),
    expire: timestamp('expire', { precision: 6 }).notNull(),
  },
  (t) => [index('IDX_session_expire').on(t.expire)],
);

// ── The pipeline: profiles, tracks, takes and cue runs ────────────────────────────────────────────

/** A cueing or budget profile; its versions hold the parameters. */
export const profiles = pgTable(
  'profiles',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: studioRef(),
    kind: text('kind').$type<'cueing' | 'budget'>().notNull(),
    name: text('name').notNull(),
    createdAt: createdAt(),
  },
  (t) => [index('profiles_studio_idx').on(t.studioId, t.kind)],
);

/** One version of a profile. Immutable once a run used it (`usedAt` set): edits make a new version. */
export const profileVersions = pgTable(
  'profile_versions',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: studioRef(),
    profileId: uuid('profile_id')
      .notNull()
      .references(() => profiles.id, { onDelete: 'cascade' }),
    version: integer('version').notNull(),
    params: jsonb('params').notNull(),
    note: text('note').notNull().default(''),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    usedAt: timestamp('used_at', { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('profile_versions_key').on(t.profileId, t.version)],
);
export type ProfileVersionRow = typeof profileVersions.$inferSelect;

/** Which profile versions a venue runs with now. */
export const venueSettings = pgTable('venue_settings', {
  venueId: uuid('venue_id')
    .primaryKey()
    .references(() => venues.id, { onDelete: 'cascade' }),
  studioId: studioRef(),
  cueingVersionId: uuid('cueing_version_id').references(() => profileVersions.id),
  budgetVersionId: uuid('budget_version_id').references(() => profileVersions.id),
});

export const tracks = pgTable(
  'tracks',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: studioRef(),
    title: text('title').notNull(),
    film: text('film').notNull().default(''),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('tracks_studio_idx').on(t.studioId, t.updatedAt)],
);
export type TrackRow = typeof tracks.$inferSelect;

export const takes = pgTable(
  'takes',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: studioRef(),
    trackId: uuid('track_id')
      .notNull()
      .references(() => tracks.id, { onDelete: 'cascade' }),
    number: integer('number').notNull(),
    kind: text('kind').$type<'vehicle' | 'pose' | 'legs'>().notNull(),
    layout: text('layout').$type<'vehicle' | 'hexapod' | 'planar3'>().notNull(),
    fileName: text('file_name').notNull(),
    storageKey: text('storage_key').notNull(),
    sizeBytes: bigint('size_bytes', { mode: 'number' }).notNull(),
    sha256: text('sha256').notNull(),
    samples: integer('samples').notNull(),
    duration_s: doublePrecision('duration_s').notNull(),
    uploadedBy: uuid('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
    uploadedVia: text('uploaded_via').$type<'browser' | 'token'>().notNull(),
    /** Film sync (shared/schemas/film-sync.ts): the picture rate; null when the take has none. */
    frameRate: text('frame_rate').$type<FrameRateId>(),
    /** The picture's first frame; set whenever frame_rate is. */
    startTimecode: text('start_timecode'),
    /** The motion against the picture (frames; positive plays the motion later); set whenever frame_rate is. */
    filmOffsetFrames: integer('film_offset_frames'),
    /** A proxy of the ride film to watch beside the motion (video/mp4 or video/webm), or null. */
    proxyVideoKey: text('proxy_video_key'),
    proxyVideoType: text('proxy_video_type').$type<ProxyVideoType>(),
    proxyVideoBytes: bigint('proxy_video_bytes', { mode: 'number' }),
    proxyVideoSha256: text('proxy_video_sha256'),
    proxyVideoAt: timestamp('proxy_video_at', { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('takes_number_key').on(t.trackId, t.number), index('takes_studio_idx').on(t.studioId)],
);
export type TakeRow = typeof takes.$inferSelect;

export const RUN_STATES = [
  'queued',
  'cueing',
  'awaiting_review',
  'held_by_budget',
  'failed',
  'cleared',
  'held',
  'released',
  'withdrawn',
  'superseded',
] as const;
export type RunState = (typeof RUN_STATES)[number];

/** take x venue x cueing version x budget version x run parameters; the worker's result lives in storage, its summary here. */
export const cueRuns = pgTable(
  'cue_runs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: studioRef(),
    trackId: uuid('track_id')
      .notNull()
      .references(() => tracks.id, { onDelete: 'cascade' }),
    takeId: uuid('take_id')
      .notNull()
      .references(() => takes.id, { onDelete: 'cascade' }),
    venueId: uuid('venue_id')
      .notNull()
      .references(() => venues.id, { onDelete: 'cascade' }),
    cueingVersionId: uuid('cueing_version_id').references(() => profileVersions.id),
    budgetVersionId: uuid('budget_version_id')
      .notNull()
      .references(() => profileVersions.id),
    /** The run's own parameters (film offset, touch-up; shared/schemas/run-params.ts), part of its identity. */
    params: jsonb('params')
      .$type<RunParams>()
      .notNull()
      .default(sql`'{}'::jsonb`),
    state: text('state').$type<RunState>().notNull().default('queued'),
    progress: integer('progress').notNull().default(0),
    attempts: integer('attempts').notNull().default(0),
    failureReason: text('failure_reason'),
    lastError: text('last_error'),
    /** Worst use ratio per check and subject, findings, exit code, notes: what lists and the run page need. */
    summary: jsonb('summary').$type<StoredRunSummary>(),
    artifactPrefix: text('artifact_prefix'),
    requestedBy: uuid('requested_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    startedAt: timestamp('started_at', { withTimezone: true }),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
    /** Written by the worker every few seconds while it cues; a stale one means the worker died. */
    heartbeatAt: timestamp('heartbeat_at', { withTimezone: true }),
    /** The queue job that may work on this run now (null: the first one, whose id is the run id). */
    jobId: uuid('job_id'),
  },
  (t) => [
    // A pose or legs take has no cueing version: NULLs must count as equal here. The run's own
    // parameters count too (jsonb equality ignores key order), so a nudge or a touch-up is a new run.
    unique('cue_runs_inputs_key')
      .on(t.takeId, t.venueId, t.cueingVersionId, t.budgetVersionId, t.params)
      .nullsNotDistinct(),
    index('cue_runs_studio_idx').on(t.studioId, t.state),
    index('cue_runs_track_idx').on(t.trackId),
    // The sweeper looks for runs being cued whose heartbeat went stale.
    index('cue_runs_heartbeat_idx')
      .on(t.heartbeatAt)
      .where(sql`state = 'cueing'`),
  ],
);
export type CueRunRow = typeof cueRuns.$inferSelect;

/**
 * One counter per studio, raised by triggers (drizzle/0011_studio_data_version.sql) as a transaction
 * that changed what the tracks table shows commits: its tracks, takes, venues, and the state,
 * summary, venue or track of its runs. A reader that sees a version sees every change counted in it,
 * whichever process made it; kept answers are per version (server/pipeline/tracks-cache.ts).
 */
export const studioDataVersions = pgTable('studio_data_versions', {
  studioId: uuid('studio_id')
    .primaryKey()
    .references(() => studios.id, { onDelete: 'cascade' }),
  version: bigint('version', { mode: 'number' }).notNull().default(0),
});

/** Per-studio tokens for pipelines that push takes; only the hash is kept. */
export const apiTokens = pgTable(
  'api_tokens',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: studioRef(),
    name: text('name').notNull(),
    tokenHash: text('token_hash').notNull(),
    prefix: text('prefix').notNull(),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    lastUsedAt: timestamp('last_used_at', { withTimezone: true }),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
  },
  (t) => [uniqueIndex('api_tokens_hash_key').on(t.tokenHash), index('api_tokens_studio_idx').on(t.studioId)],
);

// ── Review, release and delivery ──────────────────────────────────────────────────────────────────

/** Every clear or hold of a run, kept for ever: who, when, why, and the budget version judged against. */
export const reviews = pgTable(
  'reviews',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: studioRef(),
    runId: uuid('run_id')
      .notNull()
      .references(() => cueRuns.id, { onDelete: 'cascade' }),
    decision: text('decision').$type<'clear' | 'hold'>().notNull(),
    reason: text('reason').notNull(),
    reviewerId: uuid('reviewer_id')
      .notNull()
      .references(() => users.id),
    budgetVersionId: uuid('budget_version_id')
      .notNull()
      .references(() => profileVersions.id),
    fromState: text('from_state').notNull(),
    toState: text('to_state').notNull(),
    createdAt: createdAt(),
  },
  (t) => [index('reviews_run_idx').on(t.runId, t.createdAt), index('reviews_studio_idx').on(t.studioId)],
);
export type ReviewRow = typeof reviews.$inferSelect;

export type ReleaseState = 'building' | 'ready' | 'failed' | 'superseded' | 'withdrawn';

/** A cleared run released to its venue, and its package (immutable once built: its SHA-256 is kept). */
export const releases = pgTable(
  'releases',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: studioRef(),
    runId: uuid('run_id')
      .notNull()
      .references(() => cueRuns.id, { onDelete: 'cascade' }),
    trackId: uuid('track_id')
      .notNull()
      .references(() => tracks.id, { onDelete: 'cascade' }),
    venueId: uuid('venue_id')
      .notNull()
      .references(() => venues.id, { onDelete: 'cascade' }),
    state: text('state').$type<ReleaseState>().notNull().default('building'),
    releasedBy: uuid('released_by').references(() => users.id, { onDelete: 'set null' }),
    packageKey: text('package_key'),
    packageSha256: text('package_sha256'),
    packageSizeBytes: bigint('package_size_bytes', { mode: 'number' }),
    /** The manifest's file list, for the release page. */
    files: jsonb('files'),
    failureReason: text('failure_reason'),
    builtAt: timestamp('built_at', { withTimezone: true }),
    withdrawnAt: timestamp('withdrawn_at', { withTimezone: true }),
    withdrawnBy: uuid('withdrawn_by').references(() => users.id, { onDelete: 'set null' }),
    withdrawReason: text('withdraw_reason'),
    supersededAt: timestamp('superseded_at', { withTimezone: true }),
    supersededBy: uuid('superseded_by'),
    createdAt: createdAt(),
  },
  (t) => [
    index('releases_studio_idx').on(t.studioId, t.venueId, t.createdAt),
    index('releases_run_idx').on(t.runId),
  ],
);
export type ReleaseRow = typeof releases.$inferSelect;

/** Every download of a package. */
export const releaseDownloads = pgTable(
  'release_downloads',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    studioId: studioRef(),
    releaseId: uuid('release_id')
      .notNull()
      .references(() => releases.id, { onDelete: 'cascade' }),
    userId: uuid('user_id').references(() => users.id, { onDelete: 'set null' }),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('release_downloads_release_idx').on(t.releaseId)],
);

/** An operator's word that a package is installed on the venue's controller. */
export const releaseAcknowledgements = pgTable(
  'release_acknowledgements',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: studioRef(),
    releaseId: uuid('release_id')
      .notNull()
      .references(() => releases.id, { onDelete: 'cascade' }),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    note: text('note').notNull().default(''),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('release_acknowledgements_key').on(t.releaseId, t.userId)],
);

/** A problem a venue reported with a package; it reaches the producers and reviewers by mail. */
export const releaseProblems = pgTable(
  'release_problems',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: studioRef(),
    releaseId: uuid('release_id')
      .notNull()
      .references(() => releases.id, { onDelete: 'cascade' }),
    userId: uuid('user_id').references(() => users.id, { onDelete: 'set null' }),
    text: text('text').notNull(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('release_problems_release_idx').on(t.releaseId)],
);

/**
 * Mail waiting to be sent, one row per recipient address. Rows are written (server/notifications/
 * outbox.ts) in the same transaction as the change they tell about; the worker sends them and retries
 * with backoff (server/notifications/sender.ts), so no action fails because mail is down.
 */
export const mailOutbox = pgTable(
  'mail_outbox',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studioId: uuid('studio_id').references(() => studios.id, { onDelete: 'cascade' }),
    kind: text('kind').notNull(),
    toEmail: text('to_email').notNull(),
    subject: text('subject').notNull(),
    text: text('text').notNull(),
    /** The app page the mail is about; the sender appends it to the text as a full link (PUBLIC_URL). */
    path: text('path'),
    attempts: integer('attempts').notNull().default(0),
    lastError: text('last_error'),
    nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
    sentAt: timestamp('sent_at', { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [
    index('mail_outbox_due_idx')
      .on(t.nextAttemptAt)
      .where(sql`sent_at IS NULL`),
  ],
);

/** The kinds of mail a user turned off (a row per kind; no row means the mail is sent). */
export const mailOptOuts = pgTable(
  'mail_opt_outs',
  {
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    kind: text('kind').notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.kind] })],
);
