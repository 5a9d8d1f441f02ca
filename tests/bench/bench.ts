// `npm run bench`: speed figures, printed, never asserted in unit tests. Each section is a named
// function. More sections: add a file tests/bench/sections/<name>.ts whose default export is a
// BenchSection[] (import only the types from here); this script runs its own sections, then every
// such file in name order. `npm run bench -- NAME ...` runs only the named sections.

import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { matrix, multiply, norm, rotationMatrix, add, subtract } from 'mathjs';
import type { Matrix } from 'mathjs';
import { hexapodForward, hexapodGeometry, hexapodInverse } from '../../shared/motion/hexapod';
import type { PoseColumns } from '../../shared/motion/hexapod';
import { demoHexapodBase } from '../../shared/schemas/motion-base';
import { makePoseTrack, makeSmoothMotion } from '../factories/motion';

/** A named bench section; `log` prints one figure line under the section's name. */
export interface BenchSection {
  name: string;
  run(log: (line: string) => void): void | Promise<void>;
}

const sections: BenchSection[] = [];

/** Adds a section to this run (for sections defined in this file). */
export function registerSection(section: BenchSection): void {
  sections.push(section);
}

function seconds(start: bigint): number {
  return Number(process.hrtime.bigint() - start) / 1e9;
}

function fmtRate(perSecond: number): string {
  return perSecond >= 1e6 ? `${(perSecond / 1e6).toFixed(2)} M/s` : `${(perSecond / 1e3).toFixed(1)} k/s`;
}

// Ten minutes at 1 kHz, built once and shared by the kinematics sections.
const N = 600_000;
const RATE_HZ = 1000;
let cached: { time_s: Float64Array; pose: PoseColumns } | null = null;
function benchTrack(): { time_s: Float64Array; pose: PoseColumns } {
  cached ??= makePoseTrack(N, RATE_HZ, makeSmoothMotion(20260101));
  return cached;
}

const geometry = hexapodGeometry(demoHexapodBase);

/** The same inverse kinematics written plainly with mathjs matrices: the speed baseline and an oracle. */
function mathjsInverse(pose: PoseColumns, count: number, out: Float64Array): void {
  const B = demoHexapodBase.baseJoints_m.map((b) => matrix(b));
  const P = demoHexapodBase.platformJoints_m.map((p) => matrix(p));
  const ez = matrix([0, 0, 1]);
  const ey = matrix([0, 1, 0]);
  const ex = matrix([1, 0, 0]);
  for (let s = 0; s < count; s++) {
    const R = multiply(
      multiply(
        rotationMatrix(pose.yaw_rad[s] as number, ez),
        rotationMatrix(pose.pitch_rad[s] as number, ey),
      ),
      rotationMatrix(pose.roll_rad[s] as number, ex),
    ) as Matrix;
    const p = matrix([
      pose.x_m[s] as number,
      pose.y_m[s] as number,
      (pose.z_m[s] as number) + demoHexapodBase.neutralHeight_m,
    ]);
    for (let i = 0; i < 6; i++) {
      const L = subtract(add(p, multiply(R, P[i] as Matrix)), B[i] as Matrix) as Matrix;
      out[6 * s + i] = norm(L) as number;
    }
  }
}

let ikPerSecond = 0;

registerSection({
  name: 'hexapod-ik',
  run(log) {
    const { pose } = benchTrack();
    const legs = Array.from({ length: 6 }, () => new Float64Array(N));
    hexapodInverse(geometry, pose, legs); // warm-up
    const reps = 5;
    const t0 = process.hrtime.bigint();
    for (let r = 0; r < reps; r++) hexapodInverse(geometry, pose, legs);
    const dt = seconds(t0) / reps;
    ikPerSecond = N / dt;
    let lo = Infinity;
    let hi = -Infinity;
    for (const l of legs)
      for (let s = 0; s < N; s++) ((v) => ((lo = Math.min(lo, v)), (hi = Math.max(hi, v))))(l[s] as number);
    log(
      `${N} poses (10 min at 1 kHz), Float64Array IK: ${dt.toFixed(4)} s per pass = ${fmtRate(ikPerSecond)} poses`,
    );
    log(
      `leg range ${lo.toFixed(4)} .. ${hi.toFixed(4)} m (stroke ${demoHexapodBase.leg.min_m} .. ${demoHexapodBase.leg.max_m} m)`,
    );
  },
});

