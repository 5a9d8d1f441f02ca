// The invitations of a studio (studio admins only); accepting one is in invitations.ts.
import { Router } from 'express';
import { and, desc, eq, gt, isNull } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { invitations, memberships, studios, users } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { isUuid, parseBody } from '../lib/validate';
import { badRequest, notFound } from '../lib/http-error';
import { inviteBody } from '../../shared/schemas/api';
import type { Invitation } from '../../shared/schemas/api';
import type { Role } from '../../shared/schemas/roles';
import { ROLE_LABELS } from '../../shared/schemas/roles';
import { hashToken, newToken } from '../lib/tokens';
import { recordAudit } from '../audit';
import { publicUrl } from '../env';
import { checkVenueScope } from './members';

const INVITE_TTL_MS = 7 * 24 * 60 * 60 * 1000;

const toInvitation = (i: typeof invitations.$inferSelect): Invitation => ({
  id: i.id,
  email: i.email,
  roles: i.roles as Role[],
  venueIds: i.venueIds,
  expiresAt: i.expiresAt.toISOString(),
  acceptedAt: i.acceptedAt?.toISOString() ?? null,
});

export function studioInvitationsRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  const now = deps.now ?? (() => new Date());
  const admin = requirePermission('members.manage');

  r.get('/', admin, async (req, res) => {
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

  r.post('/', admin, async (req, res) => {
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
    // Sent directly, not through the outbox, so the one-time link is never stored. The invitation is
    // kept whatever the mail server does; the answer says whether its mail went.
    let mailSent = true;
    try {
      await deps.mailer.send({
        to: body.email,
        subject: `Legwork: ${req.user!.name} invites you to ${studio?.name ?? 'a studio'}`,
        text: `Hello,\n\n${req.user!.name} invites you to join ${studio?.name ?? 'a studio'} on Legwork as ${body.roles.map((x) => ROLE_LABELS[x]).join(', ')}.\n\nAccept within seven days:\n\n${link}\n`,
      });
    } catch (e) {
      mailSent = false;
      deps.log(`invitation ${inv.id} mail not sent: ${e instanceof Error ? e.message : String(e)}`);
    }
    res.status(201).json({ ...toInvitation(inv), mailSent });
  });

  r.delete('/:id', admin, async (req, res) => {
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
