import { Router } from 'express';
import { asc, inArray } from 'drizzle-orm';
import type { SQL } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { venues } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import type { Venue } from '../../shared/schemas/api';

/** A member who is only a venue operator sees only the venues in their scope. */
export function visibleVenueFilter(member: { roles: string[]; venueIds: string[] }): SQL | undefined {
  const onlyOperator = member.roles.every((r) => r === 'venue_operator');
  if (!onlyOperator) return undefined;
  return inArray(
    venues.id,
    member.venueIds.length ? member.venueIds : ['00000000-0000-0000-0000-000000000000'],
  );
}

interface BaseSummary {
  kind?: 'hexapod' | 'planar3';
  controllerRate_hz?: number;
  seats_m?: unknown[];
}

/** GET /api/studios/:studioId/venues. */
export function venuesRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  r.get('/', requirePermission('venues.read'), async (req, res) => {
    const m = req.member!;
    const rows = await deps.db
      .select()
      .from(venues)
      .where(inStudio(venues, m.studioId, visibleVenueFilter(m)))
      .orderBy(asc(venues.name));
    const out: Venue[] = rows.map((v) => {
      const base = v.base as BaseSummary;
      return {
        id: v.id,
        name: v.name,
        site: v.site,
        timeZone: v.timeZone,
        baseKind: base.kind ?? 'hexapod',
        controllerRate_hz: base.controllerRate_hz ?? 0,
        seatCount: base.seats_m?.length ?? 0,
      };
    });
    res.json(out);
  });
  return r;
}
