import { Router } from 'express';
import type { Request } from 'express';
import type passport from 'passport';
import { and, eq, gt, isNull, sql } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { loginBody, resetConfirmBody, resetRequestBody } from '../../shared/schemas/api';
import { parseBody } from '../lib/validate';
import { HttpError } from '../lib/http-error';
import { csrfToken } from '../auth/session';
import { passwordResets, users } from '../db/schema';
import { hashToken, newToken } from '../lib/tokens';
import { hashPassword } from '../auth/passwords';
import { recordAudit } from '../audit';
import { publicUrl } from '../env';
import { loadMe } from './me';
import type { PasswordThrottle } from '../auth/throttle';
import type { AuthCache } from '../auth/auth-cache';

const RESET_TTL_MS = 60 * 60 * 1000;

/** Signs `user` into the session (passport regenerates the session id). */
export const logIn = (req: Request, user: Express.User): Promise<void> =>
  new Promise((resolve, reject) => req.logIn(user, (e) => (e ? reject(e) : resolve())));

/** /api/auth: CSRF token, sign-in, sign-out, the current user, password reset. */
export function authRouter(
  deps: AppDeps,
  pass: passport.PassportStatic,
  throttle: PasswordThrottle,
  authCache?: AuthCache,
): Router {
  const r = Router();
  const now = deps.now ?? (() => new Date());

  r.get('/csrf', (req, res) => {
    res.json({ csrfToken: csrfToken(req) });
  });

  const limiter = throttle.guard((req) => String((req.body as { email?: unknown } | undefined)?.email ?? ''));

  r.post('/login', ...limiter, async (req, res) => {
    const body = parseBody(loginBody, req.body, 'The sign-in form');
    req.body = body;
    const user = await new Promise<Express.User | false>((resolve, reject) => {
      pass.authenticate('local', { session: false }, (err: unknown, u: Express.User | false) =>
        err ? reject(err) : resolve(u),
      )(req, res, () => undefined);
    });
    if (!user) {
      await recordAudit(deps.db, {
        studioId: null,
        actor: null,
        action: 'auth.sign_in_refused',
        subjectType: 'user',
        detail: { email: body.email },
      });
      // Same answer for an unknown e-mail and a wrong password.
      throw new HttpError(401, 'Wrong e-mail or password.');
    }
    await logIn(req, user);
    await recordAudit(deps.db, {
      studioId: null,
      actor: user,
      action: 'auth.signed_in',
      subjectType: 'user',
      subjectId: user.id,
    });
    res.json(await loadMe(deps.db, user));
  });

  r.post('/logout', async (req, res) => {
    const user = req.user;
    await new Promise<void>((resolve, reject) => req.logout((e) => (e ? reject(e) : resolve())));
    if (user) {
      await recordAudit(deps.db, {
        studioId: null,
        actor: user,
        action: 'auth.signed_out',
        subjectType: 'user',
        subjectId: user.id,
      });
    }
    res.status(204).end();
  });

  r.get('/me', async (req, res) => {
    if (!req.user) throw new HttpError(401, 'Sign in first.');
    res.json(await loadMe(deps.db, req.user));
  });

  r.post('/password-reset', ...throttle.resetGuard, async (req, res) => {
    const { email } = parseBody(resetRequestBody, req.body, 'The reset form');
    // The same answer, at once, whether or not the address is known: the look-up and the mail
    // happen after the answer, so neither its time nor a mail failure tells anything.
    res.status(202).json({ sent: true });
    try {
      const [u] = await deps.db.select().from(users).where(eq(users.email, email)).limit(1);
      if (!u) return;
      const token = newToken();
      await deps.db.insert(passwordResets).values({
        userId: u.id,
        tokenHash: hashToken(token),
        expiresAt: new Date(now().getTime() + RESET_TTL_MS),
      });
      await recordAudit(deps.db, {
        studioId: null,
        actor: null,
        action: 'auth.reset_requested',
        subjectType: 'user',
        subjectId: u.id,
      });
      const link = `${publicUrl(deps.env)}/reset-password?token=${encodeURIComponent(token)}`;
      await deps.mailer.send({
        to: u.email,
        subject: 'Legwork: choose a new password',
        text: `Hello ${u.name},\n\nSomeone asked to reset your Legwork password. To choose a new one, open this link within an hour:\n\n${link}\n\nIf it was not you, ignore this message; your password stays as it is.\n`,
      });
    } catch (e) {
      deps.log(`password reset mail not sent: ${e instanceof Error ? e.message : String(e)}`);
    }
  });

  r.post('/password-reset/confirm', async (req, res) => {
    const body = parseBody(resetConfirmBody, req.body, 'The new password form');
    const hash = await hashPassword(body.password);
    const at = now();
    const done = await deps.db.transaction(async (tx) => {
      // Consumed atomically: of parallel confirms with one link, exactly one finds it unused.
      const [reset] = await tx
        .update(passwordResets)
        .set({ usedAt: at })
        .where(
          and(
            eq(passwordResets.tokenHash, hashToken(body.token)),
            isNull(passwordResets.usedAt),
            gt(passwordResets.expiresAt, at),
          ),
        )
        .returning();
      if (!reset) return null;
      await tx.update(users).set({ passwordHash: hash }).where(eq(users.id, reset.userId));
      // Every other unused link of this user stops working.
      await tx
        .update(passwordResets)
        .set({ usedAt: at })
        .where(and(eq(passwordResets.userId, reset.userId), isNull(passwordResets.usedAt)));
      // Sign the user out everywhere: a reset often follows a lost device.
      await tx.execute(sql`delete from "session" where sess->'passport'->>'user' = ${reset.userId}`);
      await recordAudit(tx, {
        studioId: null,
        actor: null,
        action: 'auth.password_reset',
        subjectType: 'user',
        subjectId: reset.userId,
      });
      return reset.userId;
    });
    if (!done) throw new HttpError(400, 'This reset link is not valid any more. Ask for a new one.');
    // This process forgets the user's sessions at once (others within AUTH_CACHE_MS).
    authCache?.forgetUser(done);
    res.status(204).end();
  });

  return r;
}
