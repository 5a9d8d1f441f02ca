// Public side of invitations: read one by its e-mailed token, and accept it.
import { Router } from 'express';
import { and, eq, isNull } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { invitations, memberships, studios, users } from '../db/schema';
import { hashToken } from '../lib/tokens';
import { HttpError, notFound } from '../lib/http-error';
import { parseBody } from '../lib/validate';
import { acceptInvitationBody } from '../../shared/schemas/api';
import { hashPassword, verifyPassword } from '../auth/passwords';
import { recordAudit } from '../audit';
import { logIn } from './auth';
import { loadMe } from './me';
import type { PasswordThrottle } from '../auth/throttle';

export function invitationsRouter(deps: AppDeps, throttle: PasswordThrottle): Router {
  const r = Router();
  const now = deps.now ?? (() => new Date());

  const find = async (token: string) => {
    const [row] = await deps.db
      .select({ inv: invitations, studioName: studios.name })
      .from(invitations)
      .innerJoin(studios, eq(studios.id, invitations.studioId))
      .where(and(eq(invitations.tokenHash, hashToken(token)), isNull(invitations.revokedAt)))
      .limit(1);
    if (!row) throw notFound('This invitation does not exist or was revoked.');
    if (row.inv.acceptedAt) throw new HttpError(410, 'This invitation was already accepted.');
    if (row.inv.expiresAt <= now())
      throw new HttpError(410, 'This invitation has expired. Ask the studio admin for a new one.');
    return row;
  };

  r.get('/:token', async (req, res) => {
    const { inv, studioName } = await find(String(req.params.token));
    const [u] = await deps.db.select({ id: users.id }).from(users).where(eq(users.email, inv.email)).limit(1);
    res.json({ studioName, email: inv.email, roles: inv.roles, existingUser: Boolean(u) });
  });

  // Accepting as an existing user checks that account's password: the same limits as sign-in,
  // counted against the invited address.
  const acceptLimiter = throttle.guard(async (req) => {
    const [row] = await deps.db
      .select({ email: invitations.email })
      .from(invitations)
      .where(eq(invitations.tokenHash, hashToken(String(req.params.token))))
      .limit(1);
    return row?.email ?? '';
  });

  r.post('/:token/accept', ...acceptLimiter, async (req, res) => {
    const { inv } = await find(String(req.params.token));
    const body = parseBody(acceptInvitationBody, req.body, 'The invitation form');
    const [existing] = await deps.db.select().from(users).where(eq(users.email, inv.email)).limit(1);
    let user: Express.User | null = null;
    let passwordHash: string | null = null;
    if (existing) {
      const signedInAsInvitee = req.user?.id === existing.id;
      if (
        !signedInAsInvitee &&
        !(body.password && (await verifyPassword(existing.passwordHash, body.password)))
      ) {
        throw new HttpError(401, `Sign in as ${inv.email}, or enter that account's password, to accept.`);
      }
      user = { id: existing.id, email: existing.email, name: existing.name };
    } else {
      if (!body.name || !body.password) {
        throw new HttpError(400, 'Enter your name and a password to create your account.', [
          ...(body.name ? [] : [{ path: 'name', message: 'required' }]),
          ...(body.password ? [] : [{ path: 'password', message: 'required' }]),
        ]);
      }
      // Hashed before the transaction, so the invitation's row is locked only briefly.
      passwordHash = await hashPassword(body.password);
    }
    // One transaction, which first claims the invitation: of two parallel accepts the second waits on
    // the row, then finds it accepted (410) instead of meeting a unique violation.
    const accepted = await deps.db.transaction(async (tx) => {
      const claimed = await tx
        .update(invitations)
        .set({ acceptedAt: now() })
        .where(and(eq(invitations.id, inv.id), isNull(invitations.acceptedAt)))
        .returning({ id: invitations.id });
      if (claimed.length === 0) throw new HttpError(410, 'This invitation was already accepted.');
      let member = user;
      if (!member) {
        const [created] = await tx
          .insert(users)
          .values({ email: inv.email, name: body.name!, passwordHash: passwordHash! })
          .onConflictDoNothing({ target: users.email })
          .returning();
        if (!created) {
          throw new HttpError(
            409,
            `An account for ${inv.email} was created meanwhile. Sign in with it, then accept the invitation.`,
          );
        }
        member = { id: created.id, email: created.email, name: created.name };
      }
      await tx
        .insert(memberships)
        .values({ studioId: inv.studioId, userId: member.id, roles: inv.roles, venueIds: inv.venueIds })
        .onConflictDoUpdate({
          target: [memberships.studioId, memberships.userId],
          set: { roles: inv.roles, venueIds: inv.venueIds },
        });
      await recordAudit(tx, {
        studioId: inv.studioId,
        actor: member,
        action: 'invitation.accepted',
        subjectType: 'invitation',
        subjectId: inv.id,
        detail: { email: inv.email, roles: inv.roles },
      });
      return member;
    });
    user = accepted;
    if (req.user?.id !== user.id) await logIn(req, user);
    res.json(await loadMe(deps.db, user));
  });
  return r;
}
