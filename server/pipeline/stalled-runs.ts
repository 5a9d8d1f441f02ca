// Runs whose worker stopped answering, and runs a user asks for again.
//
// A worker writes the run's heartbeat_at every RUN_HEARTBEAT_S while it cues (worker/jobs/cue-run.ts).
// A run still `cueing` whose heartbeat is older than RUN_STALL_S has lost its worker: killed, out of
// memory, its machine gone. Every worker sweeps for such runs every few seconds and puts each back in
// the queue under a new job id, recorded on the run (cue_runs.job_id), so that only the new job may
// work on it: the old job, should pg-boss hand it out again when it expires, finds it is no longer the
// run's job and does nothing. The update that takes a run over is guarded by the stale heartbeat, so
// two workers sweeping at once re-queue it once.
//
// Asking again: a failed run (storage was down, a worker kept dying) is queued again by a user with
// the right to ask for runs, under a new job id as well; the run keeps its id, inputs and history.
import { randomUUID } from 'node:crypto';
import { and, eq, inArray, lt, sql } from 'drizzle-orm';
import type pg from 'pg';
import type PgBoss from 'pg-boss';
import { inClientTransaction } from '../db/client';
import { cueRuns } from '../db/schema';
import type { CueRunRow } from '../db/schema';
import { inStudio } from '../db/scope';
import { recordAudit } from '../audit';
import { HttpError } from '../lib/http-error';
import { QUEUES } from '../queue';
import { cueRunJobSchema } from '../../shared/schemas/run-outputs';
import { cueRunJobOptions } from './queue-runs';
import { silentSeconds } from './views';
import { failRun } from './fail-run';

export interface StallPolicy {
  /** A run cueing with no heartbeat for longer than this has lost its worker (s). */
  stall_s: number;
  /** The queue's retries of a job; a run that stalls more times than this fails. */
  retry: { limit: number; delay_s: number };
}

/** The instant a run's worker last vouched for it: its heartbeat, or its start before the first one. */
const lastSign = sql`coalesce(${cueRuns.heartbeatAt}, ${cueRuns.startedAt}, ${cueRuns.createdAt})`;

/** True when a run shown as cueing has had no heartbeat for longer than stall_s at `now`. */
export function isStalled(
  run: Pick<CueRunRow, 'state' | 'heartbeatAt' | 'startedAt' | 'createdAt'>,
  now: Date,
  stall_s: number,
): boolean {
  return run.state === 'cueing' && silentSeconds(run, now) > stall_s;
}

/**
 * Puts every stalled run back in the queue under a new job (or fails it when it has stalled on every
 * attempt the queue allows). Returns what it did, for the log.
 */
export async function sweepStalledRuns(
  pool: pg.Pool,
  boss: PgBoss,
  policy: StallPolicy,
  now: Date,
): Promise<{ requeued: string[]; failed: string[] }> {
  const cutoff = new Date(now.getTime() - policy.stall_s * 1000);
  const requeued: string[] = [];
  const failed: string[] = [];
  const candidates = await inClientTransaction(pool, (tx) =>
    tx
      .select({ id: cueRuns.id })
      .from(cueRuns)
      .where(and(eq(cueRuns.state, 'cueing'), lt(lastSign, cutoff)))
      .limit(100),
  );
  for (const { id } of candidates) {
    await inClientTransaction(pool, async (tx, executor) => {
      const [run] = await tx
        .select()
        .from(cueRuns)
        .where(and(eq(cueRuns.id, id), eq(cueRuns.state, 'cueing'), lt(lastSign, cutoff)))
        .for('update', { skipLocked: true });
      if (!run) return; // finished meanwhile, or another sweeper has it
      const silent_s = silentSeconds(run, now);
      const what = `The worker cueing this run stopped answering (no heartbeat for ${silent_s} s, at ${run.progress} %)`;
      if (run.attempts > policy.retry.limit) {
        await failRun(tx, run, `Gave up after ${run.attempts} attempt(s): ${what}.`, now);
        failed.push(run.id);
        return;
      }
      const jobId = randomUUID();
      await tx
        .update(cueRuns)
        .set({ state: 'queued', progress: 0, jobId, heartbeatAt: null, lastError: `${what}; queued again.` })
        .where(eq(cueRuns.id, run.id));
      await boss.send(QUEUES.cueRun, cueRunJobSchema.parse({ runId: run.id, studioId: run.studioId }), {
        ...cueRunJobOptions(jobId, policy.retry),
        db: executor,
      });
      await recordAudit(tx, {
        studioId: run.studioId,
        actor: null,
        action: 'run.stalled',
        subjectType: 'cue_run',
        subjectId: run.id,
        detail: { silent_s, progress: run.progress, attempts: run.attempts, jobId },
      });
      requeued.push(run.id);
    });
  }
  return { requeued, failed };
}

