import { Router } from 'express';
import { count, eq } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { cueRuns, memberships, studios, tracks, venues } from '../db/schema';
import { inStudio, visibleVenues } from '../db/scope';
import { requirePermission } from '../auth/require-permission';

/** GET /api/studios/:studioId/overview: the counts every home screen starts from. */
export function overviewRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  r.get('/', requirePermission('studio.read'), async (req, res) => {
    const m = req.member!;
    const [studio] = await deps.db
      .select({ id: studios.id, name: studios.name, slug: studios.slug })
      .from(studios)
      .where(eq(studios.id, m.studioId));
    const [v] = await deps.db
      .select({ n: count() })
      .from(venues)
      .where(inStudio(venues, m.studioId, visibleVenues(m)));
    const [mem] = await deps.db
      .select({ n: count() })
      .from(memberships)
      .where(eq(memberships.studioId, m.studioId));
    const [tr] = await deps.db.select({ n: count() }).from(tracks).where(inStudio(tracks, m.studioId));
    const byState = await deps.db
      .select({ state: cueRuns.state, n: count() })
      .from(cueRuns)
      .where(inStudio(cueRuns, m.studioId))
      .groupBy(cueRuns.state);
    const runs = (s: string) => byState.filter((b) => b.state === s).reduce((a, b) => a + b.n, 0);
    res.json({
      studio,
      roles: m.roles,
      counts: {
        venues: v?.n ?? 0,
        members: mem?.n ?? 0,
        tracks: tr?.n ?? 0,
        queued: runs('queued') + runs('cueing'),
        awaitingReview: runs('awaiting_review'),
        held: runs('held_by_budget') + runs('held'),
        failed: runs('failed'),
        released: runs('released'),
      },
    });
  });
  return r;
}
