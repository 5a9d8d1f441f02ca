// Runs Legwork with its local stand-ins: `start` (all services, migrate, seed, serve), `dev` (the
// same with Vite's hot reload) and `test` (the same services in a throwaway folder, then every
// check). Every port and folder can be moved with LEGWORK_* variables.
import { spawn, spawnSync } from 'node:child_process';
import type { ChildProcess } from 'node:child_process';
import {
  existsSync,
  mkdtempSync,
  readFileSync,
  readdirSync,
  rmSync,
  statSync,
  writeFileSync,
  mkdirSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { randomBytes } from 'node:crypto';
import { ensureDatabase, startPostgres } from './postgres';
import type { PostgresHandle } from './postgres';
import { startS3Fake } from './s3-fake';
import { startSmtpCapture } from './smtp-capture';
import { migrateDb } from '../db/migrate';
import { seedDemoIfEmpty } from '../db/seed';
import { createStorage } from '../storage';
import { startQueue } from '../queue';
import { parseEnv } from '../env';
import { DEMO_PASSWORD, DEMO_USERS } from '../../shared/demo';
import { ROLE_LABELS } from '../../shared/schemas/roles';
import { z } from 'zod';

type Mode = 'start' | 'dev' | 'test' | 'services';
const mode = (process.argv[2] ?? 'start') as Mode;
if (!['start', 'dev', 'test', 'services'].includes(mode)) {
  console.error(`legwork: unknown mode "${mode}" (start, dev, test or services)`);
  process.exit(2);
}

const root = resolve(import.meta.dirname, '..', '..');
const log = (s: string) => console.log(`legwork: ${s}`);
const bin = (name: string) => join(root, 'node_modules', '.bin', name);

// The local stand-ins' own settings, parsed like the server's: a bad value stops with its name.
const port = z.coerce.number().int().min(1024).max(65_000).optional();
const localEnvSchema = z.object({
  LEGWORK_PORT_BASE: port,
  LEGWORK_APP_PORT: port,
  LEGWORK_PG_PORT: port,
  LEGWORK_S3_PORT: port,
  LEGWORK_SMTP_PORT: port,
  LEGWORK_VITE_PORT: port,
  LEGWORK_HOME: z.string().min(1).optional(),
  LEGWORK_TEST_TMP: z.string().min(1).optional(),
});
const parsedLocal = localEnvSchema.safeParse(process.env);
if (!parsedLocal.success) {
  const lines = parsedLocal.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
  console.error(`legwork: bad settings in the environment:\n${lines.join('\n')}`);
  process.exit(2);
}
const localEnv = parsedLocal.data;
const basePort = localEnv.LEGWORK_PORT_BASE ?? (mode === 'test' || mode === 'services' ? 5580 : 5480);
const ports = {
  app: localEnv.LEGWORK_APP_PORT ?? basePort,
  pg: localEnv.LEGWORK_PG_PORT ?? basePort + 1,
  s3: localEnv.LEGWORK_S3_PORT ?? basePort + 2,
  smtp: localEnv.LEGWORK_SMTP_PORT ?? basePort + 3,
  vite: localEnv.LEGWORK_VITE_PORT ?? basePort - 1,
};
const throwaway = mode === 'test' || mode === 'services';
const home = throwaway
  ? mkdtempSync(join(localEnv.LEGWORK_TEST_TMP ?? tmpdir(), 'legwork-test-'))
  : resolve(localEnv.LEGWORK_HOME ?? join(root, '.legwork'));
mkdirSync(home, { recursive: true });

const children: ChildProcess[] = [];
const cleanups: (() => Promise<void> | void)[] = [];
let shuttingDown = false;

async function shutdown(code: number): Promise<never> {
  if (shuttingDown) return new Promise<never>(() => undefined);
  shuttingDown = true;
  log('stopping ...');
  for (const c of children) if (c.exitCode === null) c.kill('SIGTERM');
  await Promise.all(
    children.map(
      (c) =>
        new Promise<void>((res) => {
          if (c.exitCode !== null || c.signalCode !== null) return res();
          const t = setTimeout(() => {
            c.kill('SIGKILL');
            res();
          }, 10_000);
          c.once('exit', () => {
            clearTimeout(t);
            res();
          });
        }),
    ),
  );
  for (const f of cleanups.reverse()) {
    try {
      await f();
    } catch (e) {
      log(`while stopping: ${(e as Error).message}`);
    }
  }
  if (throwaway && !process.env.LEGWORK_KEEP_TEST_DATA) rmSync(home, { recursive: true, force: true });
  process.exit(code);
}
process.on('SIGINT', () => void shutdown(mode === 'test' ? 130 : 0));
process.on('SIGTERM', () => void shutdown(mode === 'test' ? 143 : 0));

/** The secret for session cookies: from the environment, else made once and kept in the data folder. */
function sessionSecret(): string {
  if (process.env.SESSION_SECRET) return process.env.SESSION_SECRET;
  const f = join(home, 'session-secret');
  if (!existsSync(f)) writeFileSync(f, randomBytes(32).toString('hex'), { mode: 0o600 });
  return readFileSync(f, 'utf8').trim();
}

function newestMtime(dir: string): number {
  let newest = 0;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    newest = Math.max(newest, e.isDirectory() ? newestMtime(p) : statSync(p).mtimeMs);
  }
  return newest;
}

