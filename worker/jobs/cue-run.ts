// The cue-run job, in its steps: claim the run, load its inputs (take, venue, profile versions), read
// the take from storage, build the outputs (the same processTrack and buildRunOutputs as `legwork
// process`), write them to storage, finish the run with one guarded update.
//
// Delivered twice, or again after a worker died mid-run, it is safe: a run already finished is left
// alone; a run left in `cueing` is done again from the start, and since the outputs are deterministic
// and their keys fixed, the retry overwrites them with the same bytes before the one guarded update
// that finishes the run.
//
// While it works, the handler vouches for the run every RUN_HEARTBEAT_S (cue_runs.heartbeat_at); a
// run whose heartbeat goes stale is taken over by the stalled-run sweep (server/pipeline/stalled-runs.ts)
// under a new job id. Every write here is guarded by the job id, so a job that has been replaced (a
// worker that was only slow, or pg-boss handing the old job out again) changes nothing.
import { and, eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import type { Db } from '../../server/db/client';
import { cueRuns, profileVersions, profiles, takes, venues } from '../../server/db/schema';
import type { CueRunRow, TakeRow, VenueRow } from '../../server/db/schema';
import { inStudio } from '../../server/db/scope';
import type { Storage } from '../../server/storage';
import { recordAudit } from '../../server/audit';
import { sha256Hex, storageSink, writeRunOutputs } from '../../server/pipeline/run-outputs';
import { TrackStreamError, readStoredTake } from '../../server/pipeline/track-stream';
import { TrackFileError } from '../../shared/motion/track-reader';
import type { Track } from '../../shared/motion/track-reader';
import { ProcessInputError, processTrack } from '../../shared/motion/process';
import { buildRunOutputs } from '../../shared/motion/run-outputs';
import type { RunOutputs } from '../../shared/motion/run-outputs';
import { KinematicsError } from '../../shared/motion/base-geometry';
import { CheckInputError } from '../../shared/motion/checks';
import { parseMotionBase } from '../../shared/schemas/motion-base';
import type { MotionBase } from '../../shared/schemas/motion-base';
import { budgetSchema } from '../../shared/schemas/budget';
import type { Budget } from '../../shared/schemas/budget';
import { cueingProfileSchema } from '../../shared/schemas/cueing-profile';
import type { CueingProfile } from '../../shared/schemas/cueing-profile';
import { cueRunJobSchema, storedRunSummarySchema } from '../../shared/schemas/run-outputs';
import type { ManifestFile, StoredRunSummary } from '../../shared/schemas/run-outputs';
import { softwareVersion } from '../../server/lib/version';
import { loadRun } from '../../server/pipeline/run-detail';
import { queueRunFinishedMails } from '../../server/notifications/run-mails';
import { takeFilmSync } from '../../server/pipeline/views';
import { runFilmSync, runParamsSchema } from '../../shared/schemas/run-params';
import { errorText } from '../../server/lib/error-text';
import { failRun } from '../../server/pipeline/fail-run';

export { cueRunJobSchema };

export interface CueRunDeps {
  db: Db;
  storage: Storage;
  log: (msg: string) => void;
  now: () => Date;
  /** Seconds between heartbeats while a run is cued; default 10. */
  heartbeat_s?: number;
}

/**
 * The motion core runs synchronously, so no heartbeat can be written while it works: before it starts
 * the heartbeat is set ahead by this much per input row (about three times what a 10-minute 1 kHz
 * track takes on a 2-core machine), so that a long take is not mistaken for a dead worker.
 */
const BUSY_S_PER_ROW = 10e-6;

export interface JobMeta {
  id: string;
  data: unknown;
  retryCount?: number;
  retryLimit?: number;
}

/** Errors in the take or its settings: retrying cannot help, so the run fails at once with the reason. */
export const isInputError = (e: unknown): boolean =>
  e instanceof TrackFileError ||
  e instanceof TrackStreamError ||
  e instanceof ProcessInputError ||
  e instanceof KinematicsError ||
  e instanceof CheckInputError ||
  e instanceof z.ZodError;

const artifactPrefix = (run: Pick<CueRunRow, 'studioId' | 'id'>) => `studios/${run.studioId}/runs/${run.id}/`;

interface VersionRef {
  params: unknown;
  version: number;
  name: string;
}

/** What a run is computed from, loaded and validated. */
interface RunInputs {
  take: TakeRow;
  venue: VenueRow;
  base: MotionBase;
  budget: Budget;
  budgetVersion: VersionRef;
  profile: CueingProfile | undefined;
  cueingVersion: VersionRef | null;
}

/** The run's row, while this job is the one that may work on it and it is queued or cueing. */
const ownedBy = (runId: string, jobId: string) =>
  and(eq(cueRuns.id, runId), sql`coalesce(${cueRuns.jobId}, ${cueRuns.id}) = ${jobId}`);

/**
 * Marks a queued (or half-done) run as cueing for this job; null when the run is gone, already
 * finished, or now belongs to another job.
 */
async function claimRun(
  deps: CueRunDeps,
  job: JobMeta,
  runId: string,
  studioId: string,
): Promise<CueRunRow | null> {
  const [run] = await deps.db
    .select()
    .from(cueRuns)
    .where(inStudio(cueRuns, studioId, eq(cueRuns.id, runId)));
  if (!run) {
    deps.log(`cue run ${runId}: not found; nothing to do`);
    return null;
  }
  if (run.state !== 'queued' && run.state !== 'cueing') {
    deps.log(`cue run ${run.id}: already ${run.state}; a repeated delivery changes nothing`);
    return null;
  }
  const now = deps.now();
  const [claimed] = await deps.db
    .update(cueRuns)
    .set({
      state: 'cueing',
      progress: 2,
      attempts: sql`${cueRuns.attempts} + 1`,
      startedAt: now,
      heartbeatAt: now,
      lastError: null,
    })
    .where(and(ownedBy(run.id, job.id), sql`${cueRuns.state} in ('queued', 'cueing')`))
    .returning();
  if (!claimed) {
    deps.log(`cue run ${run.id}: job ${job.id} was replaced by job ${run.jobId}; nothing to do`);
    return null;
  }
  return claimed;
}

/** Loads the take, the venue and the profile versions of the run, and parses the settings. */
async function loadInputs(deps: CueRunDeps, run: CueRunRow): Promise<RunInputs> {
  const { db } = deps;
  const [take] = await db
    .select()
    .from(takes)
    .where(inStudio(takes, run.studioId, eq(takes.id, run.takeId)));
  const [venue] = await db
    .select()
    .from(venues)
    .where(inStudio(venues, run.studioId, eq(venues.id, run.venueId)));
  if (!take || !venue) throw new ProcessInputError('the take or the venue of this run no longer exists');
  const versionOf = async (id: string | null): Promise<VersionRef | null> => {
    if (!id) return null;
    const [v] = await db
      .select({ params: profileVersions.params, version: profileVersions.version, name: profiles.name })
      .from(profileVersions)
      .innerJoin(profiles, eq(profiles.id, profileVersions.profileId))
      .where(inStudio(profileVersions, run.studioId, eq(profileVersions.id, id)));
    return v ?? null;
  };
  const cueingVersion = await versionOf(run.cueingVersionId);
  const budgetVersion = await versionOf(run.budgetVersionId);
  if (!budgetVersion) throw new ProcessInputError('the budget profile version of this run no longer exists');
  return {
    take,
    venue,
    base: parseMotionBase(venue.base),
    budget: budgetSchema.parse(budgetVersion.params),
    budgetVersion,
    profile: cueingVersion ? cueingProfileSchema.parse(cueingVersion.params) : undefined,
    cueingVersion,
  };
}

/** Reads the take's file from storage through the track stream reader. */
function readTake(deps: CueRunDeps, inputs: RunInputs): Promise<Track> {
  return readStoredTake(deps.storage, inputs.take.storageKey, inputs.take.fileName);
}

/**
 * Runs the motion core and builds every output of the run. A RangeError here comes from sizes and
 * values the take gave (an array length, a time grid), not from the machine: it is an input error.
 */
function buildOutputs(run: CueRunRow, inputs: RunInputs, track: Track): RunOutputs {
  try {
    return buildOutputsOf(run, inputs, track);
  } catch (e) {
    if (e instanceof RangeError) throw new ProcessInputError(e.message);
    throw e;
  }
}

function buildOutputsOf(run: CueRunRow, inputs: RunInputs, track: Track): RunOutputs {
  const { take, venue, base, budget, profile, cueingVersion, budgetVersion } = inputs;
  // The run's own parameters: the touch-up goes into the pipeline exactly as `legwork process
  // --touchup` gives it; the film offset changes the sync in the manifest, not the motion.
  const params = runParamsSchema.parse(run.params);
  const filmSync = runFilmSync(takeFilmSync(take), params);
  const result = processTrack({
    track,
    base,
    budget,
    ...(profile ? { profile } : {}),
    ...(params.touchup ? { touchup: params.touchup } : {}),
    // The venue controller's ramps as recorded when the run was queued (`legwork process --controller`).
    ...(params.controller ? { ramp: params.controller.ramp } : {}),
  });
  const hashJson = (v: unknown) => sha256Hex(JSON.stringify(v));
  return buildRunOutputs(result, track, base, {
    input: { file: take.fileName, sha256: take.sha256, size_bytes: take.sizeBytes },
    track,
    base: { file: `${venue.name} motion base`, sha256: hashJson(venue.base) },
    ...(cueingVersion
      ? {
          profile: {
            file: `${cueingVersion.name} v${cueingVersion.version}`,
            label: `${cueingVersion.name} v${cueingVersion.version}`,
            sha256: hashJson(cueingVersion.params),
          },
        }
      : {}),
    budget: {
      file: `${budgetVersion.name} v${budgetVersion.version}`,
      sha256: hashJson(budgetVersion.params),
    },
    softwareVersion: softwareVersion(),
    ...(params.controller ? { controller: params.controller } : {}),
    filmSync,
    run: {
      id: run.id,
      take: { id: take.id, number: take.number },
      venue: { id: venue.id, name: venue.name },
    },
  });
}

/** Writes the package and the chart series under the run's prefix in storage. */
function writeOutputs(deps: CueRunDeps, run: CueRunRow, outputs: RunOutputs): Promise<ManifestFile[]> {
  return writeRunOutputs(outputs, storageSink(deps.storage, artifactPrefix(run)), { series: true });
}

/** Stores the summary and the end state in one guarded update (only a run still cueing), with its audit event. */
async function finish(
  deps: CueRunDeps,
  run: CueRunRow,
  jobId: string,
  outputs: RunOutputs,
  files: ManifestFile[],
) {
  const summary: StoredRunSummary = storedRunSummarySchema.parse({ ...outputs.summary, files });
  const state = summary.exitCode === 0 ? 'awaiting_review' : 'held_by_budget';
  await deps.db.transaction(async (tx) => {
    const [done] = await tx
      .update(cueRuns)
      .set({
        state,
        progress: 100,
        summary,
        artifactPrefix: artifactPrefix(run),
        finishedAt: deps.now(),
        failureReason: null,
        heartbeatAt: null,
      })
      .where(and(ownedBy(run.id, jobId), eq(cueRuns.state, 'cueing')))
      .returning({ id: cueRuns.id });
    if (done) {
      await recordAudit(tx, {
        studioId: run.studioId,
        actor: null,
        action: state === 'held_by_budget' ? 'run.held_by_budget' : 'run.awaiting_review',
        subjectType: 'cue_run',
        subjectId: run.id,
        detail: { findings: summary.findings.length, exitCode: summary.exitCode },
      });
      // The reviewers' (and, held with a hard finding, the producers' and engineers') mail, queued in
      // this transaction: it exists exactly when the new state does.
      await queueRunFinishedMails(tx, run.studioId, await loadRun(tx, run.studioId, run.id));
    }
  });
  deps.log(`cue run ${run.id}: ${state} (${summary.findings.length} finding(s))`);
}

/** Ends a run as failed with its reason (only a run still cueing), with its audit event. */
async function fail(deps: CueRunDeps, run: CueRunRow, jobId: string, reason: string): Promise<void> {
  // The update and its audit event in one transaction.
  await deps.db.transaction((tx) =>
    failRun(tx, run, reason, deps.now(), and(ownedBy(run.id, jobId), eq(cueRuns.state, 'cueing'))),
  );
}

/** Input errors fail the run at once; others put it back in the queue, or fail it on the last attempt. */
async function handleError(deps: CueRunDeps, run: CueRunRow, job: JobMeta, e: unknown): Promise<void> {
  const message = errorText(e);
  if (isInputError(e)) {
    await fail(deps, run, job.id, `The take could not be processed for this venue: ${message}`);
    return;
  }
  const last = (job.retryCount ?? 0) >= (job.retryLimit ?? 0);
  if (last) {
    await fail(deps, run, job.id, `Gave up after ${(job.retryCount ?? 0) + 1} attempt(s): ${message}`);
  } else {
    await deps.db
      .update(cueRuns)
      .set({ state: 'queued', progress: 0, lastError: message, heartbeatAt: null })
      .where(and(ownedBy(run.id, job.id), eq(cueRuns.state, 'cueing')));
  }
  // pg-boss retries the job (with backoff) when the handler throws.
  throw e;
}

/** Builds the pg-boss handler for the cue-run queue. */
export function createHandler(deps: CueRunDeps) {
  const heartbeat_ms = (deps.heartbeat_s ?? 10) * 1000;
  /** Progress and a fresh heartbeat (ahead by `busy_s`), while the run is this job's and cueing. */
  const vouch = (run: CueRunRow, jobId: string, progress?: number, busy_s = 0) =>
    deps.db
      .update(cueRuns)
      .set({
        heartbeatAt: new Date(deps.now().getTime() + busy_s * 1000),
        ...(progress === undefined ? {} : { progress }),
      })
      .where(and(ownedBy(run.id, jobId), eq(cueRuns.state, 'cueing')));

  return async function handle(job: JobMeta): Promise<void> {
    const data = cueRunJobSchema.parse(job.data);
    const run = await claimRun(deps, job, data.runId, data.studioId);
    if (!run) return;
    // The heartbeat between steps; a failed write is only logged (the next one may get through).
    const timer = setInterval(() => {
      vouch(run, job.id).catch((e: unknown) =>
        deps.log(`cue run ${run.id}: heartbeat not written: ${errorText(e)}`),
      );
    }, heartbeat_ms);
    timer.unref();
    try {
      const inputs = await loadInputs(deps, run);
      const track = await readTake(deps, inputs);
      await vouch(run, job.id, 30, track.length * BUSY_S_PER_ROW);
      const outputs = buildOutputs(run, inputs, track);
      await vouch(run, job.id, 65);
      const files = await writeOutputs(deps, run, outputs);
      await vouch(run, job.id, 95);
      await finish(deps, run, job.id, outputs, files);
    } catch (e) {
      await handleError(deps, run, job, e);
    } finally {
      clearInterval(timer);
    }
  };
}
