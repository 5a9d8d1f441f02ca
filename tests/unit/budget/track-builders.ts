// Builders for budget tests: pose tracks from closed-form motion, and budgets with overrides.
import type { Track } from '../../../shared/motion/track-reader';
import type { Budget } from '../../../shared/schemas/budget';
import { DEMO_BUDGET } from '../../../shared/schemas/budget';

export type PoseFn = (t_s: number) => readonly [number, number, number, number, number, number];

/** A hexapod pose track (SI columns) sampled at rate_hz for duration_s from a closed-form motion. */
export function makePoseTrackFrom(rate_hz: number, duration_s: number, f: PoseFn): Track {
  const n = Math.round(duration_s * rate_hz) + 1;
  const time_s = new Float64Array(n);
  const cols = Array.from({ length: 6 }, () => new Float64Array(n));
  for (let i = 0; i < n; i++) {
    const t = i / rate_hz;
    time_s[i] = t;
    const p = f(t);
    for (let c = 0; c < 6; c++) (cols[c] as Float64Array)[i] = p[c] as number;
  }
  return {
    kind: 'pose',
    layout: 'hexapod',
    length: n,
    time_s,
    names: ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'],
    columns: cols,
  };
}

/** Pose CSV text (SI columns) of a track made by makePoseTrackFrom. */
export function poseTrackCsv(track: Track): string {
  const lines = [['time_s', ...track.names].join(',')];
  for (let i = 0; i < track.length; i++) {
    lines.push([track.time_s[i], ...track.columns.map((c) => c[i])].join(','));
  }
  return `${lines.join('\n')}\n`;
}

/** The demo budget with parts replaced (deep enough for envelope axes and comfort keys). */
export function makeBudget(overrides: {
  strokeMargin_m?: number;
  envelope?: Partial<Budget['envelope']>;
  comfort?: Partial<Budget['comfort']>;
  startEnd?: Budget['startEnd'];
}): Budget {
  return {
    ...(overrides.startEnd ? { startEnd: overrides.startEnd } : {}),
    ...DEMO_BUDGET,
    name: 'test budget',
    strokeMargin_m: overrides.strokeMargin_m ?? DEMO_BUDGET.strokeMargin_m,
    envelope: { ...DEMO_BUDGET.envelope, ...overrides.envelope },
    comfort: { ...DEMO_BUDGET.comfort, ...overrides.comfort },
  };
}

/** Smooth step 0 -> 1 between t0 and t1 (cosine ramp), for motions with continuous derivatives. */
export function smoothStep(t: number, t0: number, t1: number): number {
  if (t <= t0) return 0;
  if (t >= t1) return 1;
  return 0.5 - 0.5 * Math.cos((Math.PI * (t - t0)) / (t1 - t0));
}

/**
 * startEnd tolerances wide enough for tests about other checks whose closed-form motion (a sinusoid
 * from t = 0) starts moving; the startEnd check itself is tested in start-end.test.ts.
 */
export const RELAXED_START_END: NonNullable<Budget['startEnd']> = {
  position_m: 1,
  angle_rad: 1,
  speed_mps: 10,
  angularSpeed_radps: 10,
};
