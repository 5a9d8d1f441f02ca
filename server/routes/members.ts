// The members of a studio (studio admins only).
import { Router } from 'express';
import { asc, eq, ne } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { memberships, users, venues } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { isUuid, parseBody } from '../lib/validate';
import { badRequest, notFound } from '../lib/http-error';
import { memberUpdateBody } from '../../shared/schemas/api';
import type { Member } from '../../shared/schemas/api';
import type { Role } from '../../shared/schemas/roles';
import { recordAudit } from '../audit';

/** Venue ids must name venues of this studio; an operator needs at least one (members and invitations). */
export async function checkVenueScope(
  db: Db | Tx,
  studioId: string,
  roles: string[],
  venueIds: string[],
): Promise<string[]> {
  const unique = [...new Set(venueIds)];
  if (unique.length) {
    const found = await db.select({ id: venues.id }).from(venues).where(inStudio(venues, studioId));
    const ok = new Set(found.map((v) => v.id));
    const bad = unique.filter((id) => !ok.has(id));
    if (bad.length)
      throw badRequest('Unknown venue.', [
        { path: 'venueIds', message: `not a venue of this studio: ${bad.join(', ')}` },
      ]);
  }
  if (roles.includes('venue_operator') && unique.length === 0) {
    throw badRequest('A venue operator needs at least one venue.', [
      { path: 'venueIds', message: 'choose the venues this operator works at' },
    ]);
  }
  return roles.includes('venue_operator') ? unique : [];
}

export function membersRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  const admin = requirePermission('members.manage');

  const listMembers = async (studioId: string, userId?: string): Promise<Member[]> => {
    const rows = await deps.db
      .select({
        userId: users.id,
        email: users.email,
        name: users.name,
        roles: memberships.roles,
        venueIds: memberships.venueIds,
        joinedAt: memberships.createdAt,
      })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(inStudio(memberships, studioId, userId ? eq(memberships.userId, userId) : undefined))
      .orderBy(asc(users.name));
    return rows.map((m) => ({ ...m, roles: m.roles as Role[], joinedAt: m.joinedAt.toISOString() }));
  };

  r.get('/', admin, async (req, res) => {
    res.json(await listMembers(req.member!.studioId));
  });

  r.patch('/:userId', admin, async (req, res) => {
    const m = req.member!;
    const body = parseBody(memberUpdateBody, req.body, 'The member form');
    const userId = String(req.params.userId);
    const [before] = await listMembers(
      m.studioId,
      isUuid(userId) ? userId : '00000000-0000-0000-0000-000000000000',
    );
    if (!before) throw notFound('No such member in this studio.');
    await deps.db.transaction(async (tx) => {
      const venueIds = await checkVenueScope(tx, m.studioId, body.roles, body.venueIds);
      if (before.roles.includes('studio_admin') && !body.roles.includes('studio_admin'))
        await keepOneAdmin(tx, m.studioId, userId);
      await tx
        .update(memberships)
        .set({ roles: body.roles, venueIds })
        .where(inStudio(memberships, m.studioId, eq(memberships.userId, userId)));
      await recordAudit(tx, {
        studioId: m.studioId,
        actor: req.user!,
        action: 'member.roles_changed',
        subjectType: 'user',
        subjectId: userId,
        detail: { email: before.email, from: before.roles, to: body.roles, venueIds },
      });
    });
    const [after] = await listMembers(m.studioId, userId);
    res.json(after);
  });

  r.delete('/:userId', admin, async (req, res) => {
    const m = req.member!;
    const userId = String(req.params.userId);
    const [before] = await listMembers(
      m.studioId,
      isUuid(userId) ? userId : '00000000-0000-0000-0000-000000000000',
    );
    if (!before) throw notFound('No such member in this studio.');
    await deps.db.transaction(async (tx) => {
      if (before.roles.includes('studio_admin')) await keepOneAdmin(tx, m.studioId, userId);
      await tx.delete(memberships).where(inStudio(memberships, m.studioId, eq(memberships.userId, userId)));
      await recordAudit(tx, {
        studioId: m.studioId,
        actor: req.user!,
        action: 'member.removed',
        subjectType: 'user',
        subjectId: userId,
        detail: { email: before.email, roles: before.roles },
      });
    });
    res.status(204).end();
  });

  return r;
}

/** Refuses a change that would leave the studio with no admin. */
async function keepOneAdmin(tx: Tx, studioId: string, leavingUserId: string): Promise<void> {
  const others = await tx
    .select({ roles: memberships.roles })
    .from(memberships)
    .where(inStudio(memberships, studioId, ne(memberships.userId, leavingUserId)));
  if (!others.some((o) => o.roles.includes('studio_admin'))) {
    throw badRequest('A studio needs at least one studio admin.', [
      { path: 'roles', message: 'keep at least one studio admin' },
    ]);
  }
}