/** Starts sweeping every `every_ms`; stop() waits for a sweep under way. */
export function startStallSweeper(
  pool: pg.Pool,
  boss: PgBoss,
  policy: StallPolicy,
  every_ms: number,
  log: (m: string) => void,
  now: () => Date = () => new Date(),
): { stop: () => Promise<void> } {
  let running: Promise<void> | null = null;
  const tick = () => {
    if (running) return;
    running = sweepStalledRuns(pool, boss, policy, now())
      .then((r) => {
        for (const id of r.requeued) log(`cue run ${id}: its worker stopped answering; queued again`);
        for (const id of r.failed)
          log(`cue run ${id}: its worker stopped answering on every attempt; failed`);
      })
      .catch((e: unknown) => log(`stalled-run sweep failed: ${e instanceof Error ? e.message : String(e)}`))
      .finally(() => {
        running = null;
      });
  };
  const timer = setInterval(tick, every_ms);
  timer.unref();
  return {
    stop: async () => {
      clearInterval(timer);
      await running;
    },
  };
}

/** States a user may ask again from: failed, or cueing with a worker that stopped answering. */
export const REQUEUE_STATES = ['failed', 'cueing'] as const;

/**
 * Queues a failed (or stalled) run again under a new job, as `actor`. 409 for a run in any other
 * state, or one cueing with a worker that is still answering.
 */
export async function requeueRun(
  pool: pg.Pool,
  boss: PgBoss,
  opts: {
    studioId: string;
    runId: string;
    actor: { id: string; email: string } | null;
    now: Date;
    policy: StallPolicy;
  },
): Promise<CueRunRow> {
  return inClientTransaction(pool, async (tx, executor) => {
    const [run] = await tx
      .select()
      .from(cueRuns)
      .where(
        inStudio(
          cueRuns,
          opts.studioId,
          eq(cueRuns.id, opts.runId),
          inArray(cueRuns.state, [...REQUEUE_STATES]),
        ),
      )
      .for('update');
    if (!run || (run.state === 'cueing' && !isStalled(run, opts.now, opts.policy.stall_s))) {
      throw new HttpError(
        409,
        'Only a failed run, or one whose worker stopped answering, can be asked for again; this one is not.',
      );
    }
    const jobId = randomUUID();
    const previous = run.failureReason ?? run.lastError;
    const [updated] = await tx
      .update(cueRuns)
      .set({
        state: 'queued',
        progress: 0,
        attempts: 0,
        jobId,
        heartbeatAt: null,
        failureReason: null,
        finishedAt: null,
        lastError: previous ? `Asked for again after: ${previous}` : null,
      })
      .where(eq(cueRuns.id, run.id))
      .returning();
    await boss.send(QUEUES.cueRun, cueRunJobSchema.parse({ runId: run.id, studioId: run.studioId }), {
      ...cueRunJobOptions(jobId, opts.policy.retry),
      db: executor,
    });
    await recordAudit(tx, {
      studioId: run.studioId,
      actor: opts.actor,
      action: 'run.requeued',
      subjectType: 'cue_run',
      subjectId: run.id,
      detail: { from: run.state, reason: previous ?? null, jobId },
    });
    return updated!;
  });
}
