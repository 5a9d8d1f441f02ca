import { Router } from 'express';
import { and, arrayOverlaps, count, countDistinct, eq, inArray } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { cueRuns, memberships, studios, tracks, venues } from '../db/schema';
import { inStudio, visibleVenues } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { venueScope } from '../auth/permissions';

/** Matches no venue (no venue has the nil UUID), for an operator assigned to none. */
const NO_VENUE = '00000000-0000-0000-0000-000000000000';

/**
 * GET /api/studios/:studioId/overview: the counts every home screen starts from. A member limited to
 * some venues (venueScope) gets every figure about those venues only: their venues, the tracks with a
 * run for one of them, those runs by state, and the members assigned to one of them.
 */
export function overviewRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  r.get('/', requirePermission('studio.read'), async (req, res) => {
    const m = req.member!;
    const scope = venueScope(m);
    const scopeIds = scope === null ? null : scope.length > 0 ? [...scope] : [NO_VENUE];
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
      .where(
        scopeIds === null
          ? eq(memberships.studioId, m.studioId)
          : and(eq(memberships.studioId, m.studioId), arrayOverlaps(memberships.venueIds, scopeIds)),
      );
    const runsAtVenues = scopeIds === null ? undefined : inArray(cueRuns.venueId, scopeIds);
    const [tr] =
      scopeIds === null
        ? await deps.db.select({ n: count() }).from(tracks).where(inStudio(tracks, m.studioId))
        : await deps.db
            .select({ n: countDistinct(cueRuns.trackId) })
            .from(cueRuns)
            .where(inStudio(cueRuns, m.studioId, runsAtVenues));
    const byState = await deps.db
      .select({ state: cueRuns.state, n: count() })
      .from(cueRuns)
      .where(inStudio(cueRuns, m.studioId, runsAtVenues))
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
