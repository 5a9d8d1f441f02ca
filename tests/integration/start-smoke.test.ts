// Runs the real `npm start` entry point with a throwaway data folder and its own ports, signs in
// through it, and stops it: a broken start command turns the test run red.
import { afterAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import type { ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { DEMO_PASSWORD } from '../../shared/demo';

const root = resolve(import.meta.dirname, '..', '..');
const base = Number(process.env.LEGWORK_SMOKE_PORT_BASE ?? 5680);
const url = `http://127.0.0.1:${base}`;
const home = mkdtempSync(join(tmpdir(), 'legwork-smoke-'));
let child: ChildProcess | null = null;
let output = '';

afterAll(async () => {
  if (child && child.exitCode === null) {
    child.kill('SIGTERM');
    await new Promise((r) => child!.once('exit', r));
  }
  rmSync(home, { recursive: true, force: true });
});

async function waitFor(pred: () => Promise<boolean>, what: string, timeout_ms: number): Promise<void> {
  const until = Date.now() + timeout_ms;
  while (Date.now() < until) {
    if (await pred().catch(() => false)) return;
    if (child?.exitCode !== null) throw new Error(`npm start exited early (${child?.exitCode}):\n${output}`);
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`timed out waiting for ${what}:\n${output}`);
}

describe('npm start', () => {
  it('starts every service, serves the sign-in page, signs in, and stops on request', async () => {
    child = spawn('node', [join(root, 'server/local/bootstrap.mjs'), 'start'], {
      cwd: root,
      env: {
        ...process.env,
        LEGWORK_HOME: home,
        LEGWORK_PORT_BASE: String(base),
        SESSION_SECRET: '',
        DATABASE_URL: '',
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    child.stdout!.on('data', (d: Buffer) => (output += d.toString()));
    child.stderr!.on('data', (d: Buffer) => (output += d.toString()));
    await waitFor(
      async () => (await fetch(`${url}/api/health`, { signal: AbortSignal.timeout(5000) })).ok,
      '/api/health',
      150_000,
    );
    await waitFor(async () => output.includes('Demo sign-ins'), 'the welcome text', 10_000);
    expect(output).toContain(`Legwork is running at ${url}`);

    // The address a new user is told to open, read from the output itself, then a reload of it, a
    // deep link into a studio and the sign-in page: each answers the app's HTML.
    const printed = /Legwork is running at (\S+)/.exec(output)?.[1];
    expect(printed, output).toBeDefined();
    const studioId = '00000000-0000-4000-8000-000000000000';
    for (const address of [
      printed!,
      printed!,
      `${url}/s/${studioId}/tracks?state=failed`,
      `${url}/sign-in`,
    ]) {
      const page = await fetch(address);
      expect(page.status, address).toBe(200);
      expect(page.headers.get('content-type'), address).toMatch(/^text\/html/);
      expect(await page.text(), address).toMatch(/<div id="root">/);
    }
    // An unknown API path is still a JSON 404, not the app's page.
    const missing = await fetch(`${url}/api/no-such-route`);
    expect(missing.status).toBe(404);
    expect(((await missing.json()) as { error: string }).error).toMatch(/No API route/);

    const csrf = await fetch(`${url}/api/auth/csrf`);
    const cookie = csrf.headers.get('set-cookie')!.split(';')[0]!;
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    const login = await fetch(`${url}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', cookie, 'x-csrf-token': csrfToken },
      body: JSON.stringify({ email: 'pia.producer@lanternfish.example', password: DEMO_PASSWORD }),
    });
    expect(login.status).toBe(200);

    child.kill('SIGINT');
    const code = await new Promise<number | null>((r) => child!.once('exit', (c) => r(c)));
    expect(code).toBe(0);
    await expect(fetch(`${url}/api/health`)).rejects.toThrow();
  }, 200_000);
});
