// Configuration: every address, port, bucket and secret comes from the environment with a local
// default, parsed once at start-up. A bad variable stops the process with a message naming it.
import { z } from 'zod';

const bool = z
  .enum(['true', 'false', '1', '0', 'yes', 'no'])
  .transform((v) => v === 'true' || v === '1' || v === 'yes');

export const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  /**
   * `local` only under the local orchestration (`npm start`, `npm run dev`, `npm test`, `npm run
   * services`), which sets it: local stand-ins such as the mailbox route are served only then. Any
   * other installation is `hosted`, the default, whatever NODE_ENV says.
   */
  LEGWORK_MODE: z.enum(['local', 'hosted']).default('hosted'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(1).max(65535).default(5480),
  PUBLIC_URL: z.string().url().optional(),
  DATABASE_URL: z.string().url().default('postgres://postgres@127.0.0.1:5481/legwork'),
  /** The role the app's connections act as, under the row policies; '' keeps the login role. */
  DATABASE_APP_ROLE: z
    .string()
    .regex(/^$|^[a-z_][a-z0-9_]*$/, 'a PostgreSQL role name (lower case, digits, _) or empty')
    .default('legwork_app'),
  SESSION_SECRET: z.string().min(16).default('legwork-local-session-secret-change-me'),
  COOKIE_SECURE: bool.default(false),
  S3_ENDPOINT: z.string().url().optional().default('http://127.0.0.1:5482'),
  S3_REGION: z.string().default('us-east-1'),
  S3_BUCKET: z.string().min(3).default('legwork-local'),
  S3_ACCESS_KEY_ID: z.string().default('S3RVER'),
  S3_SECRET_ACCESS_KEY: z.string().default('S3RVER'),
  S3_FORCE_PATH_STYLE: bool.default(true),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(5483),
  SMTP_SECURE: bool.default(false),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().default('Legwork <no-reply@legwork.local>'),
  /** Set only when the local SMTP capture is in use: the folder it writes messages to. */
  MAIL_CAPTURE_DIR: z.string().optional(),
  /** How often the worker looks for mail to send (s). */
  MAIL_POLL_S: z.coerce.number().min(0.5).max(300).default(5),
  /** Tries per mail before the sender gives up on it (the row stays, with its last error). */
  MAIL_MAX_ATTEMPTS: z.coerce.number().int().min(1).max(50).default(10),
  /** The wait after the first failed try (s); it doubles after each failure, up to an hour. */
  MAIL_RETRY_DELAY_S: z.coerce.number().min(1).max(3600).default(30),
  LOGIN_RATE_LIMIT: z.coerce.number().int().min(1).default(10),
  LOGIN_RATE_WINDOW_S: z.coerce.number().int().min(1).default(60),
  /** Refused password checks from one client address per window, whichever accounts. */
  LOGIN_RATE_LIMIT_PER_CLIENT: z.coerce.number().int().min(1).default(50),
  /** Refused password checks on the whole server per window. */
  LOGIN_RATE_LIMIT_GLOBAL: z.coerce.number().int().min(1).default(500),
  /**
   * Express's `trust proxy` when a reverse proxy sits in front: a hop count, `loopback`, or a list
   * of the proxies' addresses. Unset: X-Forwarded-For is ignored and the client is the socket's peer.
   */
  TRUST_PROXY: z.string().optional(),
  STATIC_DIR: z.string().default('dist'),
  /** How often an idle worker asks the queue for work (s). */
  WORKER_POLL_S: z.coerce.number().min(0.5).max(60).default(1),
  /** Retries of a cue-run job that throws (with exponential backoff from the delay). */
  CUE_RUN_RETRY_LIMIT: z.coerce.number().int().min(0).max(20).default(3),
  CUE_RUN_RETRY_DELAY_S: z.coerce.number().int().min(1).max(600).default(5),
  /** How often a worker vouches for the run it is cueing (s). */
  RUN_HEARTBEAT_S: z.coerce.number().min(0.2).max(60).default(10),
  /** A run cueing with no heartbeat for this long has lost its worker and is queued again (s). */
  RUN_STALL_S: z.coerce.number().min(1).max(3600).default(60),
  UPLOAD_MAX_BYTES: z.coerce
    .number()
    .int()
    .min(1)
    .default(200 * 1024 * 1024),
  /** Largest proxy video of a take (bytes); a proxy for watching beside the motion, not the master. */
  PROXY_VIDEO_MAX_BYTES: z.coerce
    .number()
    .int()
    .min(1)
    .default(1024 * 1024 * 1024),
});

export type Env = z.infer<typeof envSchema>;

/** Parses process.env; throws an Error listing every bad variable. */
export function parseEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const result = envSchema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Bad configuration in the environment:\n${lines.join('\n')}`);
  }
  return result.data;
}

/** The URL people use to reach the app, for links in e-mails. */
export function publicUrl(env: Env): string {
  return env.PUBLIC_URL ?? `http://${env.HOST}:${env.PORT}`;
}
