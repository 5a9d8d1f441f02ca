// Load on the server through the real services: a studio with 10,000 tracks and 50,000 runs (written
// straight into PostgreSQL; every finished run carries the summary of a real run), the server on
// loopback, and autocannon in a second process driving, one after another:
// - the tracks table (page 1 of 25, newest first), 50 connections, target p99 < 50 ms;
// - the run page's data (GET /runs/:run), 50 connections;
// - sign-in: a fresh visit (session and CSRF token) and POST /api/auth/login with the right password
//   (argon2id is slow on purpose), 10 connections (tests/bench/sign-in-load.mjs).
// Prints requests per second and the p50 / p99 latency of each, every non-2xx count, the server's
// CPU time while autocannon ran and the load average (the machine may be shared). The tracks table is
// also timed one request at a time, kept and made anew after a write.
// Then a burst: ten 600,000-sample (10 min at 1 kHz) takes queued at once, cued by one worker process;
// prints the time until all are finished and the worker's peak resident memory (target < 1 GB).
// `BENCH_LOAD_S` sets the seconds per endpoint (default 10); `BENCH_BURST=0` skips the burst;
// `BENCH_PORT_BASE` moves the services' ports (default 5980).
import { execFile, spawn } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { loadavg } from 'node:os';
import { promisify } from 'node:util';
import pg from 'pg';
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { join, resolve } from 'node:path';
import type { BenchSection } from '../bench';
import { makeVehicleCsv } from '../../factories/takes';
import { DEMO_PASSWORD } from '../../../shared/demo';
import { QUEUES } from '../../../server/queue';
import { startBenchServices } from './pipeline-e2e';

const root = resolve(import.meta.dirname, '..', '..', '..');
const TRACKS = 10_000;
const RUNS_PER_TRACK = 5;

interface Cannon {
  requests: { average: number; total?: number };
  latency: { p50: number; p99: number; average: number; max: number };
  non2xx: number;
  statusCodeStats?: Record<string, { count: number }>;
  errors: number;
  timeouts: number;
  /** CPU time of this process (the server under test) while autocannon ran. */
  serverCpu_ms?: number;
}

const run = promisify(execFile);

/** autocannon in its own process (its CLI, JSON out), so it does not share the server's event loop. */
async function cannon(
  url: string,
  opts: {
    connections: number;
    seconds: number;
    headers: Record<string, string>;
    method?: string;
    body?: string;
  },
): Promise<Cannon> {
  const args = ['-j', '-c', String(opts.connections), '-d', String(opts.seconds)];
  for (const [k, v] of Object.entries(opts.headers)) args.push('-H', `${k}=${v}`);
  if (opts.method) args.push('-m', opts.method);
  if (opts.body) args.push('-b', opts.body);
  const cpu0 = process.cpuUsage();
  const r = await run(join(root, 'node_modules/.bin/autocannon'), [...args, url], {
    encoding: 'utf8',
    maxBuffer: 64 * 1024 * 1024,
  });
  const cpu = process.cpuUsage(cpu0);
  const out = JSON.parse(r.stdout) as Cannon;
  out.serverCpu_ms = (cpu.user + cpu.system) / 1000;
  return out;
}

