// The installed `legwork` command as a user runs it, start-up included, on generated 1 kHz vehicle
// tracks (CSV files on disk):
// - `legwork-vs-plain`: a 10-minute track (600,000 rows). In the same run, in turns, the plain script
//   tests/bench/plain-ik.mjs (read the CSV, naive inverse kinematics per row, write the legs CSV) and
//   `legwork process` (read, resample to the base's controller rate, cue, kinematics, checks, spectra,
//   the whole package). Target: legwork at most 0.4 x the plain script's time.
// - `legwork-two-hours`: a two-hour track (7,200,000 rows) through `legwork process`. Target: peak
//   resident memory under 1.5 GB.
// Each child is timed by /usr/bin/time -v when present (wall, CPU and peak RSS of that process), or
// else by an exit hook in the child that reports process.resourceUsage(). `BENCH_REPS` sets the turns
// (default 3); `BENCH_LONG_MINUTES` shortens the long track (default 120).
import { spawnSync } from 'node:child_process';
import {
  closeSync,
  existsSync,
  mkdtempSync,
  openSync,
  readFileSync,
  rmSync,
  statSync,
  writeSync,
} from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import type { BenchSection } from '../bench';

const root = resolve(import.meta.dirname, '..', '..', '..');
const legworkBin = join(root, 'node_modules', '.bin', 'legwork');
const plainScript = join(root, 'tests', 'bench', 'plain-ik.mjs');
const baseFile = join(root, 'tests', 'fixtures', 'base-hexapod.json');
const RATE_HZ = 1000;
const TIME = '/usr/bin/time';

/**
 * Writes a deterministic fictional ride at 1 kHz as a vehicle track CSV: slow curves, brakes and hills
 * with a little vibration at 7, 11 and 13 Hz, 1 g on z at rest.
 */
export function writeVehicleCsv(path: string, rows: number): number {
  const fd = openSync(path, 'w');
  try {
    writeSync(fd, 'time_s,fx_mps2,fy_mps2,fz_mps2,wx_radps,wy_radps,wz_radps\n');
    const BLOCK = 20_000;
    for (let start = 0; start < rows; start += BLOCK) {
      const end = Math.min(rows, start + BLOCK);
      const lines: string[] = [];
      for (let i = start; i < end; i++) {
        const t = i / RATE_HZ;
        const fx = 2.0 * Math.sin(0.21 * t) * Math.sin(0.05 * t) + 0.15 * Math.sin(2 * Math.PI * 7 * t);
        const fy = 1.5 * Math.sin(0.13 * t + 1) + 0.1 * Math.sin(2 * Math.PI * 11 * t);
        const fz =
          9.80665 + 1.2 * Math.sin(0.7 * t) * Math.sin(0.031 * t) + 0.2 * Math.sin(2 * Math.PI * 13 * t);
        const wx = 0.05 * Math.sin(0.9 * t);
        const wy = 0.04 * Math.sin(0.6 * t + 0.5);
        const wz = 0.3 * Math.sin(0.11 * t);
        lines.push(
          `${t.toFixed(3)},${fx.toFixed(5)},${fy.toFixed(5)},${fz.toFixed(5)},` +
            `${wx.toFixed(6)},${wy.toFixed(6)},${wz.toFixed(6)}`,
        );
      }
      writeSync(fd, `${lines.join('\n')}\n`);
    }
  } finally {
    closeSync(fd);
  }
  return statSync(path).size;
}

interface Measured {
  status: number | null;
  wall_s: number;
  /** User + system CPU time of the child (s). */
  cpu_s: number;
  /** Peak resident set size of the child (bytes). */
  maxRss: number;
  stdout: string;
  stderr: string;
}

