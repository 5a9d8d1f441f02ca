// Everything under /api/studios/:studioId. Membership is checked once here: a studio the user does
// not belong to answers 404, exactly like one that does not exist.
import { Router } from 'express';
import type { NextFunction, Request } from 'express';
import { acrossStudios, inStudioScope } from '../db/wall';
import { and, eq, isNull } from 'drizzle-orm';
import { z } from 'zod';
import type { AppDeps } from '../deps';
import { apiTokens } from '../db/schema';
import { HttpError, notFound } from '../lib/http-error';
import { TOKEN_ROLE } from '../auth/permissions';
import { hashToken } from '../lib/tokens';
import { MembershipLoader } from '../auth/membership-loader';
import { bearerToken } from '../auth/session';
import { auditCsvRouter, auditRouter } from './audit';
import { homesRouter } from './homes';
import { membersRouter } from './members';
import { overviewRouter } from './overview';
import { profilesRouter } from './profiles';
import { releasesRouter } from './releases';
import { reviewsRouter } from './reviews';
import { runsRouter } from './runs';
import { studioInvitationsRouter } from './studio-invitations';
import { takesRouter } from './takes';
import { tokensRouter } from './tokens';
import { tracksRouter } from './tracks';
import { venuesRouter } from './venues';

const uuid = z.string().uuid();

export function studioRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  const memberships = new MembershipLoader(deps.pool);
  r.use(async (req, _res, next) => {
    const studioId = String((req.params as Record<string, string>).studioId ?? '');
    const bearer = bearerToken(req.headers.authorization);
    if (bearer !== null && bearer !== 'malformed') {
      // A pipeline's API token: it belongs to one studio; any other studio is not found. The token
      // is found by its hash alone, before its studio is known: across studios, deliberately.
      const [tok] = await acrossStudios(() =>
        deps.db
          .select({ id: apiTokens.id, studioId: apiTokens.studioId })
          .from(apiTokens)
          .where(and(eq(apiTokens.tokenHash, hashToken(bearer)), isNull(apiTokens.revokedAt)))
          .limit(1),
      );
      if (!tok) throw new HttpError(401, 'This API token is not valid (unknown or revoked).');
      if (tok.studioId !== studioId) throw notFound('No such studio.');
      return inStudioScope(studioId, async () => {
        await deps.db.update(apiTokens).set({ lastUsedAt: new Date() }).where(eq(apiTokens.id, tok.id));
        req.member = { studioId, userId: null, tokenId: tok.id, roles: [TOKEN_ROLE], venueIds: [] };
        next();
      });
    }
    if (!req.user) throw new HttpError(401, 'Sign in first.');
    if (!uuid.safeParse(studioId).success) throw notFound('No such studio.');
    // From here on, every query of the request sees this studio's rows only (server/db/wall.ts).
    return inStudioScope(studioId, () => member(req, studioId, next));
  });
  const member = async (req: Request, studioId: string, next: NextFunction) => {
    // Read on every request, never from memory; requests arriving together share one query
    // (server/auth/membership-loader.ts). The studio's data version comes with it.
    const m = await memberships.load(studioId, req.user!.id);
    if (!m) throw notFound('No such studio.');
    req.member = {
      studioId,
      userId: req.user!.id,
      tokenId: null,
      roles: m.roles,
      venueIds: m.venueIds,
      dataVersion: m.dataVersion,
    };
    next();
  };
  // One router per resource, each mounted once.
  r.use('/overview', overviewRouter(deps));
  r.use('/venues', venuesRouter(deps));
  r.use('/tracks', tracksRouter(deps));
  r.use('/takes', takesRouter(deps));
  r.use('/runs', runsRouter(deps));
  r.use('/runs', reviewsRouter(deps));
  r.use('/releases', releasesRouter(deps));
  r.use('/home', homesRouter(deps));
  r.use('/profiles', profilesRouter(deps));
  r.use('/tokens', tokensRouter(deps));
  r.use('/members', membersRouter(deps));
  r.use('/invitations', studioInvitationsRouter(deps));
  r.use('/audit.csv', auditCsvRouter(deps));
  r.use('/audit', auditRouter(deps));
  return r;
}
