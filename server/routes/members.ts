// Members and invitations of a studio (studio admins only).
import { Router } from 'express';
import { and, asc, desc, eq, gt, isNull, ne } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { invitations, memberships, users, venues } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { isUuid, parseBody } from '../lib/validate';
import { badRequest, notFound } from '../lib/http-error';
import { inviteBody, memberUpdateBody } from '../../shared/schemas/api';
import type { Invitation, Member } from '../../shared/schemas/api';
import type { Role } from '../../shared/schemas/roles';
import { ROLE_LABELS } from '../../shared/schemas/roles';
import { hashToken, newToken } from '../lib/tokens';
import { recordAudit } from '../audit';
import { publicUrl } from '../env';
import { studios } from '../db/schema';

const INVITE_TTL_MS = 7 * 24 * 60 * 60 * 1000;

/** Venue ids must name venues of this studio; an operator needs at least one. */
async function checkVenueScope(
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

const toInvitation = (i: typeof invitations.$inferSelect): Invitation => ({
  id: i.id,
  email: i.email,
  roles: i.roles as Role[],
  venueIds: i.venueIds,
  expiresAt: i.expiresAt.toISOString(),
  acceptedAt: i.acceptedAt?.toISOString() ?? null,
});

export function membersRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  const now = deps.now ?? (() => new Date());
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

  r.get('/members', admin, async (req, res) => {
    res.json(await listMembers(req.member!.studioId));
  });

  r.patch('/members/:userId', admin, async (req, res) => {
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

  r.delete('/members/:userId', admin, async (req, res) => {
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

  r.get('/invitations', admin, async (req, res) => {
    const rows = await deps.db
      .select()
      .from(invitations)
      .where(
        inStudio(
          invitations,
          req.member!.studioId,
          isNull(invitations.revokedAt),
          isNull(invitations.acceptedAt),
          gt(invitations.expiresAt, now()),
        ),
      )
      .orderBy(desc(invitations.createdAt));
    res.json(rows.map(toInvitation));
  });

  r.post('/invitations', admin, async (req, res) => {
    const m = req.member!;
    const body = parseBody(inviteBody, req.body, 'The invitation form');
    const [existing] = await deps.db
      .select({ userId: users.id })
      .from(users)
      .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.studioId, m.studioId)))
      .where(eq(users.email, body.email));
    if (existing)
      throw badRequest('Already a member.', [
        { path: 'email', message: 'this person is already a member of the studio' },
      ]);
    const venueIds = await checkVenueScope(deps.db, m.studioId, body.roles, body.venueIds);
    const token = newToken();
    const [studio] = await deps.db.select().from(studios).where(eq(studios.id, m.studioId));
    const inv = await deps.db.transaction(async (tx) => {
      const [row] = await tx
        .insert(invitations)
        .values({
          studioId: m.studioId,
          email: body.email,
          roles: body.roles,
          venueIds,
          tokenHash: hashToken(token),
          invitedBy: req.user!.id,
          expiresAt: new Date(now().getTime() + INVITE_TTL_MS),
        })
        .returning();
      await recordAudit(tx, {
        studioId: m.studioId,
        actor: req.user!,
        action: 'invitation.sent',
        subjectType: 'invitation',
        subjectId: row!.id,
        detail: { email: body.email, roles: body.roles, venueIds },
      });
      return row!;
    });
    const link = `${publicUrl(deps.env)}/invitations/${encodeURIComponent(token)}`;
    await deps.mailer.send({
      to: body.email,
      subject: `Legwork: ${req.user!.name} invites you to ${studio?.name ?? 'a studio'}`,
      text: `Hello,\n\n${req.user!.name} invites you to join ${studio?.name ?? 'a studio'} on Legwork as ${body.roles.map((x) => ROLE_LABELS[x]).join(', ')}.\n\nAccept within seven days:\n\n${link}\n`,
    });
    res.status(201).json(toInvitation(inv));
  });

  r.delete('/invitations/:id', admin, async (req, res) => {
    const m = req.member!;
    const id = String(req.params.id);
    if (!isUuid(id)) throw notFound('No such invitation.');
    const [row] = await deps.db
      .update(invitations)
      .set({ revokedAt: now() })
      .where(inStudio(invitations, m.studioId, eq(invitations.id, id), isNull(invitations.revokedAt)))
      .returning();
    if (!row) throw notFound('No such invitation.');
    await recordAudit(deps.db, {
      studioId: m.studioId,
      actor: req.user!,
      action: 'invitation.revoked',
      subjectType: 'invitation',
      subjectId: id,
      detail: { email: row.email },
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
