// The cue-run job, in its steps: claim the run, load its inputs (take, venue, profile versions), read
// the take from storage, build the outputs (the same processTrack and buildRunOutputs as `legwork
// process`), write them to storage, finish the run with one guarded update.
//
// Delivered twice, or again after a worker died mid-run, it is safe: a run already finished is left
// alone; a run left in `cueing` is done again from the start, and since the outputs are deterministic
// and their keys fixed, the retry overwrites them with the same bytes before the one guarded update
// that finishes the run.
import { and, eq } from 'drizzle-orm';
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

export { cueRunJobSchema };

export interface CueRunDeps {
  db: Db;
  storage: Storage;
  log: (msg: string) => void;
  now: () => Date;
}

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

/** Marks a queued (or half-done) run as cueing; null when the run is gone or already finished. */
async function claimRun(deps: CueRunDeps, runId: string, studioId: string): Promise<CueRunRow | null> {
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
  await deps.db
    .update(cueRuns)
    .set({ state: 'cueing', progress: 2, attempts: run.attempts + 1, startedAt: deps.now(), lastError: null })
    .where(eq(cueRuns.id, run.id));
  return { ...run, state: 'cueing' };
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
async function finish(deps: CueRunDeps, run: CueRunRow, outputs: RunOutputs, files: ManifestFile[]) {
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
      })
      .where(and(eq(cueRuns.id, run.id), eq(cueRuns.state, 'cueing')))
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
async function fail(deps: CueRunDeps, run: CueRunRow, reason: string): Promise<void> {
  await deps.db.transaction(async (tx) => {
    const [done] = await tx
      .update(cueRuns)
      .set({ state: 'failed', failureReason: reason, finishedAt: deps.now() })
      .where(and(eq(cueRuns.id, run.id), eq(cueRuns.state, 'cueing')))
      .returning({ id: cueRuns.id });
    if (done) {
      await recordAudit(tx, {
        studioId: run.studioId,
        actor: null,
        action: 'run.failed',
        subjectType: 'cue_run',
        subjectId: run.id,
        detail: { reason },
      });
    }
  });
}

/** Input errors fail the run at once; others put it back in the queue, or fail it on the last attempt. */
async function handleError(deps: CueRunDeps, run: CueRunRow, job: JobMeta, e: unknown): Promise<void> {
  const message = errorText(e);
  if (isInputError(e)) {
    await fail(deps, run, `The take could not be processed for this venue: ${message}`);
    return;
  }
  const last = (job.retryCount ?? 0) >= (job.retryLimit ?? 0);
  if (last) {
    await fail(deps, run, `Gave up after ${(job.retryCount ?? 0) + 1} attempt(s): ${message}`);
  } else {
    await deps.db
      .update(cueRuns)
      .set({ state: 'queued', progress: 0, lastError: message })
      .where(eq(cueRuns.id, run.id));
  }
  // pg-boss retries the job (with backoff) when the handler throws.
  throw e;
}

/** Builds the pg-boss handler for the cue-run queue. */
export function createHandler(deps: CueRunDeps) {
  const setProgress = (run: CueRunRow, progress: number) =>
    deps.db
      .update(cueRuns)
      .set({ progress })
      .where(and(eq(cueRuns.id, run.id), eq(cueRuns.state, 'cueing')));

  return async function handle(job: JobMeta): Promise<void> {
    const data = cueRunJobSchema.parse(job.data);
    const run = await claimRun(deps, data.runId, data.studioId);
    if (!run) return;
    try {
      const inputs = await loadInputs(deps, run);
      const track = await readTake(deps, inputs);
      await setProgress(run, 30);
      const outputs = buildOutputs(run, inputs, track);
      await setProgress(run, 65);
      const files = await writeOutputs(deps, run, outputs);
      await setProgress(run, 95);
      await finish(deps, run, outputs, files);
    } catch (e) {
      await handleError(deps, run, job, e);
    }
  };
}
