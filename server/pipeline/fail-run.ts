// Ending a run as failed, in the caller's transaction: the one guarded update and its audit event,
// shared by the worker (a job that gave up) and the stalled-run sweep.
import { and, eq } from 'drizzle-orm';
import type { SQL } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { cueRuns } from '../db/schema';
import type { CueRunRow } from '../db/schema';
import { recordAudit } from '../audit';

/**
 * Marks the run failed with `reason` where `guard` still holds (for instance: still cueing, still
 * this job's) and records run.failed; false when the guard no longer held and nothing changed.
 */
export async function failRun(
  tx: Db | Tx,
  run: Pick<CueRunRow, 'id' | 'studioId'>,
  reason: string,
  now: Date,
  guard?: SQL,
): Promise<boolean> {
  const [done] = await tx
    .update(cueRuns)
    .set({ state: 'failed', failureReason: reason, finishedAt: now, heartbeatAt: null })
    .where(and(eq(cueRuns.id, run.id), guard))
    .returning({ id: cueRuns.id });
  if (!done) return false;
  await recordAudit(tx, {
    studioId: run.studioId,
    actor: null,
    action: 'run.failed',
    subjectType: 'cue_run',
    subjectId: run.id,
    detail: { reason },
  });
  return true;
}
