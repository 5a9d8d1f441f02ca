// Reviews of cue runs: a safety reviewer clears or holds a finished run (POST .../runs/:run/review),
// and the run page asks what the viewer may do next (GET .../runs/:run/decision). The rules are
// shared/review-rules.ts; every review is kept with who, when, why and the budget version judged.
import { Router } from 'express';
import { desc, eq, inArray } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { cueRuns, releases, reviews, users } from '../db/schema';
import type { CueRunRow } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { canSeeVenue } from '../auth/permissions';
import { HttpError, badRequest, notFound } from '../lib/http-error';
import { parseBody } from '../lib/validate';
import { actorOf } from '../lib/actor';
import { recordAudit } from '../audit';
import { loadRun, runDetail } from '../pipeline/run-detail';
import type { LoadedRun } from '../pipeline/run-detail';
import { versionRef } from '../pipeline/views';
import { clearRule, holdRule } from '../../shared/review-rules';
import type { ReviewSubject, ReviewViewer } from '../../shared/review-rules';
import { reviewBody } from '../../shared/schemas/review';
import type { Review, ReviewedRun, RunAction, RunDecision } from '../../shared/schemas/review';

/** Hard and comfort finding counts of a finished run. */
export function findingCounts(run: CueRunRow): { hard: number; comfort: number } {
  const f = run.summary?.findings ?? [];
  return {
    hard: f.filter((x) => x.severity === 'hard').length,
    comfort: f.filter((x) => x.severity === 'comfort').length,
  };
}

async function subjectOf(db: Db | Tx, studioId: string, loaded: LoadedRun): Promise<ReviewSubject> {
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

const action = (a: { allowed: boolean; reasonRequired: boolean; why: string | null }): RunAction => ({
  allowed: a.allowed,
  reasonRequired: a.reasonRequired,
  why: a.why,
});

export function reviewsRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });

  // Runs are studio-desk work; an operator (or a token) cannot see them at all.
  r.get('/:runId/decision', requirePermission('runs.read'), async (req, res) => {
    const member = req.member!;
    const loaded = await loadRun(deps.db, member.studioId, String(req.params.runId));
    if (!canSeeVenue(member, loaded.run.venueId)) throw notFound('No such run.');
    const subject = await subjectOf(deps.db, member.studioId, loaded);
    const viewer: ReviewViewer = { userId: member.userId, roles: member.roles };
    const rel = await deps.db
      .select({ id: releases.id })
      .from(releases)
      .where(inStudio(releases, member.studioId, eq(releases.runId, loaded.run.id)))
      .orderBy(desc(releases.createdAt));
    const out: RunDecision = {
      runId: loaded.run.id,
      state: loaded.run.state,
      hardFindings: subject.hardFindings,
      comfortFindings: subject.comfortFindings,
      reviews: await reviewsOf(deps.db, member.studioId, loaded.run.id),
      releaseIds: rel.map((x) => x.id),
      actions: {
        clear: action(clearRule(subject, viewer)),
        hold: action(holdRule(subject, viewer)),
        // Packages are not built by this version of the server yet: say so rather than offer a
        // button that cannot work.
        release: {
          allowed: false,
          reasonRequired: false,
          why:
            loaded.run.state === 'cleared'
              ? 'Building release packages is not available in this version of Legwork yet.'
              : 'Only a cleared run can be released.',
        },
      },
    };
    res.json(out);
  });

  r.post('/:runId/review', requirePermission('runs.review'), async (req, res) => {
    const member = req.member!;
    const studioId = member.studioId;
    const runId = String(req.params.runId);
    const body = parseBody(reviewBody, req.body, 'The review');
    const actor = actorOf(req);
    if (!member.userId || !actor) throw new HttpError(403, 'A review is signed by a person, not a token.');
    const out = await deps.db.transaction(async (tx) => {
      // The row lock makes two reviews of one run take turns: the second sees the first's state.
      const loaded = await loadRun(tx, studioId, runId, true);
      if (!canSeeVenue(member, loaded.run.venueId)) throw notFound('No such run.');
      const subject = await subjectOf(tx, studioId, loaded);
      const viewer: ReviewViewer = { userId: member.userId, roles: member.roles };
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
        reviewerId: member.userId!,
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
        actor,
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
      const detail = await runDetail(tx, studioId, { ...loaded, run: updated! });
      const result: ReviewedRun = { ...detail, reviews: await reviewsOf(tx, studioId, runId) };
      return result;
    });
    res.json(out);
  });
  return r;
}
