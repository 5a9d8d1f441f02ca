// Real worker processes (worker/index.ts, as `npm start` and `npm run worker` run them) for the drill
// tests, and the polling wait they share.
import { spawn } from 'node:child_process';
import type { ChildProcess } from 'node:child_process';
import { join, resolve } from 'node:path';

const root = resolve(import.meta.dirname, '..', '..', '..');

/**
 * Starts a worker on `databaseUrl` with `env` on top of this process's; `onLine` receives its stdout
 * line by line. It runs in a process group of its own (tsx runs the worker in a child process), so
 * killHard stops both.
 */
export function startWorkerProcess(
  databaseUrl: string,
  env: Record<string, string> = {},
  onLine?: (line: string) => void,
): ChildProcess {
  const child = spawn(join(root, 'node_modules/.bin/tsx'), ['worker/index.ts'], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: databaseUrl, WORKER_POLL_S: '0.5', ...env },
    stdio: ['ignore', onLine ? 'pipe' : 'ignore', 'inherit'],
    detached: true,
  });
  if (onLine && child.stdout) {
    let rest = '';
    child.stdout.setEncoding('utf8').on('data', (chunk: string) => {
      const lines = (rest + chunk).split('\n');
      rest = lines.pop() ?? '';
      for (const l of lines) onLine(l);
    });
  }
  return child;
}

/** SIGKILL to a worker's whole process group (tsx and the node process it runs). */
export function killHard(child: ChildProcess): void {
  try {
    process.kill(-child.pid!, 'SIGKILL');
  } catch {
    // already gone
  }
}

/** Polls `probe` (a failed probe counts as not yet) until it gives a value, or fails naming `what`. */
export async function until<T>(
  what: string,
  probe: () => Promise<T | undefined>,
  timeout_ms: number,
): Promise<T> {
  const end = Date.now() + timeout_ms;
  for (;;) {
    const v = await probe().catch(() => undefined);
    if (v !== undefined) return v;
    if (Date.now() > end) throw new Error(`${what}: not within ${timeout_ms} ms`);
    await new Promise((r) => setTimeout(r, 50));
  }
}
