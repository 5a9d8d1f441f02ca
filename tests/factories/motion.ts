// Factories for motion tests and the bench: fictional bases and smooth, deterministic pose tracks
// whose derivatives are known in closed form.

import { parseMotionBase } from '../../shared/schemas/motion-base';
import type { HexapodBase, HexapodParametricInput, Planar3Base } from '../../shared/schemas/motion-base';
import { demoHexapodInput, demoPlanar3Base } from '../../shared/schemas/motion-base';
import type { PoseColumns, PoseRates } from '../../shared/motion/hexapod';

/** Deterministic PRNG (mulberry32) returning floats in [0, 1). */
export function makeRng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A validated hexapod from the demo parametric form with overrides (lengths m, angles deg). */
export function makeHexapodBase(overrides: Partial<HexapodParametricInput> = {}): HexapodBase {
  return parseMotionBase({ ...demoHexapodInput, ...overrides }) as HexapodBase;
}

/** A validated planar3 base from the demo one with overrides. */
export function makePlanar3Base(overrides: Partial<Planar3Base> = {}): Planar3Base {
  return parseMotionBase({ ...demoPlanar3Base, ...overrides }) as Planar3Base;
}

/** Amplitudes (m, rad) of a smooth track well inside the demo hexapod's workspace. */
export const DEMO_AMPLITUDE = { x: 0.12, y: 0.12, z: 0.1, roll: 0.1, pitch: 0.1, yaw: 0.12 } as const;

interface Harmonic {
  a: number;
  w: number;
  ph: number;
}

/** Smooth pose motion: per axis a sum of three sinusoids, 0.05 to 1.5 Hz, seeded; closed-form rates. */
export interface SmoothMotion {
  pose(t_s: number): [number, number, number, number, number, number];
  rates(t_s: number): [number, number, number, number, number, number];
}

/** Random-ish but deterministic smooth motion (m, rad) with peak offsets at most `amplitude` per axis. */
export function makeSmoothMotion(
  seed = 1,
  amplitude: Record<keyof typeof DEMO_AMPLITUDE, number> = DEMO_AMPLITUDE,
): SmoothMotion {
  const rng = makeRng(seed);
  const axes = [amplitude.x, amplitude.y, amplitude.z, amplitude.roll, amplitude.pitch, amplitude.yaw];
  const harmonics: Harmonic[][] = axes.map((amp) => {
    const weights = [rng() + 0.2, rng() + 0.2, rng() + 0.2];
    const sum = weights[0]! + weights[1]! + weights[2]!;
    return weights.map((wt) => ({
      a: (amp * wt) / sum,
      w: 2 * Math.PI * (0.05 + 1.45 * rng()),
      ph: 2 * Math.PI * rng(),
    }));
  });
  const evalAxis = (h: Harmonic[], t: number, d: boolean): number => {
    let s = 0;
    for (const { a, w, ph } of h) s += d ? a * w * Math.cos(w * t + ph) : a * Math.sin(w * t + ph);
    return s;
  };
  const six = (t: number, d: boolean) =>
    harmonics.map((h) => evalAxis(h, t, d)) as [number, number, number, number, number, number];
  return { pose: (t) => six(t, false), rates: (t) => six(t, true) };
}

/** Samples SmoothMotion on a uniform grid: n samples at rate_hz, pose offsets and exact rates. */
export function makePoseTrack(
  n: number,
  rate_hz: number,
  motion: SmoothMotion = makeSmoothMotion(),
): { time_s: Float64Array; pose: PoseColumns; rates: PoseRates } {
  const time_s = new Float64Array(n);
  const cols = Array.from({ length: 6 }, () => new Float64Array(n));
  const rcols = Array.from({ length: 6 }, () => new Float64Array(n));
  for (let k = 0; k < n; k++) {
    const t = k / rate_hz;
    time_s[k] = t;
    const p = motion.pose(t);
    const r = motion.rates(t);
    for (let j = 0; j < 6; j++) {
      cols[j]![k] = p[j]!;
      rcols[j]![k] = r[j]!;
    }
  }
  const [x_m, y_m, z_m, roll_rad, pitch_rad, yaw_rad] = cols as [
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
  ];
  const [vx_mps, vy_mps, vz_mps, droll_radps, dpitch_radps, dyaw_radps] = rcols as [
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
  ];
  return {
    time_s,
    pose: { x_m, y_m, z_m, roll_rad, pitch_rad, yaw_rad },
    rates: { vx_mps, vy_mps, vz_mps, droll_radps, dpitch_radps, dyaw_radps },
  };
}

/** CSV text of columns under a header (full precision), for reader and CLI tests. */
export function makeCsv(names: readonly string[], rows: readonly (readonly number[])[]): string {
  return `${names.join(',')}\n${rows.map((r) => r.join(',')).join('\n')}\n`;
}
