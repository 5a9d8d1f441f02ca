// A private PostgreSQL cluster from Debian's packages, in a project folder, on 127.0.0.1 and a
// non-default port. initdb refuses to run as root, so as root every step runs as `postgres`.
import { execFileSync, spawnSync } from 'node:child_process';
import {
  existsSync,
  mkdirSync,
  readdirSync,
  writeFileSync,
  appendFileSync,
  chmodSync,
  statSync,
} from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import pg from 'pg';

const isRoot = process.getuid?.() === 0;

function findBinDir(): string | null {
  try {
    const dir = execFileSync('pg_config', ['--bindir'], { encoding: 'utf8' }).trim();
    if (existsSync(join(dir, 'initdb'))) return dir;
  } catch {
    // pg_config is only in libpq-dev; fall through to Debian's layout.
  }
  const base = '/usr/lib/postgresql';
  if (!existsSync(base)) return null;
  const versions = readdirSync(base)
    .filter((v) => existsSync(join(base, v, 'bin', 'initdb')))
    .sort((a, b) => Number(b) - Number(a));
  return versions[0] ? join(base, versions[0], 'bin') : null;
}

/** Finds the server binaries, installing Debian's postgresql package when root and missing. */
export function ensurePostgresInstalled(log: (s: string) => void): string {
  let bin = findBinDir();
  if (bin) return bin;
  if (!isRoot) {
    throw new Error(
      "PostgreSQL server binaries were not found. Install Debian's package with:\n  sudo apt-get install -y postgresql\nthen run the command again.",
    );
  }
  log('installing PostgreSQL from Debian packages (apt-get install postgresql) ...');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  for (const args of [['update'], ['install', '-y', '--no-install-recommends', 'postgresql']]) {
    const r = spawnSync('apt-get', args, { stdio: 'inherit', env });
    if (r.status !== 0) throw new Error(`apt-get ${args.join(' ')} failed (exit ${r.status}).`);
  }
  bin = findBinDir();
  if (!bin) throw new Error('PostgreSQL was installed but initdb was not found under /usr/lib/postgresql.');
  return bin;
}

function asPostgres(cmd: string, args: string[]): [string, string[]] {
  return isRoot ? ['runuser', ['-u', 'postgres', '--', cmd, ...args]] : [cmd, args];
}

function run(cmd: string, args: string[]): void {
  const [c, a] = asPostgres(cmd, args);
  const r = spawnSync(c, a, { cwd: '/', encoding: 'utf8' });
  if (r.status !== 0) {
    throw new Error(`${cmd} ${args.join(' ')} failed:\n${r.stdout ?? ''}${r.stderr ?? ''}`);
  }
}

/** As root, the postgres user must be able to reach the data folder: add search (x) rights where missing. */
function ensureTraversable(dir: string, log: (s: string) => void): void {
  if (!isRoot) return;
  let d = resolve(dir);
  const changed: string[] = [];
  while (d !== '/') {
    d = dirname(d);
    const mode = statSync(d).mode;
    if ((mode & 0o001) === 0) {
      chmodSync(d, mode | 0o001);
      changed.push(d);
    }
  }
  if (changed.length) log(`let the postgres user traverse: ${changed.join(', ')}`);
}

export interface PostgresHandle {
  port: number;
  adminUrl: (database?: string) => string;
  stop: () => void;
  /** `bin|dataDir`: what restartPostgres needs (the fault drills restart the test cluster). */
  control: string;
}

/**
 * Restarts the cluster named by a handle's `control` (fast shutdown, then start with the same
 * options, waiting for both): what a database restart under a running server looks like.
 */
