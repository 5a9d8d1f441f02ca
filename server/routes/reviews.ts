// Decisions on cue runs: a safety reviewer clears or holds a finished run (POST .../runs/:run/review),
// a producer releases a cleared one (POST .../runs/:run/release), and the run page asks what the
// viewer may do next (GET .../runs/:run/decision). The rules are shared/review-rules.ts, applied by
// server/pipeline/review.ts and releases.ts; every review is kept with who, when, why and the budget
// version judged.
import { Router } from 'express';
import { desc, eq } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { releases } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { canSeeVenue } from '../auth/permissions';
import { HttpError, notFound } from '../lib/http-error';
import { parseBody } from '../lib/validate';
import { actorOf } from '../lib/actor';
import { loadRun, runDetail } from '../pipeline/run-detail';
import { applyReview, reviewsOf, subjectOf } from '../pipeline/review';
import { createRelease } from '../pipeline/releases';
import { clearRule, holdRule, releaseRule } from '../../shared/review-rules';
import type { ReviewViewer } from '../../shared/review-rules';
import { reviewBody } from '../../shared/schemas/review';
import type { ReviewedRun, RunAction, RunDecision } from '../../shared/schemas/review';

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
        release: action(releaseRule(subject, viewer)),
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
      const reviewer = {
        userId: member.userId!,
        email: actor.email,
        roles: member.roles,
        venueIds: member.venueIds,
      };
      const updated = await applyReview(tx, studioId, runId, reviewer, body);
      const detail = await runDetail(tx, studioId, updated);
      const result: ReviewedRun = { ...detail, reviews: await reviewsOf(tx, studioId, runId) };
      return result;
    });
    res.json(out);
  });
  r.post('/:runId/release', requirePermission('releases.create'), async (req, res) => {
    const member = req.member!;
    const actor = actorOf(req);
    if (!member.userId || !actor) throw new HttpError(403, 'A release is signed by a person, not a token.');
    const created = await createRelease(deps.pool, deps.boss, {
      studioId: member.studioId,
      runId: String(req.params.runId),
      actor: { userId: member.userId, email: actor.email, roles: member.roles, venueIds: member.venueIds },
    });
    res.status(201).json(created);
  });
  return r;
}