// The fallback when /usr/bin/time is missing: the child reports its own usage as it exits.
const USAGE_MARK = 'LEGWORK_BENCH_USAGE ';
const USAGE_HOOK = `data:text/javascript,${encodeURIComponent(
  `process.on('exit', () => { const u = process.resourceUsage(); process.stderr.write(` +
    `'\\n${USAGE_MARK}' + JSON.stringify({ cpu_s: (u.userCPUTime + u.systemCPUTime) / 1e6, ` +
    `maxRss: u.maxRSS * 1024 }) + '\\n'); });`,
)}`;

const useTime = existsSync(TIME) && process.env.BENCH_NO_TIME !== '1';

/** Runs `node script args` and measures it (see the file comment). */
function measure(script: string, args: string[]): Measured {
  const t0 = process.hrtime.bigint();
  const child = useTime
    ? spawnSync(TIME, ['-v', process.execPath, script, ...args], {
        encoding: 'utf8',
        maxBuffer: 64 << 20,
      })
    : spawnSync(process.execPath, ['--import', USAGE_HOOK, script, ...args], {
        encoding: 'utf8',
        maxBuffer: 64 << 20,
      });
  const wall_s = Number(process.hrtime.bigint() - t0) / 1e9;
  let cpu_s = NaN;
  let maxRss = NaN;
  let stderr = child.stderr;
  if (useTime) {
    const num = (re: RegExp) => Number(re.exec(child.stderr)?.[1] ?? NaN);
    cpu_s = num(/User time \(seconds\): ([\d.]+)/) + num(/System time \(seconds\): ([\d.]+)/);
    maxRss = num(/Maximum resident set size \(kbytes\): (\d+)/) * 1024;
    stderr = child.stderr.slice(0, child.stderr.lastIndexOf('\tCommand being timed'));
  } else {
    const at = child.stderr.lastIndexOf(USAGE_MARK);
    if (at >= 0) {
      const u = JSON.parse(child.stderr.slice(at + USAGE_MARK.length).split('\n')[0] as string) as {
        cpu_s: number;
        maxRss: number;
      };
      cpu_s = u.cpu_s;
      maxRss = u.maxRss;
      stderr = child.stderr.slice(0, at);
    }
  }
  // Under /usr/bin/time a child's own non-zero exit is reported as a line and passed on as the status.
  return { status: child.status, wall_s, cpu_s, maxRss, stdout: child.stdout, stderr };
}

const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? (s[h] as number) : ((s[h - 1] as number) + (s[h] as number)) / 2;
};

/** `legwork process` exits 0, 3 or 4 when it wrote the package. */
const processOk = (m: Measured) => m.status === 0 || m.status === 3 || m.status === 4;

const MB = 1e6;

function describeFailure(what: string, m: Measured): string {
  return `${what} failed (status ${m.status}): ${(m.stderr || m.stdout).trim().slice(0, 2000)}`;
}

/** Compiles the command if it is stale, so no build is timed. */
function ensureBuilt(): Measured {
  return measure(legworkBin, ['--help']);
}

