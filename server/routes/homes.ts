// What each role's home lists: the work waiting for that role, most urgent first.
// GET .../home/review: runs awaiting a safety reviewer's decision; GET .../home/engineer: held runs to
// cue again; GET .../home/producer: held runs, cleared runs not yet released, problems venues reported
// and releases still building or failed; GET .../home/operator: the releases of the operator's venues
// (new, installed, withdrawn).
import { Router } from 'express';
import { and, desc, eq, inArray } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import type { Db } from '../db/client';
import { cueRuns, reviews, takes, tracks, users, venues } from '../db/schema';
import type { VenueScopeMember } from '../../shared/permissions';
import { inStudio, visibleVenues } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { worstUse } from '../pipeline/views';
import { findingCounts } from '../pipeline/review';
import { listReleases } from '../pipeline/releases';
import type {
  EngineerHome,
  HomeRun,
  OperatorHome,
  ProducerHome,
  ReviewQueue,
} from '../../shared/schemas/homes';

async function homeRuns(
  db: Db,
  studioId: string,
  member: VenueScopeMember,
  states: string[],
): Promise<HomeRun[]> {
  const rows = await db
    .select({ run: cueRuns, takeNumber: takes.number, trackTitle: tracks.title, venueName: venues.name })
    .from(cueRuns)
    .innerJoin(takes, eq(takes.id, cueRuns.takeId))
    .innerJoin(tracks, eq(tracks.id, cueRuns.trackId))
    .innerJoin(venues, eq(venues.id, cueRuns.venueId))
    .where(
      and(inStudio(cueRuns, studioId, inArray(cueRuns.state, states as never[])), visibleVenues(member)),
    );
  const ids = rows.map((r) => r.run.id);
  const last = new Map<string, HomeRun['lastReview']>();
  if (ids.length) {
    const revs = await db
      .select({ r: reviews, name: users.name })
      .from(reviews)
      .innerJoin(users, eq(users.id, reviews.reviewerId))
      .where(inStudio(reviews, studioId, inArray(reviews.runId, ids)))
      .orderBy(desc(reviews.createdAt));
    for (const { r, name } of revs)
      if (!last.has(r.runId))
        last.set(r.runId, {
          decision: r.decision,
          reason: r.reason,
          by: name,
          at: r.createdAt.toISOString(),
        });
  }
  return rows.map(({ run, takeNumber, trackTitle, venueName }) => {
    const counts = findingCounts(run);
    const w = worstUse(run.summary);
    return {
      id: run.id,
      trackId: run.trackId,
      trackTitle,
      takeNumber,
      venueId: run.venueId,
      venueName,
      state: run.state,
      hardFindings: counts.hard,
      comfortFindings: counts.comfort,
      worstRatio: w?.ratio ?? null,
      worstCheck: w?.check ?? null,
      finishedAt: run.finishedAt?.toISOString() ?? null,
      lastReview: last.get(run.id) ?? null,
    };
  });
}

/** Worst first: hard findings, then comfort findings, then the worst use; the oldest first among equals. */
function worstFirst(a: HomeRun, b: HomeRun): number {
  return (
    b.hardFindings - a.hardFindings ||
    b.comfortFindings - a.comfortFindings ||
    (b.worstRatio ?? 0) - (a.worstRatio ?? 0) ||
    (a.finishedAt ?? '').localeCompare(b.finishedAt ?? '')
  );
}

export function homesRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });

  r.get('/review', requirePermission('home.review'), async (req, res) => {
    const m = req.member!;
    const runs = await homeRuns(deps.db, m.studioId, m, ['awaiting_review', 'held_by_budget']);
    const out: ReviewQueue = { runs: runs.sort(worstFirst) };
    res.json(out);
  });

  r.get('/engineer', requirePermission('home.engineer'), async (req, res) => {
    const m = req.member!;
    const runs = await homeRuns(deps.db, m.studioId, m, ['held_by_budget', 'held']);
    // Held by budget with only comfort findings waits for a reviewer, not for new cueing.
    const held = runs.filter((x) => x.state === 'held' || x.hardFindings > 0);
    const out: EngineerHome = { held: held.sort(worstFirst) };
    res.json(out);
  });
  r.get('/producer', requirePermission('home.producer'), async (req, res) => {
    const m = req.member!;
    const runs = await homeRuns(deps.db, m.studioId, m, ['held_by_budget', 'held', 'cleared']);
    const all = await listReleases(deps.db, m.studioId, m);
    const problems = all
      .flatMap((release) => release.problems.map((problem) => ({ problem, release })))
      .sort((a, b) => b.problem.at.localeCompare(a.problem.at));
    const out: ProducerHome = {
      held: runs.filter((x) => x.state !== 'cleared').sort(worstFirst),
      clearedNotReleased: runs
        .filter((x) => x.state === 'cleared')
        .sort((a, b) => (a.finishedAt ?? '').localeCompare(b.finishedAt ?? '')),
      problems,
      releasesInProgress: all.filter((x) => x.state === 'building' || x.state === 'failed'),
    };
    res.json(out);
  });

  r.get('/operator', requirePermission('home.operator'), async (req, res) => {
    const m = req.member!;
    const all = await listReleases(deps.db, m.studioId, m, { states: ['ready', 'superseded', 'withdrawn'] });
    const installed = (x: (typeof all)[number]) => x.acknowledgements.length > 0;
    const out: OperatorHome = {
      new: all.filter((x) => x.state === 'ready' && !installed(x)),
      installed: all.filter((x) => x.state !== 'withdrawn' && installed(x)),
      withdrawn: all.filter((x) => x.state === 'withdrawn'),
    };
    res.json(out);
  });
  return r;
}
