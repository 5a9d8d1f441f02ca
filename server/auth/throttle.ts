// Throttling of every request that checks a password (sign-in, accepting an invitation as an
// existing user). Three limits apply together, and only refused attempts count:
// - per account: the address as the server compares it (trimmed, lower case), from any client, so
//   spaces or capitals before the address never give fresh guesses;
// - per client: the client address (req.ip), whichever accounts it tries;
// - overall: one ceiling for the whole server, which bounds guessing spread over many clients.
// The counters are express-rate-limit's in-memory store: one server process serves the API (the
// worker never checks passwords), so the counts hold for the whole installation. Running several
// API processes would need a shared store (express-rate-limit's store option) to keep the limits.
import type { Request, RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { Env } from '../env';

/** The sign-in address as the server compares it. */
export const normaliseAddress = (v: unknown): string => (typeof v === 'string' ? v.trim().toLowerCase() : '');

export interface PasswordThrottle {
  /** Middleware chain for password reset requests (the address in the body's `email`). */
  resetGuard: RequestHandler[];
  /** Middleware chain for a route whose account address is found by `address(req)`. */
  guard: (address: (req: Request) => Promise<string> | string) => RequestHandler[];
}

/** Builds the three shared limiters once per app; every password route uses the same counters. */
export function createPasswordThrottle(env: Env): PasswordThrottle {
  const windowMs = env.LOGIN_RATE_WINDOW_S * 1000;
  const refuse =
    (what: string): RequestHandler =>
    (_req, res) => {
      res.status(429).json({ error: `Too many ${what}. Wait a minute and try again.` });
    };
  const common = {
    windowMs,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8' as const,
    legacyHeaders: false,
  };
  const perClient = rateLimit({
    ...common,
    limit: env.LOGIN_RATE_LIMIT_PER_CLIENT,
    keyGenerator: (req) => `client|${ipKeyGenerator(req.ip ?? '')}`,
    handler: refuse('refused sign-in attempts from this address'),
  });
  const overall = rateLimit({
    ...common,
    limit: env.LOGIN_RATE_LIMIT_GLOBAL,
    keyGenerator: () => 'overall',
    handler: refuse('refused sign-in attempts on this server'),
  });
  // One store for the per-account counts, whichever route checks the password.
  const accountKeys = new WeakMap<Request, string>();
  const perAccount = rateLimit({
    ...common,
    limit: env.LOGIN_RATE_LIMIT,
    keyGenerator: (req) => `account|${accountKeys.get(req) ?? ''}`,
    handler: refuse('refused sign-in attempts for this account'),
  });
  // Reset requests: every request counts (each may send a mail), per address and per client.
  const resetKeys = new WeakMap<Request, string>();
  const resetPerAccount = rateLimit({
    ...common,
    skipSuccessfulRequests: false,
    limit: env.LOGIN_RATE_LIMIT,
    keyGenerator: (req) => `reset|${resetKeys.get(req) ?? ''}`,
    handler: refuse('password reset requests for this address'),
  });
  const resetPerClient = rateLimit({
    ...common,
    skipSuccessfulRequests: false,
    limit: env.LOGIN_RATE_LIMIT_PER_CLIENT,
    keyGenerator: (req) => `reset-client|${ipKeyGenerator(req.ip ?? '')}`,
    handler: refuse('password reset requests from this address'),
  });
  return {
    resetGuard: [
      (req, _res, next) => {
        resetKeys.set(req, normaliseAddress((req.body as { email?: unknown } | undefined)?.email));
        next();
      },
      resetPerClient,
      resetPerAccount,
    ],
    guard: (address) => [
      async (req, _res, next) => {
        try {
          accountKeys.set(req, normaliseAddress(await address(req)));
          next();
        } catch (e) {
          next(e);
        }
      },
      overall,
      perClient,
      perAccount,
    ],
  };
}

/** The `trust proxy` setting from TRUST_PROXY: off unless configured. */
export function trustProxySetting(v: string | undefined): boolean | number | string {
  if (v === undefined || v === '' || v === 'false') return false;
  if (/^\d+$/.test(v)) return Number(v);
  return v;
}