const sections: BenchSection[] = [
  {
    name: 'legwork-vs-plain',
    run(log) {
      const dir = mkdtempSync(join(tmpdir(), 'legwork-bench-'));
      try {
        const rows = 10 * 60 * RATE_HZ;
        const csv = join(dir, 'ride-10min.csv');
        const size = writeVehicleCsv(csv, rows);
        log(`${rows} rows (10 min at 1 kHz) vehicle track, ${(size / MB).toFixed(1)} MB of CSV`);
        const built = ensureBuilt();
        if (built.status !== 0) {
          log(describeFailure('legwork --help', built));
          return;
        }
        const reps = Math.max(1, Number(process.env.BENCH_REPS ?? 3));
        const plain: Measured[] = [];
        const legwork: Measured[] = [];
        for (let r = 0; r < reps; r++) {
          const p = measure(plainScript, [csv, baseFile, join(dir, 'plain-legs.csv')]);
          if (p.status !== 0) {
            log(describeFailure('the plain script', p));
            return;
          }
          plain.push(p);
          const l = measure(legworkBin, [
            'process',
            '--base',
            baseFile,
            '--in',
            csv,
            '--out',
            join(dir, 'pkg'),
          ]);
          if (!processOk(l)) {
            log(describeFailure('legwork process', l));
            return;
          }
          legwork.push(l);
        }
        const plainRows = readFileSync(join(dir, 'plain-legs.csv'), 'utf8').split('\n').length - 2;
        const pkgRows = readFileSync(join(dir, 'pkg', 'legs.csv'), 'utf8').split('\n').length - 2;
        const pw = median(plain.map((m) => m.wall_s));
        const lw = median(legwork.map((m) => m.wall_s));
        const pc = median(plain.map((m) => m.cpu_s));
        const lc = median(legwork.map((m) => m.cpu_s));
        const fmt = (ms: Measured[]) => ms.map((m) => m.wall_s.toFixed(2)).join(', ');
        log(
          `plain script (read CSV, naive IK per row, write ${plainRows} leg rows): ` +
            `median ${pw.toFixed(2)} s wall, ${pc.toFixed(2)} s CPU (runs: ${fmt(plain)} s)`,
        );
        log(
          `legwork process (installed command, start-up included; ${pkgRows} leg rows at the ` +
            `controller rate, exit ${legwork[0]?.status}): median ${lw.toFixed(2)} s wall, ${lc.toFixed(2)} s CPU ` +
            `(runs: ${fmt(legwork)} s)`,
        );
        log(
          `legwork / plain: ${(lw / pw).toFixed(2)} wall, ${(lc / pc).toFixed(2)} CPU (target <= 0.4); ` +
            `peak RSS ${(median(legwork.map((m) => m.maxRss)) / MB).toFixed(0)} MB vs ` +
            `${(median(plain.map((m) => m.maxRss)) / MB).toFixed(0)} MB`,
        );
        log(
          `timed by ${useTime ? '/usr/bin/time -v' : 'process.resourceUsage() in the child'}; ` +
            `1-min load average ${loadavg()[0]?.toFixed(1)} on ${cpus().length} CPUs`,
        );
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    },
  },
  {
    name: 'legwork-two-hours',
    run(log) {
      const dir = mkdtempSync(join(tmpdir(), 'legwork-bench-'));
      try {
        const minutes = Number(process.env.BENCH_LONG_MINUTES ?? 120);
        const rows = Math.round(minutes * 60 * RATE_HZ);
        const csv = join(dir, 'ride-long.csv');
        const t0 = process.hrtime.bigint();
        const size = writeVehicleCsv(csv, rows);
        log(
          `${rows} rows (${minutes} min at 1 kHz) vehicle track, ${(size / MB).toFixed(0)} MB of CSV ` +
            `(written in ${(Number(process.hrtime.bigint() - t0) / 1e9).toFixed(1)} s)`,
        );
        const built = ensureBuilt();
        if (built.status !== 0) {
          log(describeFailure('legwork --help', built));
          return;
        }
        const m = measure(legworkBin, [
          'process',
          '--base',
          baseFile,
          '--in',
          csv,
          '--out',
          join(dir, 'pkg'),
        ]);
        if (!processOk(m)) {
          log(describeFailure('legwork process', m));
          return;
        }
        const pkgRows = readFileSync(join(dir, 'pkg', 'legs.csv'), 'utf8').split('\n').length - 2;
        log(
          `legwork process: exit ${m.status}, ${pkgRows} leg rows, ${m.wall_s.toFixed(1)} s wall, ` +
            `${m.cpu_s.toFixed(1)} s CPU`,
        );
        log(
          `peak RSS ${(m.maxRss / MB).toFixed(0)} MB (target < 1500 MB), timed by ` +
            `${useTime ? '/usr/bin/time -v' : 'process.resourceUsage() in the child'}`,
        );
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    },
  },
];

export default sections;
