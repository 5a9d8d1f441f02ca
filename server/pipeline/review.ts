// Clearing or holding a run: the rules of shared/review-rules.ts applied under a row lock, the review
// kept, the run's state moved, the audit written and (for a hold) the "run is held" mail queued, all in
// the caller's transaction. The review
// route and the demo seed both use it.
import { eq, desc, inArray } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { cueRuns, releases, reviews, users } from '../db/schema';
import type { CueRunRow } from '../db/schema';
import { inStudio } from '../db/scope';
import { canSeeVenue } from '../auth/permissions';
import type { VenueScopeMember } from '../../shared/permissions';
import { HttpError, badRequest, notFound } from '../lib/http-error';
import { recordAudit } from '../audit';
import { queueRunHeldMail } from '../notifications/run-mails';
import { loadRun } from './run-detail';
import type { LoadedRun } from './run-detail';
import { versionRef } from './views';
import { clearRule, holdRule } from '../../shared/review-rules';
import type { ReviewSubject, ReviewViewer } from '../../shared/review-rules';
import type { Review, ReviewBody } from '../../shared/schemas/review';

/** Hard and comfort finding counts of a finished run. */
export function findingCounts(run: CueRunRow): { hard: number; comfort: number } {
  const f = run.summary?.findings ?? [];
  return {
    hard: f.filter((x) => x.severity === 'hard').length,
    comfort: f.filter((x) => x.severity === 'comfort').length,
  };
}

export async function subjectOf(db: Db | Tx, studioId: string, loaded: LoadedRun): Promise<ReviewSubject> {
  const { run, take } = loaded;
  const counts = findingCounts(run);
  const active = await db
    .select({ id: releases.id })
    .from(releases)
    .where(
      inStudio(
        releases,
        studioId,
        eq(releases.runId, run.id),
        inArray(releases.state, ['building', 'ready']),
      ),
    )
    .limit(1);
  return {
    state: run.state,
    finished: run.summary !== null,
    hardFindings: counts.hard,
    comfortFindings: counts.comfort,
    requestedBy: run.requestedBy,
    uploadedBy: take.uploadedBy,
    activeRelease: active.length > 0,
  };
}

/** Every review of a run, newest first. */
export async function reviewsOf(db: Db | Tx, studioId: string, runId: string): Promise<Review[]> {
  const rows = await db
    .select({ r: reviews, name: users.name, email: users.email })
    .from(reviews)
    .innerJoin(users, eq(users.id, reviews.reviewerId))
    .where(inStudio(reviews, studioId, eq(reviews.runId, runId)))
    .orderBy(desc(reviews.createdAt), desc(reviews.id));
  const out: Review[] = [];
  for (const { r, name, email } of rows) {
    const v = await versionRef(db, studioId, r.budgetVersionId);
    out.push({
      id: r.id,
      runId: r.runId,
      decision: r.decision,
      reason: r.reason,
      reviewer: { id: r.reviewerId, name, email },
      budgetVersion: v ?? { id: r.budgetVersionId, name: '(removed)', version: 0 },
      fromState: r.fromState,
      toState: r.toState,
      createdAt: r.createdAt.toISOString(),
    });
  }
  return out;
}

export interface Reviewer extends VenueScopeMember {
  userId: string;
  email: string;
}

/** Clears or holds the run (HttpError 400/403/404/409 when the rules refuse); answers the updated run. */
export async function applyReview(
  tx: Tx,
  studioId: string,
  runId: string,
  reviewer: Reviewer,
  body: ReviewBody,
): Promise<LoadedRun> {
  // The row lock makes two reviews of one run take turns: the second sees the first's state.
  const loaded = await loadRun(tx, studioId, runId, true);
  if (!canSeeVenue(reviewer, loaded.run.venueId)) throw notFound('No such run.');
  const subject = await subjectOf(tx, studioId, loaded);
  const viewer: ReviewViewer = { userId: reviewer.userId, roles: reviewer.roles };
  const rule = body.decision === 'clear' ? clearRule(subject, viewer) : holdRule(subject, viewer);
  if (!rule.allowed) throw new HttpError(rule.status, rule.why ?? 'This review is not allowed.');
  if (rule.reasonRequired && body.reason.length === 0)
    throw badRequest(
      body.decision === 'hold'
        ? 'reason: say why the run is held (the motion engineer reads it before cueing again).'
        : `reason: this run has ${subject.comfortFindings === 1 ? 'a comfort finding' : `${subject.comfortFindings} comfort findings`}; say why it may be cleared anyway.`,
      [{ path: 'reason', message: 'required' }],
    );
  const toState = body.decision === 'clear' ? 'cleared' : 'held';
  await tx.insert(reviews).values({
    studioId,
    runId,
    decision: body.decision,
    reason: body.reason,
    reviewerId: reviewer.userId,
    budgetVersionId: loaded.run.budgetVersionId,
    fromState: loaded.run.state,
    toState,
  });
  const [updated] = await tx
    .update(cueRuns)
    .set({ state: toState })
    .where(inStudio(cueRuns, studioId, eq(cueRuns.id, runId)))
    .returning();
  await recordAudit(tx, {
    studioId,
    actor: { id: reviewer.userId, email: reviewer.email },
    action: body.decision === 'clear' ? 'review.cleared' : 'review.held',
    subjectType: 'run',
    subjectId: runId,
    detail: {
      reason: body.reason,
      fromState: loaded.run.state,
      budgetVersionId: loaded.run.budgetVersionId,
      trackId: loaded.run.trackId,
      venueId: loaded.run.venueId,
    },
  });
  const result = { ...loaded, run: updated! };
  if (body.decision === 'hold') {
    const [who] = await tx.select({ name: users.name }).from(users).where(eq(users.id, reviewer.userId));
    await queueRunHeldMail(tx, studioId, result, {
      reviewerName: who?.name ?? reviewer.email,
      reason: body.reason,
    });
  }
  return result;
}