registerSection({
  name: 'hexapod-ik-mathjs-baseline',
  run(log) {
    const { pose } = benchTrack();
    const subset = 20_000;
    const out = new Float64Array(6 * subset);
    mathjsInverse(pose, 500, out); // warm-up
    const t0 = process.hrtime.bigint();
    mathjsInverse(pose, subset, out);
    const dt = seconds(t0);
    const perSecond = subset / dt;
    // Agreement with the fast path on the same subset, so the comparison is of equal work.
    const legs = hexapodInverse(geometry, {
      x_m: pose.x_m.subarray(0, subset),
      y_m: pose.y_m.subarray(0, subset),
      z_m: pose.z_m.subarray(0, subset),
      roll_rad: pose.roll_rad.subarray(0, subset),
      pitch_rad: pose.pitch_rad.subarray(0, subset),
      yaw_rad: pose.yaw_rad.subarray(0, subset),
    });
    let diff = 0;
    for (let s = 0; s < subset; s++) {
      for (let i = 0; i < 6; i++)
        diff = Math.max(diff, Math.abs((legs[i]?.[s] as number) - (out[6 * s + i] as number)));
    }
    log(
      `mathjs rotationMatrix/multiply/norm per sample: ${subset} poses in ${dt.toFixed(3)} s = ${fmtRate(perSecond)} poses`,
    );
    log(`extrapolated to ${N} poses: ${(N / perSecond).toFixed(1)} s (measured on the first ${subset} only)`);
    log(`max |fast - mathjs| leg length ${diff.toExponential(2)} m`);
    if (ikPerSecond > 0)
      log(`IK speed-up over the mathjs baseline: ${(ikPerSecond / perSecond).toFixed(0)}x (target >= 30x)`);
  },
});

registerSection({
  name: 'hexapod-fk',
  run(log) {
    const { time_s, pose } = benchTrack();
    const legs = hexapodInverse(geometry, pose);
    const t0 = process.hrtime.bigint();
    const cpu0 = process.cpuUsage();
    const back = hexapodForward(geometry, legs, { time_s });
    const dt = seconds(t0);
    const cpu = process.cpuUsage(cpu0);
    let err = 0;
    const cols = ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const;
    for (const c of cols)
      for (let s = 0; s < N; s++)
        err = Math.max(err, Math.abs((back[c][s] as number) - (pose[c][s] as number)));
    log(
      `${N} samples, Newton started from the previous poses: ${dt.toFixed(3)} s total = ${fmtRate(N / dt)} (target < 3 s)`,
    );
    // CPU time shows the cost when other work shares the machine's two cores and stretches the wall time.
    log(`process CPU time during FK ${((cpu.user + cpu.system) / 1e6).toFixed(3)} s`);
    log(`max |FK(IK(pose)) - pose| ${err.toExponential(2)} (m or rad)`);
  },
});

registerSection((await import('./cue-bench')).cueBenchSection);

async function loadExtraSections(): Promise<BenchSection[]> {
  const dir = join(dirname(fileURLToPath(import.meta.url)), 'sections');
  let files: string[];
  try {
    files = readdirSync(dir)
      .filter((f) => f.endsWith('.ts'))
      .sort();
  } catch {
    return [];
  }
  const out: BenchSection[] = [];
  for (const f of files) {
    const mod = (await import(pathToFileURL(join(dir, f)).href)) as { default?: BenchSection[] };
    if (Array.isArray(mod.default)) out.push(...mod.default);
  }
  return out;
}

async function main(): Promise<void> {
  const only = process.argv.slice(2);
  const all = [...sections, ...(await loadExtraSections())];
  const chosen = only.length > 0 ? all.filter((s) => only.includes(s.name)) : all;
  console.log(`legwork bench: node ${process.version}, ${chosen.length} section(s)`);
  const t0 = process.hrtime.bigint();
  for (const s of chosen) {
    const log = (line: string): void => console.log(`[${s.name}] ${line}`);
    const ts = process.hrtime.bigint();
    await s.run(log);
    log(`section time ${seconds(ts).toFixed(2)} s`);
  }
  // maxRSS is in kilobytes.
  console.log(
    `total ${seconds(t0).toFixed(2)} s, peak RSS ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MiB`,
  );
}

for (const s of (await import('./process-bench')).default) registerSection(s);
await main();
