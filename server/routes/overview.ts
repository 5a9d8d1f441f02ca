import { Router } from 'express';
import { count, eq } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { memberships, studios, venues } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { visibleVenueFilter } from './venues';

/** GET /api/studios/:studioId/overview: the counts every home screen starts from. */
export function overviewRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  r.get('/', requirePermission('studio.read'), async (req, res) => {
    const m = req.member!;
    const [studio] = await deps.db.select({ id: studios.id, name: studios.name, slug: studios.slug }).from(studios).where(eq(studios.id, m.studioId));
    const [v] = await deps.db.select({ n: count() }).from(venues).where(inStudio(venues, m.studioId, visibleVenueFilter(m)));
    const [mem] = await deps.db.select({ n: count() }).from(memberships).where(eq(memberships.studioId, m.studioId));
    res.json({
      studio,
      roles: m.roles,
      // Tracks, reviews and releases are counted here once the pipeline stores them.
      counts: { venues: v?.n ?? 0, members: mem?.n ?? 0, tracks: 0, awaitingReview: 0, held: 0, released: 0 },
    });
  });
  return r;
}