export function restartPostgres(control: string): void {
  const [bin, dataDir] = control.split('|') as [string, string];
  // The new postmaster logs to the cluster's file, and holds no pipe of ours (a sync spawn would wait
  // for it to close).
  const [c, a] = asPostgres(join(bin, 'pg_ctl'), [
    '-D',
    dataDir,
    '-l',
    join(dirname(dataDir), 'postgres.log'),
    '-m',
    'fast',
    '-w',
    '-t',
    '60',
    'restart',
  ]);
  const r = spawnSync(c, a, { cwd: '/', stdio: 'ignore' });
  if (r.status !== 0) throw new Error(`pg_ctl restart failed (exit ${r.status})`);
}

export interface PostgresOptions {
  home: string;
  port: number;
  throwaway?: boolean;
  log: (s: string) => void;
}

/** Creates the cluster on first use, starts it, and returns how to reach it. */
export function startPostgres(opts: PostgresOptions): PostgresHandle {
  const bin = ensurePostgresInstalled(opts.log);
  const dataDir = join(opts.home, 'pgdata');
  const runDir = join(opts.home, 'pgrun');
  const logFile = join(opts.home, 'postgres.log');
  mkdirSync(opts.home, { recursive: true });
  mkdirSync(runDir, { recursive: true });
  ensureTraversable(runDir, opts.log);
  if (isRoot) execFileSync('chown', ['postgres:postgres', opts.home, runDir]);
  if (!existsSync(join(dataDir, 'PG_VERSION'))) {
    opts.log(`creating a PostgreSQL cluster in ${dataDir}`);
    mkdirSync(dataDir, { recursive: true, mode: 0o700 });
    if (isRoot) execFileSync('chown', ['postgres:postgres', dataDir]);
    run(join(bin, 'initdb'), [
      '-D',
      dataDir,
      '-U',
      'postgres',
      '--auth=trust',
      '-E',
      'UTF8',
      '--locale=C.UTF-8',
    ]);
    const conf = [
      '',
      '# Legwork: a private cluster on loopback only.',
      "listen_addresses = '127.0.0.1'",
      `unix_socket_directories = '${runDir}'`,
      'max_connections = 200',
      ...(opts.throwaway ? ['fsync = off', 'synchronous_commit = off', 'full_page_writes = off'] : []),
      '',
    ].join('\n');
    appendFileSync(join(dataDir, 'postgresql.conf'), conf);
  }
  if (isRoot && !existsSync(logFile)) {
    writeFileSync(logFile, '');
    execFileSync('chown', ['postgres:postgres', logFile]);
  }
  // A cluster left running by an earlier run that was killed is stopped and started again, so the
  // port given now applies.
  const [sc, sa] = asPostgres(join(bin, 'pg_ctl'), ['-D', dataDir, 'status']);
  if (spawnSync(sc, sa, { cwd: '/' }).status === 0) {
    opts.log('a PostgreSQL left running in this folder is restarted');
    run(join(bin, 'pg_ctl'), ['-D', dataDir, '-m', 'fast', '-w', 'stop']);
  }
  // The port is given at start so a cluster can be reused on another port.
  run(join(bin, 'pg_ctl'), [
    '-D',
    dataDir,
    '-l',
    logFile,
    '-o',
    `-p ${opts.port}`,
    '-w',
    '-t',
    '60',
    'start',
  ]);
  let stopped = false;
  return {
    port: opts.port,
    control: `${bin}|${dataDir}`,
    adminUrl: (database = 'postgres') => `postgres://postgres@127.0.0.1:${opts.port}/${database}`,
    stop: () => {
      if (stopped) return;
      stopped = true;
      try {
        run(join(bin, 'pg_ctl'), ['-D', dataDir, '-m', 'fast', '-w', 'stop']);
      } catch (e) {
        opts.log(`stopping PostgreSQL: ${(e as Error).message}`);
      }
    },
  };
}

/** Creates `database` on the cluster when it does not exist yet. */
export async function ensureDatabase(adminUrl: string, database: string): Promise<void> {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    const r = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [database]);
    if (r.rowCount === 0) await client.query(`CREATE DATABASE "${database.replace(/"/g, '')}"`);
  } finally {
    await client.end();
  }
}
