// Bench section "process": the whole pure pipeline (resample, cue, kinematics, checks, spectra) on a
// 600,000-sample 1 kHz vehicle track, in a child process so its peak RSS is its own. Targets: under
// 2.5 s and under 400 MB peak memory. Run alone with `npm run bench -- process`.
import { spawnSync } from 'node:child_process';
import { cpus, loadavg } from 'node:os';
import { fileURLToPath } from 'node:url';
import type { BenchSection } from './bench';

const N = 600_000;
const RATE_HZ = 1000;

/** A deterministic 10 min ride at 1 kHz: curves, brakes, hills and a little vibration (g0 on z at rest). */
async function runChild(): Promise<void> {
  const { processTrack } = await import('../../shared/motion/process');
  const { demoHexapodBase } = await import('../../shared/schemas/motion-base');
  const { DEMO_BUDGET } = await import('../../shared/schemas/budget');
  const rssBefore = process.memoryUsage().rss;
  const time_s = new Float64Array(N);
  const cols = Array.from({ length: 6 }, () => new Float64Array(N));
  const [fx, fy, fz, wx, wy, wz] = cols as [
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
  ];
  for (let i = 0; i < N; i++) {
    const t = i / RATE_HZ;
    time_s[i] = t;
    fx[i] = 2.0 * Math.sin(0.21 * t) * Math.sin(0.05 * t) + 0.15 * Math.sin(2 * Math.PI * 7 * t);
    fy[i] = 1.5 * Math.sin(0.13 * t + 1) + 0.1 * Math.sin(2 * Math.PI * 11 * t);
    fz[i] = 9.80665 + 1.2 * Math.sin(0.7 * t) * Math.sin(0.031 * t) + 0.2 * Math.sin(2 * Math.PI * 13 * t);
    wx[i] = 0.05 * Math.sin(0.9 * t);
    wy[i] = 0.04 * Math.sin(0.6 * t + 0.5);
    wz[i] = 0.3 * Math.sin(0.11 * t);
  }
  const track = {
    kind: 'vehicle' as const,
    layout: 'vehicle' as const,
    length: N,
    time_s,
    names: ['fx_mps2', 'fy_mps2', 'fz_mps2', 'wx_radps', 'wy_radps', 'wz_radps'],
    columns: cols,
  };
  const rssTrack = process.memoryUsage().rss;
  // CPU time beside wall time: on a busy machine the wall clock also counts other processes' turns.
  const cpu0 = process.cpuUsage();
  const t0 = process.hrtime.bigint();
  const r = processTrack({ track, base: demoHexapodBase, budget: DEMO_BUDGET });
  const cold_s = Number(process.hrtime.bigint() - t0) / 1e9;
  const cpu1 = process.cpuUsage(cpu0);
  const coldCpu_s = (cpu1.user + cpu1.system) / 1e6;
  const maxRss = process.resourceUsage().maxRSS * 1024;
  const cpu2 = process.cpuUsage();
  const t1 = process.hrtime.bigint();
  processTrack({ track, base: demoHexapodBase, budget: DEMO_BUDGET });
  const warm_s = Number(process.hrtime.bigint() - t1) / 1e9;
  const cpu3 = process.cpuUsage(cpu2);
  const warmCpu_s = (cpu3.user + cpu3.system) / 1e6;
  const [load1] = loadavg();
  process.stdout.write(
    `${JSON.stringify({
      cold_s,
      warm_s,
      coldCpu_s,
      warmCpu_s,
      load1,
      rssBefore,
      rssTrack,
      maxRss,
      samples: r.time_s.length,
      findings: r.check.findings.length,
      exitCode: r.exitCode,
    })}\n`,
  );
}

const MB = 1024 * 1024;

const sections: BenchSection[] = [
  {
    name: 'process',
    run(log) {
      const child = spawnSync(
        process.execPath,
        ['--import', 'tsx', fileURLToPath(import.meta.url), '--child'],
        {
          encoding: 'utf8',
          maxBuffer: 1 << 20,
        },
      );
      if (child.status !== 0) {
        log(`child failed (status ${child.status}): ${child.stderr.slice(0, 2000)}`);
        return;
      }
      const m = JSON.parse(child.stdout.trim().split('\n').pop() as string) as {
        cold_s: number;
        warm_s: number;
        coldCpu_s: number;
        warmCpu_s: number;
        load1: number;
        rssBefore: number;
        rssTrack: number;
        maxRss: number;
        samples: number;
        findings: number;
        exitCode: number;
      };
      log(
        `${N} samples at ${RATE_HZ} Hz -> ${m.samples} at the controller rate, 4 seats: ` +
          `first call ${m.cold_s.toFixed(3)} s, second ${m.warm_s.toFixed(3)} s (target < 2.5 s)`,
      );
      log(
        `CPU time of the calls ${m.coldCpu_s.toFixed(3)} s and ${m.warmCpu_s.toFixed(3)} s ` +
          `(includes the garbage collector's threads; 1-min load average ${m.load1.toFixed(1)} on ${cpus().length} CPUs)`,
      );
      log(
        `peak RSS of the child ${(m.maxRss / MB).toFixed(0)} MB (target < 400 MB); ` +
          `${(m.rssBefore / MB).toFixed(0)} MB before the track, ${(m.rssTrack / MB).toFixed(0)} MB with it`,
      );
      log(`${m.findings} finding(s) with the demo budget, exit code ${m.exitCode}`);
    },
  },
];

export default sections;

if (process.argv.includes('--child')) await runChild();