const section: BenchSection = {
  name: 'load',
  async run(log) {
    const seconds = Number(process.env.BENCH_LOAD_S ?? 10);
    const services = await startBenchServices(process.env.BENCH_PORT_BASE ?? '5980');
    Object.assign(process.env, services.env);
    const { startTestApp, Client } = await import('../../integration/support/app');
    const { startCueWorker } = await import('../../integration/support/cue-worker');
    const t = await startTestApp({
      queue: true,
      env: {
        LOGIN_RATE_LIMIT: '1000000',
        LOGIN_RATE_LIMIT_PER_CLIENT: '1000000',
        LOGIN_RATE_LIMIT_GLOBAL: '1000000',
      },
    });
    const server = createServer(t.app);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
    const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    try {
      // One real run, whose summary the seeded finished runs carry.
      const worker = await startCueWorker(t);
      const producer = new Client(t.app);
      await producer.signIn('pia.producer@lanternfish.example');
      const base = `/api/studios/${t.seed.studioId}`;
      const track = (
        await producer.send('post', `${base}/tracks`, { title: 'Seed Ride', film: 'Undertow (fictional)' })
      ).body as { id: string };
      const take = (
        await producer
          .raw('post', `${base}/tracks/${track.id}/takes?fileName=seed.csv`)
          .set('content-type', 'application/octet-stream')
          .send(Buffer.from(makeVehicleCsv({ duration_s: 30 })))
      ).body as { id: string };
      const [real] = (
        await producer.send('post', `${base}/takes/${take.id}/runs`, { venueIds: [t.seed.venueIds.dome] })
      ).body as { id: string }[];
      const done = await worker.waitForRun(real!.id);
      // From here on only the worker process of the burst takes jobs.
      await t.boss!.offWork(QUEUES.cueRun);
      worker.close();

      const s0 = performance.now();
      const q = (text: string, values: unknown[] = []) => t.tdb.pool.query(text, values);
      await q(
        `INSERT INTO tracks (studio_id, title, film, created_at, updated_at)
         SELECT $1, 'Load Ride ' || g, 'Undertow (fictional)', now() - g * interval '1 minute', now() - g * interval '1 minute'
         FROM generate_series(1, $2) g`,
        [t.seed.studioId, TRACKS],
      );
      await q(
        `INSERT INTO takes (studio_id, track_id, number, kind, layout, file_name, storage_key, size_bytes, sha256, samples, duration_s, uploaded_via)
         SELECT studio_id, id, 1, 'vehicle', 'vehicle', 'load.csv', 'studios/none/' || id, 1000, repeat('0', 64), 3001, 30, 'browser'
         FROM tracks WHERE studio_id = $1 AND title LIKE 'Load Ride %'`,
        [t.seed.studioId],
      );
      await q(
        `INSERT INTO cue_runs (studio_id, track_id, take_id, venue_id, budget_version_id, params, state, progress, attempts, summary, artifact_prefix, created_at, started_at, finished_at)
         SELECT k.studio_id, k.track_id, k.id, CASE WHEN v % 2 = 0 THEN $2::uuid ELSE $3::uuid END, $4,
                jsonb_build_object('filmOffset_frames', v), CASE WHEN v = 4 THEN 'queued' ELSE r.state END,
                CASE WHEN v = 4 THEN 0 ELSE 100 END, 1, CASE WHEN v = 4 THEN NULL ELSE r.summary END,
                CASE WHEN v = 4 THEN NULL ELSE r.artifact_prefix END, now() - v * interval '1 second', now(), now()
         FROM takes k CROSS JOIN generate_series(0, $5 - 1) v, (SELECT * FROM cue_runs WHERE id = $6) r
         WHERE k.studio_id = $1 AND k.file_name = 'load.csv'`,
        [
          t.seed.studioId,
          t.seed.venueIds.dome,
          t.seed.venueIds.arcade,
          t.seed.budgetVersionId,
          RUNS_PER_TRACK,
          done.id,
        ],
      );
      // Planner statistics for the new rows, as autovacuum would gather them soon after: by the
      // tables' owner (the login role), since the application's role may not analyze them.
      const owner = new pg.Client({ connectionString: t.tdb.url });
      await owner.connect();
      try {
        await owner.query('VACUUM ANALYZE');
      } finally {
        await owner.end();
      }
      const counts = (
        await q(
          `SELECT (SELECT count(*) FROM tracks WHERE studio_id = $1) AS tracks, (SELECT count(*) FROM cue_runs WHERE studio_id = $1) AS runs`,
          [t.seed.studioId],
        )
      ).rows[0] as { tracks: string; runs: string };
      log(
        `seeded ${counts.tracks} tracks and ${counts.runs} runs in ${((performance.now() - s0) / 1000).toFixed(1)} s`,
      );

      // A browser-like session for autocannon: cookie and CSRF token from a real sign-in over HTTP.
      const csrf1 = await fetch(`${url}/api/auth/csrf`);
      let cookie = csrf1.headers.get('set-cookie')?.split(';')[0] ?? '';
      const { csrfToken: preToken } = (await csrf1.json()) as { csrfToken: string };
      const login = await fetch(`${url}/api/auth/login`, {
        method: 'POST',
        headers: { cookie, 'x-csrf-token': preToken, 'content-type': 'application/json' },
        body: JSON.stringify({ email: 'pia.producer@lanternfish.example', password: DEMO_PASSWORD }),
      });
      cookie = login.headers.get('set-cookie')?.split(';')[0] ?? cookie;

      const show = (what: string, c: Cannon, target?: string) =>
        log(
          `${what}: ${c.requests.average.toFixed(0)} req/s, p50 ${c.latency.p50} ms, p99 ${c.latency.p99} ms, max ${c.latency.max} ms` +
            `${c.non2xx || c.errors || c.timeouts ? `; ${c.non2xx} non-2xx, ${c.errors} errors, ${c.timeouts} timeouts` : ''}` +
            `${
              c.non2xx
                ? ` (status: ${Object.entries(c.statusCodeStats ?? {})
                    .map(([k, v]) => `${k} x${v.count}`)
                    .join(', ')})`
                : ''
            }` +
            `${target ? ` (target ${target})` : ''}` +
            `${
              c.serverCpu_ms !== undefined && c.requests.total
                ? `; server CPU ${(c.serverCpu_ms / 1000).toFixed(1)} s over ${seconds} s wall, ${(c.serverCpu_ms / c.requests.total).toFixed(2)} ms a request`
                : ''
            }; load average ${loadavg()
              .map((l) => l.toFixed(1))
              .join(' ')}`,
        );
      const firstPage = await fetch(`${url}${base}/tracks?page=1&pageSize=25`, { headers: { cookie } });
      if (firstPage.status !== 200) throw new Error(`tracks table answered ${firstPage.status}`);
      // One request at a time first: the cost of a request alone, apart from queueing under load.
      const alone: number[] = [];
      for (let i = 0; i < 40; i++) {
        const t0 = performance.now();
        await (await fetch(`${url}${base}/tracks?page=1&pageSize=25`, { headers: { cookie } })).arrayBuffer();
        alone.push(performance.now() - t0);
      }
      alone.sort((a, b) => a - b);
      const size = (
        await q('SELECT avg(pg_column_size(summary))::int AS bytes FROM cue_runs WHERE summary IS NOT NULL')
      ).rows[0] as { bytes: number };
      log(
        `tracks table, one request at a time: median ${alone[20]!.toFixed(1)} ms, slowest ${alone[39]!.toFixed(1)} ms (stored run summary ${size.bytes} bytes on average)`,
      );
      // The same, with a change to the studio's tracks before each request: the answer is made anew
      // every time (what the first read after a write costs).
      const fresh: number[] = [];
      for (let i = 0; i < 40; i++) {
        await q(`UPDATE tracks SET updated_at = updated_at WHERE id = $1`, [track.id]);
        const t0 = performance.now();
        await (await fetch(`${url}${base}/tracks?page=1&pageSize=25`, { headers: { cookie } })).arrayBuffer();
        fresh.push(performance.now() - t0);
      }
      fresh.sort((a, b) => a - b);
      log(
        `tracks table after a write each time (answer made anew), one request at a time: median ${fresh[20]!.toFixed(1)} ms, slowest ${fresh[39]!.toFixed(1)} ms`,
      );
      show(
        'tracks table, page 1 of 25 rows, 50 connections',
        await cannon(`${url}${base}/tracks?page=1&pageSize=25`, {
          connections: 50,
          seconds,
          headers: { cookie },
        }),
        'p99 < 50 ms',
      );
      show(
        'run page data (GET /runs/:run), 50 connections',
        await cannon(`${url}${base}/runs/${done.id}`, { connections: 50, seconds, headers: { cookie } }),
      );
      const signIn = await run(
        'node',
        [
          join(root, 'tests/bench/sign-in-load.mjs'),
          url,
          'pia.producer@lanternfish.example',
          DEMO_PASSWORD,
          '10',
          String(seconds),
        ],
        { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 },
      );
      show(
        'a visit and a sign-in with the right password (argon2id), 10 connections; per request',
        JSON.parse(signIn.stdout) as Cannon,
      );

      if (process.env.BENCH_BURST !== '0') {
        // One 10-minute 1 kHz take uploaded over HTTP, nine more rows for the same stored file.
        const csv = Buffer.from(makeVehicleCsv({ duration_s: 600, rate_hz: 1000 }));
        const big = (
          await producer
            .raw('post', `${base}/tracks/${track.id}/takes?fileName=long.csv`)
            .set('content-type', 'application/octet-stream')
            .send(csv)
        ).body as { id: string; samples: number };
        await q(
          `INSERT INTO takes (studio_id, track_id, number, kind, layout, file_name, storage_key, size_bytes, sha256, samples, duration_s, uploaded_via)
           SELECT studio_id, track_id, number + g, kind, layout, file_name, storage_key, size_bytes, sha256, samples, duration_s, uploaded_via
           FROM takes, generate_series(1, 9) g WHERE id = $1`,
          [big.id],
        );
        const ids = (
          await q(`SELECT id FROM takes WHERE track_id = $1 AND file_name = 'long.csv' ORDER BY number`, [
            track.id,
          ])
        ).rows as { id: string }[];
        const workerProc = spawn('node', ['--import', 'tsx', 'worker/index.ts'], {
          cwd: root,
          env: { ...process.env, DATABASE_URL: t.tdb.url, WORKER_POLL_S: '0.5' },
          stdio: ['ignore', 'ignore', 'inherit'],
        });
        let peak_kb = 0;
        const sampler = setInterval(() => {
          try {
            const m = /VmHWM:\s+(\d+) kB/.exec(readFileSync(`/proc/${workerProc.pid}/status`, 'utf8'));
            if (m) peak_kb = Math.max(peak_kb, Number(m[1]));
          } catch {
            // not started or gone
          }
        }, 200);
        try {
          const b0 = performance.now();
          const runIds: string[] = [];
          for (const { id } of ids) {
            const made = (
              await producer.send('post', `${base}/takes/${id}/runs`, { venueIds: [t.seed.venueIds.dome] })
            ).body as { id: string }[];
            runIds.push(made[0]!.id);
          }
          for (;;) {
            const left = (
              await q(
                `SELECT count(*)::int AS n FROM cue_runs WHERE id = ANY($1) AND state IN ('queued', 'cueing')`,
                [runIds],
              )
            ).rows[0] as { n: number };
            if (left.n === 0) break;
            if (performance.now() - b0 > 900_000)
              throw new Error('the burst did not finish within 15 minutes');
            await new Promise((r) => setTimeout(r, 500));
          }
          const states = (
            await q(`SELECT state, count(*)::int AS n FROM cue_runs WHERE id = ANY($1) GROUP BY state`, [
              runIds,
            ])
          ).rows as { state: string; n: number }[];
          log(
            `burst of ${runIds.length} takes of ${big.samples.toLocaleString('en')} samples queued at once, one worker: all finished in ` +
              `${((performance.now() - b0) / 1000).toFixed(1)} s (${states.map((x) => `${x.n} ${x.state}`).join(', ')}); ` +
              `worker peak RSS ${(peak_kb / 1024).toFixed(0)} MB (target < 1024 MB)`,
          );
        } finally {
          clearInterval(sampler);
          workerProc.kill('SIGTERM');
        }
      }
    } finally {
      await new Promise((r) => server.close(r));
      await t.close();
      services.child.kill('SIGINT');
    }
  },
};

export default [section];
