// End to end through the real services: a 600,000-sample (10 min at 1 kHz) vehicle take uploaded over
// HTTP to the server, streamed to the S3 fake, cued for one venue by a separate worker process, until
// the run is finished. Starts its own throwaway services (as `npm run services` does) and stops them.
import { spawn } from 'node:child_process';
import type { ChildProcess } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { join, resolve } from 'node:path';
import type { BenchSection } from '../bench';
import { makeVehicleCsv } from '../../factories/takes';
import { DEMO_PASSWORD } from '../../../shared/demo';

const root = resolve(import.meta.dirname, '..', '..', '..');

/** Throwaway services (`npm run services`) on ports from `portBase`; resolves with their variables. */
export function startBenchServices(
  portBase = '5880',
): Promise<{ child: ChildProcess; env: Record<string, string> }> {
  const child = spawn('node', [join(root, 'server/local/bootstrap.mjs'), 'services'], {
    cwd: root,
    env: { ...process.env, LEGWORK_PORT_BASE: portBase },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  return new Promise((res, rej) => {
    let out = '';
    child.stdout!.on('data', (d: Buffer) => {
      out += d.toString();
      const m = /variables are in (\S+)\./.exec(out);
      if (m) {
        const env: Record<string, string> = {};
        for (const line of readFileSync(m[1]!, 'utf8').split('\n')) {
          const kv = /^export (\w+)='(.*)'$/.exec(line);
          if (kv) env[kv[1]!] = kv[2]!;
        }
        res({ child, env });
      }
    });
    child.once('exit', (code) => rej(new Error(`services exited (${code}):\n${out}`)));
  });
}

const section: BenchSection = {
  name: 'pipeline-e2e',
  async run(log) {
    const services = await startBenchServices();
    Object.assign(process.env, services.env);
    // Imported only now: they read the environment the services wrote.
    const { startTestApp } = await import('../../integration/support/app');
    const t = await startTestApp({
      queue: true,
      env: { LOGIN_RATE_LIMIT: '1000' },
      log: (m) => console.error(m),
    });
    const server = createServer(t.app);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
    const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    const worker = spawn(join(root, 'node_modules/.bin/tsx'), ['worker/index.ts'], {
      cwd: root,
      env: { ...process.env, DATABASE_URL: t.tdb.url, WORKER_POLL_S: '0.5' },
      stdio: ['ignore', 'ignore', 'inherit'],
    });
    try {
      // A browser-like client over real HTTP: session cookie plus CSRF token.
      let cookie = '';
      const call = async (method: string, path: string, body?: unknown, raw?: Buffer) => {
        const csrfRes = await fetch(`${url}/api/auth/csrf`, { headers: { cookie } });
        cookie = csrfRes.headers.get('set-cookie')?.split(';')[0] ?? cookie;
        const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
        const r = await fetch(`${url}${path}`, {
          method,
          headers: {
            cookie,
            'x-csrf-token': csrfToken,
            'content-type': raw ? 'application/octet-stream' : 'application/json',
          },
          ...(raw ? { body: new Uint8Array(raw) } : body ? { body: JSON.stringify(body) } : {}),
        });
        cookie = r.headers.get('set-cookie')?.split(';')[0] ?? cookie;
        if (r.status >= 300) throw new Error(`${method} ${path} answered ${r.status}: ${await r.text()}`);
        return r.json() as Promise<Record<string, unknown>>;
      };
      await call('POST', '/api/auth/login', {
        email: 'pia.producer@lanternfish.example',
        password: DEMO_PASSWORD,
      });
      const studio = `/api/studios/${t.seed.studioId}`;
      const track = await call('POST', `${studio}/tracks`, { title: 'Long Haul (bench)' });
      const duration_s = Number(process.env.BENCH_E2E_SECONDS ?? 600);
      const csv = Buffer.from(makeVehicleCsv({ duration_s, rate_hz: 1000 }));
      log(
        `take: ${(duration_s * 1000 + 1).toLocaleString('en')} samples at 1 kHz, ${(csv.byteLength / 1e6).toFixed(1)} MB of CSV`,
      );
      const t0 = performance.now();
      const take = await call(
        'POST',
        `${studio}/tracks/${String(track.id)}/takes?fileName=long-haul.csv`,
        undefined,
        csv,
      );
      const t1 = performance.now();
      const runs = (await call('POST', `${studio}/takes/${String(take.id)}/runs`, {
        venueIds: [t.seed.venueIds.dome],
      })) as unknown as { id: string }[];
      let state = 'queued';
      while (state === 'queued' || state === 'cueing') {
        await new Promise((r) => setTimeout(r, 100));
        state = String((await call('GET', `${studio}/runs/${runs[0]!.id}`)).state);
        if (performance.now() - t1 > 300_000) throw new Error('the run did not finish within 5 minutes');
      }
      const t2 = performance.now();
      log(
        `upload (HTTP -> server -> S3 fake, validated while streaming): ${((t1 - t0) / 1000).toFixed(2)} s`,
      );
      log(`queue -> worker process -> finished run (${state}): ${((t2 - t1) / 1000).toFixed(2)} s`);
      log(`upload to finished run: ${((t2 - t0) / 1000).toFixed(2)} s`);

      // The run page of this 10-minute run in Chromium: from navigation to every chart drawn. Needs
      // the built client (npm run build) and Debian's Chromium; skipped with a line when either lacks.
      if (
        !existsSync(join(root, 'dist', 'index.html')) ||
        !existsSync(process.env.CHROMIUM_PATH ?? '/usr/lib/chromium/chromium')
      ) {
        log('run page: not timed (no dist/ build or no Chromium)');
      } else {
        const { launchChromium } = await import('../../browser/support/chromium');
        const browser = await launchChromium();
        try {
          const page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
          await page.goto(`${url}/sign-in`);
          await page.getByLabel('E-mail').fill('pia.producer@lanternfish.example');
          await page.getByLabel('Password').fill(DEMO_PASSWORD);
          await page.getByRole('button', { name: 'Sign in', exact: true }).click();
          await page.getByRole('navigation', { name: 'Studio pages' }).waitFor();
          const times: number[] = [];
          for (let i = 0; i < 3; i++) {
            const p0 = performance.now();
            await page.goto(`${url}/s/${t.seed.studioId}/runs/${runs[0]!.id}`);
            await page.getByTestId('run-charts').locator('canvas').nth(5).waitFor({ timeout: 30_000 });
            await page.getByRole('table', { name: 'Budget uses, largest first' }).waitFor();
            times.push((performance.now() - p0) / 1000);
          }
          log(
            `run page of the 10-minute run, navigation to six charts and the budget table drawn: ${times.map((x) => x.toFixed(2)).join(' s, ')} s (target < 1 s)`,
          );
        } finally {
          await browser.close();
        }
      }
    } finally {
      worker.kill('SIGTERM');
      server.close();
      await t.close();
      services.child.kill('SIGTERM');
      await new Promise((r) => services.child.once('exit', r));
    }
  },
};

export default [section];
