// The Express application. createApp never listens; server/index.ts does.
import express from 'express';
import helmet from 'helmet';
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { acrossStudios } from './db/wall';
import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { ZodError } from 'zod';
import type { AppDeps } from './deps';
import { HttpError } from './lib/http-error';
import { errorForLog } from './lib/error-text';
import { clientErrorAnswer, jsonBody, refuseUnstorableText } from './lib/client-errors';
import { chooseCredentials, createPassport, requireCsrf, sessionMiddleware } from './auth/session';
import { createPasswordThrottle, trustProxySetting } from './auth/throttle';
import { AuthCache } from './auth/auth-cache';
import { healthRouter } from './routes/health';
import { authRouter } from './routes/auth';
import { invitationsRouter } from './routes/invitations';
import { studioRouter } from './routes/studio';
import { devMailboxRouter } from './routes/dev-mailbox';
import { meRouter } from './routes/me';
import { setRunStallSeconds } from './pipeline/views';

const acrossStudiosHere: RequestHandler = (_req, _res, next) => acrossStudios(next);

export interface LegworkApp {
  app: express.Express;
  /** Closes what the app opened itself (the session store). */
  close: () => void;
}

export function createApp(deps: AppDeps): LegworkApp {
  const app = express();
  app.disable('x-powered-by');
  setRunStallSeconds(deps.env.RUN_STALL_S);
  // Security headers. The built client is one module script and one stylesheet from this origin, its
  // fonts bundled, its charts drawn on canvas and SVG: nothing inline, nothing from elsewhere. React
  // and the chart library set styles through the CSSOM, which style-src does not govern. Over plain
  // HTTP (local use) the browser must not be told to upgrade requests or to insist on HTTPS.
  const https = deps.env.COOKIE_SECURE;
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          'default-src': ["'self'"],
          'script-src': ["'self'"],
          'script-src-attr': ["'none'"],
          'style-src': ["'self'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'font-src': ["'self'", 'data:'],
          'connect-src': ["'self'"],
          'object-src': ["'none'"],
          'base-uri': ["'self'"],
          'form-action': ["'self'"],
          'frame-ancestors': ["'none'"],
          ...(https ? { 'upgrade-insecure-requests': [] } : {}),
        },
      },
      strictTransportSecurity: https ? { maxAge: 15552000, includeSubDomains: false } : false,
      // A package download may redirect to the bucket's presigned URL on another origin.
      crossOriginResourcePolicy: { policy: 'same-site' },
    }),
  );
  app.set('trust proxy', trustProxySetting(deps.env.TRUST_PROXY));
  const throttle = createPasswordThrottle(deps.env);
  // Sessions and signed-in users remembered for a moment (server/auth/auth-cache.ts).
  const authCache = new AuthCache();
  const sessions = sessionMiddleware(deps, authCache);
  const pass = createPassport(deps, authCache);

  const api = express.Router();
  api.use(jsonBody('1mb'));
  api.use(refuseUnstorableText);
  api.use('/health', healthRouter(deps));
  api.use(sessions.handler);
  api.use(pass.initialize());
  api.use(pass.session());
  api.use(chooseCredentials);
  api.use(requireCsrf);
  // Signing in, accepting an invitation and a user's own pages look across studios (the user's
  // memberships, an invitation found by its token): deliberately, and only on these routes. Every
  // route under /studios/:studioId sees that one studio's rows (studioRouter); anything else sees
  // none (server/db/wall.ts).
  api.use('/auth', acrossStudiosHere, authRouter(deps, pass, throttle, authCache));
  api.use('/invitations', acrossStudiosHere, invitationsRouter(deps, throttle));
  api.use('/me', acrossStudiosHere, meRouter(deps));
  api.use('/studios/:studioId', studioRouter(deps));
  api.use('/dev/mailbox', acrossStudiosHere, devMailboxRouter(deps));
  api.use((req, _res, next) =>
    next(new HttpError(404, `No API route ${req.method} ${req.baseUrl}${req.path}.`)),
  );
  app.use('/api', api);

  const staticDir = resolve(deps.env.STATIC_DIR);
  if (existsSync(join(staticDir, 'index.html'))) {
    app.use(express.static(staticDir, { index: false, maxAge: '1h' }));
    // Every client-side route loads the same page, '/' included: under Express 5 (path-to-regexp 8)
    // '/*splat' needs at least one segment, the optional group '{/*splat}' also matches '/'.
    app.get('{/*splat}', (_req, res) => res.sendFile(join(staticDir, 'index.html')));
  }
  app.use((_req, res) => res.status(404).json({ error: 'Not found.' }));

  const onError: ErrorRequestHandler = (err, _req, res, _next) => {
    if (err instanceof HttpError) {
      res.status(err.status).json({ error: err.message, ...(err.issues ? { issues: err.issues } : {}) });
      return;
    }
    if (err instanceof ZodError) {
      const issues = err.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
      res.status(400).json({ error: 'The request is not valid.', issues });
      return;
    }
    // The router (malformed percent-encoding) and the body parser (charset, encoding, size, JSON)
    // give their errors a 4xx status: answer with it and say what was wrong.
    const answer = clientErrorAnswer(err);
    if (answer) {
      res.status(answer.status).json({ error: answer.error });
      return;
    }
    deps.log(`error: ${errorForLog(err)}`);
    res.status(500).json({ error: 'Something went wrong on the server; it has been logged.' });
  };
  app.use(onError);
  return { app, close: sessions.close };
}