/** Builds the client when dist/ is missing or older than its sources. */
function ensureClientBuilt(force = false): void {
  const index = join(root, 'dist', 'index.html');
  const sources = Math.max(
    newestMtime(join(root, 'src')),
    newestMtime(join(root, 'shared')),
    statSync(join(root, 'index.html')).mtimeMs,
  );
  if (!force && existsSync(index) && statSync(index).mtimeMs >= sources) return;
  log('building the client (vite build) ...');
  const r = spawnSync(bin('vite'), ['build', '--logLevel', 'warn'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) throw new Error('vite build failed; see the output above.');
}

interface Services {
  pg: PostgresHandle;
  env: Record<string, string>;
}

async function startServices(database: string): Promise<Services> {
  const pg = startPostgres({ home: join(home, 'postgres'), port: ports.pg, throwaway, log });
  cleanups.push(() => pg.stop());
  await ensureDatabase(pg.adminUrl(), database);
  const bucket = process.env.S3_BUCKET ?? 'legwork-local';
  const s3 = await startS3Fake({ dir: join(home, 's3'), port: ports.s3, bucket });
  cleanups.push(() => s3.stop());
  const mailDir = join(home, 'mail');
  const smtp = await startSmtpCapture({ dir: mailDir, port: ports.smtp });
  cleanups.push(() => smtp.stop());
  const env: Record<string, string> = {
    DATABASE_URL: pg.adminUrl(database),
    S3_ENDPOINT: s3.endpoint,
    S3_BUCKET: bucket,
    S3_ACCESS_KEY_ID: 'S3RVER',
    S3_SECRET_ACCESS_KEY: 'S3RVER',
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(ports.smtp),
    MAIL_CAPTURE_DIR: mailDir,
    // The local stand-ins (the mailbox route) are served only when this says so explicitly.
    LEGWORK_MODE: 'local',
    SESSION_SECRET: sessionSecret(),
    HOST: '127.0.0.1',
    PORT: String(ports.app),
  };
  log(
    `PostgreSQL on 127.0.0.1:${ports.pg}, S3 fake on 127.0.0.1:${ports.s3}, SMTP capture on 127.0.0.1:${ports.smtp}`,
  );
  return { pg, env };
}

/** Restart delays for a crashed child under `start` and `dev`: doubling from 1 s up to 30 s. */
const RESTART_FIRST_MS = 1000;
const RESTART_MAX_MS = 30_000;
/** A child that ran this long before it stopped counts as healthy again: its next delay starts over. */
const RESTART_HEALTHY_MS = 60_000;

/**
 * Starts a child process. Under `start` and `dev` a child that stops on its own (a crash, a lost
 * database at start-up) is started again after a growing delay, so one fault does not take the whole
 * app down; under `test` it stops everything at once, so a broken server fails the run quickly.
 */
function launch(name: string, cmd: string, args: string[], env: Record<string, string>): void {
  const restart = mode === 'start' || mode === 'dev';
  let delay = RESTART_FIRST_MS;
  const spawnOnce = () => {
    const started = Date.now();
    const child = spawn(cmd, args, { cwd: root, stdio: 'inherit', env: { ...process.env, ...env } });
    children.push(child);
    child.on('exit', (code, signal) => {
      children.splice(children.indexOf(child), 1);
      if (shuttingDown) return;
      const how = signal ?? `exit ${code}`;
      if (!restart) {
        log(`${name} stopped (${how}); stopping everything`);
        void shutdown(code || 1);
        return;
      }
      if (Date.now() - started >= RESTART_HEALTHY_MS) delay = RESTART_FIRST_MS;
      log(`${name} stopped (${how}); starting it again in ${(delay / 1000).toFixed(0)} s`);
      setTimeout(() => {
        if (!shuttingDown) spawnOnce();
      }, delay);
      delay = Math.min(delay * 2, RESTART_MAX_MS);
    });
  };
  spawnOnce();
}

async function waitForHealth(url: string, timeout_ms = 60_000): Promise<void> {
  const until = Date.now() + timeout_ms;
  let last = '';
  while (Date.now() < until) {
    try {
      const r = await fetch(`${url}/api/health`);
      if (r.ok) return;
      last = await r.text();
    } catch (e) {
      last = (e as Error).message;
    }
    await new Promise((res) => setTimeout(res, 250));
  }
  throw new Error(`the server did not become healthy at ${url}: ${last}`);
}

async function prepareDatabase(env: Record<string, string>): Promise<void> {
  const url = env.DATABASE_URL!;
  await migrateDb(url);
  const storage = createStorage(parseEnv({ ...process.env, ...env }));
  const boss = await startQueue(url);
  try {
    const seeded = await seedDemoIfEmpty(url, { storage, boss });
    if (seeded) log('seeded the demo studio and queued its demo track for both venues');
  } finally {
    await boss.stop({ graceful: false, wait: true });
    storage.close();
  }
}

function printWelcome(url: string): void {
  const lines = [
    '',
    `Legwork is running at ${url}`,
    '',
    `Demo sign-ins (password for all: ${DEMO_PASSWORD}):`,
    ...DEMO_USERS.map((u) => `  ${u.email.padEnd(38)} ${u.roles.map((r) => ROLE_LABELS[r]).join(', ')}`),
    '',
    `Mail sent by the app lands in the local mailbox: ${url}/mailbox`,
    "Motion can injure riders and staff: Legwork supports, and never replaces, the ride manufacturer's",
    "engineering, the applicable codes and a qualified person's sign-off.",
    'Press Ctrl-C to stop everything.',
    '',
  ];
  console.log(lines.join('\n'));
}

/** Runs one check as a child process. Asynchronous on purpose: the S3 fake and the SMTP capture live in
 * this process, and a blocking spawnSync would leave them deaf while the tests talk to them. */
async function step(
  name: string,
  cmd: string,
  args: string[],
  env: Record<string, string> = {},
): Promise<boolean> {
  log(`── ${name}`);
  const t0 = Date.now();
  const child = spawn(cmd, args, { cwd: root, stdio: 'inherit', env: { ...process.env, ...env } });
  children.push(child);
  const [code, signal] = await new Promise<[number | null, NodeJS.Signals | null]>((res) =>
    child.once('exit', (c, s) => res([c, s])),
  );
  children.splice(children.indexOf(child), 1);
  const ok = code === 0;
  log(
    `── ${name}: ${ok ? 'passed' : `FAILED (exit ${code ?? signal})`} in ${((Date.now() - t0) / 1000).toFixed(1)} s`,
  );
  return ok;
}

function ensureChromium(): string {
  const candidates = [process.env.CHROMIUM_PATH, '/usr/lib/chromium/chromium', '/usr/bin/chromium'].filter(
    Boolean,
  ) as string[];
  const found = candidates.find((p) => existsSync(p));
  if (found) return found;
  if (process.getuid?.() !== 0) {
    throw new Error(
      "Chromium for the browser tests is missing. Install Debian's package: sudo apt-get install -y chromium",
    );
  }
  log('installing Chromium from Debian packages for the browser tests ...');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  for (const args of [['update'], ['install', '-y', '--no-install-recommends', 'chromium']]) {
    const r = spawnSync('apt-get', args, { stdio: 'inherit', env });
    if (r.status !== 0) throw new Error(`apt-get ${args.join(' ')} failed`);
  }
  return '/usr/lib/chromium/chromium';
}

async function main(): Promise<void> {
  if (mode === 'start' || mode === 'dev') {
    const { env } = await startServices('legwork');
    await prepareDatabase(env);
    const url = `http://127.0.0.1:${mode === 'dev' ? ports.vite : ports.app}`;
    env.PUBLIC_URL = url;
    if (mode === 'start') {
      ensureClientBuilt();
      launch('server', bin('tsx'), ['server/index.ts'], {
        ...env,
        NODE_ENV: 'production',
        STATIC_DIR: join(root, 'dist'),
      });
    } else {
      launch('server', bin('tsx'), ['watch', '--clear-screen=false', 'server/index.ts'], {
        ...env,
        STATIC_DIR: join(home, 'no-static'),
      });
      launch('vite', bin('vite'), ['--port', String(ports.vite), '--strictPort'], {
        PORT: String(ports.app),
      });
    }
    launch('worker', bin('tsx'), ['worker/index.ts'], env);
    await waitForHealth(`http://127.0.0.1:${ports.app}`);
    printWelcome(url);
    return;
  }

  if (mode === 'services') {
    // Only the services, for running single test files by hand: `source <printed file>`, then vitest.
    const { pg, env } = await startServices('legwork_browser');
    const vars = {
      ...env,
      LEGWORK_TEST_PG_ADMIN_URL: pg.adminUrl(),
      LEGWORK_TEST_PG_CONTROL: pg.control,
      NODE_ENV: 'test',
    };
    const file = join(home, 'env.sh');
    writeFileSync(
      file,
      Object.entries(vars)
        .map(([k, v]) => `export ${k}='${v}'`)
        .join('\n') + '\n',
    );
    log(`services are up; their variables are in ${file}. Ctrl-C stops them.`);
    return;
  }

  // test
  const results: [string, boolean][] = [];
  const record = (name: string, ok: boolean) => results.push([name, ok]);
  const { pg, env } = await startServices('legwork_browser');
  const testEnv = {
    ...env,
    LEGWORK_TEST_PG_ADMIN_URL: pg.adminUrl(),
    LEGWORK_TEST_PG_CONTROL: pg.control,
    LEGWORK_SMOKE_PORT_BASE: String(basePort + 100),
    NODE_ENV: 'test',
  };
  record('typecheck', await step('typecheck', bin('tsc'), ['-p', 'tsconfig.json', '--noEmit']));
  record(
    'lint',
    (await step('lint (eslint)', bin('eslint'), ['.', '--max-warnings', '0'])) &&
      (await step('lint (prettier)', bin('prettier'), ['--check', '.', '--log-level', 'warn'])),
  );
  let built = true;
  try {
    ensureClientBuilt(true);
  } catch {
    built = false;
  }
  record('build', built);
  record(
    'unit and integration tests',
    await step(
      'unit and integration tests',
      bin('vitest'),
      ['run', '--project', 'unit', '--project', 'integration'],
      testEnv,
    ),
  );
  if (built) {
    let browserOk = false;
    try {
      const chromium = ensureChromium();
      await prepareDatabase(env);
      const url = `http://127.0.0.1:${ports.app}`;
      launch('server', bin('tsx'), ['server/index.ts'], {
        ...env,
        PUBLIC_URL: url,
        STATIC_DIR: join(root, 'dist'),
        LOGIN_RATE_LIMIT: '1000',
      });
      launch('worker', bin('tsx'), ['worker/index.ts'], env);
      await waitForHealth(url);
      browserOk = await step('browser tests', bin('vitest'), ['run', '--project', 'browser'], {
        ...testEnv,
        LEGWORK_BASE_URL: url,
        CHROMIUM_PATH: chromium,
      });
    } catch (e) {
      log(`browser tests could not run: ${(e as Error).message}`);
    }
    record('browser tests', browserOk);
  } else {
    record('browser tests (not run: the build failed)', false);
  }
  const failed = results.filter(([, ok]) => !ok);
  log('summary:');
  for (const [name, ok] of results) log(`  ${ok ? 'passed' : 'FAILED'}  ${name}`);
  await shutdown(failed.length ? 1 : 0);
}

main().catch((e: Error) => {
  console.error(`legwork: ${e.message}`);
  void shutdown(1);
});
