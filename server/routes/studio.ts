// Everything under /api/studios/:studioId. Membership is checked once here: a studio the user does
// not belong to answers 404, exactly like one that does not exist.
import { Router } from 'express';
import { and, eq } from 'drizzle-orm';
import { z } from 'zod';
import type { AppDeps } from '../deps';
import { memberships, studios } from '../db/schema';
import { notFound } from '../lib/http-error';
import { requireUser } from '../auth/session';
import { membersRouter } from './members';
import { venuesRouter } from './venues';
import { auditRouter } from './audit';
import { overviewRouter } from './overview';

const uuid = z.string().uuid();

export function studioRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  r.use(requireUser);
  r.use(async (req, _res, next) => {
    const studioId = String((req.params as Record<string, string>).studioId ?? '');
    if (!uuid.safeParse(studioId).success) throw notFound('No such studio.');
    const [m] = await deps.db
      .select({ roles: memberships.roles, venueIds: memberships.venueIds })
      .from(memberships)
      .innerJoin(studios, eq(studios.id, memberships.studioId))
      .where(and(eq(memberships.studioId, studioId), eq(memberships.userId, req.user!.id)))
      .limit(1);
    if (!m) throw notFound('No such studio.');
    req.member = { studioId, userId: req.user!.id, roles: m.roles, venueIds: m.venueIds };
    next();
  });
  r.use('/overview', overviewRouter(deps));
  r.use('/venues', venuesRouter(deps));
  r.use('/', membersRouter(deps));
  r.use('/audit', auditRouter(deps));
  return r;
}
