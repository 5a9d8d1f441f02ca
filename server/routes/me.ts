import { Router } from 'express';
import { and, asc, eq, inArray } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import type { Db } from '../db/client';
import { mailOptOuts, memberships, studios } from '../db/schema';
import { requireUser } from '../auth/session';
import { parseBody } from '../lib/validate';
import { badRequest } from '../lib/http-error';
import { MAIL_KINDS, notificationSettingsBody } from '../../shared/schemas/notifications';
import type { NotificationSettings } from '../../shared/schemas/notifications';
import type { Me } from '../../shared/schemas/api';
import type { Role } from '../../shared/schemas/roles';

/** The signed-in user with every studio membership. */
export async function loadMe(db: Db, user: Express.User): Promise<Me> {
  const rows = await db
    .select({
      studioId: studios.id,
      studioName: studios.name,
      studioSlug: studios.slug,
      roles: memberships.roles,
      venueIds: memberships.venueIds,
    })
    .from(memberships)
    .innerJoin(studios, eq(studios.id, memberships.studioId))
    .where(eq(memberships.userId, user.id))
    .orderBy(asc(studios.name));
  return {
    user: { id: user.id, email: user.email, name: user.name },
    memberships: rows.map((m) => ({ ...m, roles: m.roles as Role[] })),
  };
}

/** Which kinds of mail the user receives: every kind, on unless turned off. */
export async function loadNotificationSettings(db: Db, userId: string): Promise<NotificationSettings> {
  const off = new Set(
    (await db.select({ kind: mailOptOuts.kind }).from(mailOptOuts).where(eq(mailOptOuts.userId, userId))).map(
      (r) => r.kind,
    ),
  );
  return { kinds: MAIL_KINDS.map((kind) => ({ kind, enabled: !off.has(kind) })) };
}

/** /api/me: the signed-in user's own settings (the mail they receive). */
export function meRouter(deps: AppDeps): Router {
  const r = Router();

  r.get('/notifications', requireUser, async (req, res) => {
    res.json(await loadNotificationSettings(deps.db, req.user!.id));
  });

  // Every kind or some of them; kinds left out keep their setting. Answers the whole settings.
  r.put('/notifications', requireUser, async (req, res) => {
    const body = parseBody(notificationSettingsBody, req.body, 'The notification settings');
    const seen = new Set<string>();
    body.kinds.forEach((k, i) => {
      if (seen.has(k.kind))
        throw badRequest(`kinds.${i}.kind: ${k.kind} is listed twice.`, [
          { path: `kinds.${i}.kind`, message: `${k.kind} is listed twice` },
        ]);
      seen.add(k.kind);
    });
    const userId = req.user!.id;
    await deps.db.transaction(async (tx) => {
      const off = body.kinds.filter((k) => !k.enabled).map((k) => k.kind);
      const on = body.kinds.filter((k) => k.enabled).map((k) => k.kind);
      if (off.length)
        await tx
          .insert(mailOptOuts)
          .values(off.map((kind) => ({ userId, kind })))
          .onConflictDoNothing();
      if (on.length)
        await tx
          .delete(mailOptOuts)
          .where(and(eq(mailOptOuts.userId, userId), inArray(mailOptOuts.kind, on)));
    });
    res.json(await loadNotificationSettings(deps.db, userId));
  });

  return r;
}
