// Sessions in PostgreSQL, passport-local sign-in, and CSRF protection for cookie-authenticated writes.
import { timingSafeEqual } from 'node:crypto';
import type { RequestHandler } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { eq } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { users } from '../db/schema';
import { verifyPassword } from './passwords';
import { newToken } from '../lib/tokens';
import { HttpError } from '../lib/http-error';
import type { AuthCache } from './auth-cache';

export const SESSION_COOKIE = 'legwork.sid';

/** Session middleware with the store in the `session` table (created by the migrations). */
export function sessionMiddleware(
  deps: AppDeps,
  cache?: AuthCache,
): { handler: RequestHandler; close: () => void } {
  const PgStore = connectPgSimple(session);
  const store = new PgStore({
    pool: deps.pool,
    tableName: 'session',
    createTableIfMissing: false,
    pruneSessionInterval: 600,
  });
  throttleTouches(store);
  cache?.wrapStore(store);
  const handler = session({
    name: SESSION_COOKIE,
    secret: deps.env.SESSION_SECRET,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: deps.env.COOKIE_SECURE,
      maxAge: 12 * 60 * 60 * 1000,
    },
  });
  return { handler, close: () => store.close() };
}

/** How often one session's expiry is pushed forward in the database, at most. */
const TOUCH_EVERY_MS = 60_000;

/**
 * A rolling session is touched on every request: an UPDATE (and a commit) for each page read. Push
 * a session's stored expiry forward at most once a minute per process instead; the stored expiry
 * then trails the cookie's by less than a minute of a 12-hour idle limit.
 */
function throttleTouches(store: session.Store): void {
  if (!store.touch) return;
  const touch = store.touch.bind(store);
  const last = new Map<string, number>();
  store.touch = (sid, sess, done) => {
    const now = Date.now();
    const then = last.get(sid);
    if (then !== undefined && now - then < TOUCH_EVERY_MS) {
      done?.();
      return;
    }
    if (last.size >= 50_000) {
      for (const [k, at] of last) if (now - at >= TOUCH_EVERY_MS) last.delete(k);
    }
    last.set(sid, now);
    touch(sid, sess, done);
  };
}

/** A passport instance of our own (not the global one), so several apps can live in one test process. */
export function createPassport(deps: AppDeps, cache?: AuthCache): passport.PassportStatic {
  const p = new passport.Passport() as unknown as passport.PassportStatic;
  p.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      (async () => {
        const normal = email.trim().toLowerCase();
        const [u] = await deps.db.select().from(users).where(eq(users.email, normal)).limit(1);
        const ok = await verifyPassword(u?.passwordHash, password);
        if (!u || !ok) return done(null, false);
        return done(null, { id: u.id, email: u.email, name: u.name });
      })().catch(done);
    }),
  );
  p.serializeUser((user, done) => done(null, user.id));
  p.deserializeUser((id: string, done) => {
    const load = async () =>
      (
        await deps.db
          .select({ id: users.id, email: users.email, name: users.name })
          .from(users)
          .where(eq(users.id, id))
          .limit(1)
      )[0];
    (cache ? cache.user(id, load) : load()).then((u) => done(null, u ?? false)).catch(done);
  });
  return p;
}

/** The session's CSRF token, made on first request. */
export function csrfToken(req: Parameters<RequestHandler>[0]): string {
  req.session.csrfToken ??= newToken(24);
  return req.session.csrfToken;
}

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * The API token of an `Authorization: Bearer <token>` header: null when there is no such header,
 * 'malformed' when the header names the Bearer scheme (any case) without exactly one token after it.
 */
export function bearerToken(header: string | undefined): string | null | 'malformed' {
  if (header === undefined) return null;
  if (!/^bearer(\s|$)/i.test(header)) return null;
  const m = /^Bearer +([A-Za-z0-9._~+/=-]+)$/.exec(header);
  return m ? m[1]! : 'malformed';
}

/**
 * Chooses how the request is authenticated, once: a well-formed bearer token is the API token path
 * and the session cookie is then ignored for the whole request (never a fallback); a malformed
 * Bearer header is refused (401) rather than read as a cookie request.
 */
export const chooseCredentials: RequestHandler = (req, _res, next) => {
  const token = bearerToken(req.headers.authorization);
  if (token === 'malformed')
    return next(new HttpError(401, 'The Authorization header is not "Bearer <token>" with one API token.'));
  if (token !== null) req.user = undefined;
  next();
};

/**
 * Synchronizer-token CSRF check: every unsafe request that rides on the session cookie must carry
 * the session's token in `x-csrf-token`. Requests with a well-formed bearer API token use no cookie
 * (chooseCredentials drops the session's user) and skip it.
 */
export const requireCsrf: RequestHandler = (req, _res, next) => {
  if (SAFE.has(req.method)) return next();
  const token = bearerToken(req.headers.authorization);
  if (token !== null && token !== 'malformed') return next();
  const sent = req.get('x-csrf-token') ?? '';
  const expected = req.session?.csrfToken ?? '';
  const a = Buffer.from(sent);
  const b = Buffer.from(expected);
  if (!expected || a.length !== b.length || !timingSafeEqual(a, b)) {
    return next(
      new HttpError(403, 'Missing or wrong CSRF token: fetch /api/auth/csrf and send it as x-csrf-token.'),
    );
  }
  next();
};

/** 401 unless signed in. */
export const requireUser: RequestHandler = (req, _res, next) => {
  if (!req.user) return next(new HttpError(401, 'Sign in first.'));
  next();
};
