// The "startEnd" check: a show must start and end with the platform at neutral and at rest, or the
// platform jumps when the controller takes over the first sample (or is left moving after the last).
// At each end of the track: every pose offset (x, y, z in m; roll, pitch, yaw in rad) and its rate
// (m/s, rad/s) must be within the budget's tolerance; the ratio is |value| / tolerance, and the worst
// quantity names the finding. This is a hard limit: a run that would jump cannot be cleared, only cued
// again (common practice: motion controllers start a show from the home position at rest).
//
// Rates at the ends come from the quadratic through the first (last) three samples, evaluated at the end
// sample (the one-sided three-point formula; exact for a quadratic, so a ramp or a parabola reads true).
import type { StartEndTolerance } from '../schemas/budget';
import { DEFAULT_START_END_TOLERANCE } from '../schemas/budget';
import type { Finding, Use } from '../schemas/findings';
import { CHECK_SEVERITY } from '../schemas/findings';
import type { PoseColumns } from './hexapod';

const POSE_KEYS = ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const;
const NAMES = ['x', 'y', 'z', 'roll', 'pitch', 'yaw'] as const;

/** One quantity at one end: its name and unit, the value and the tolerance it is held to. */
export interface EndQuantity {
  quantity: string;
  unit: string;
  value: number;
  limit: number;
}

/** Pose offsets and their rates at sample `at` (0 or n - 1) of a pose track, each with its tolerance. */
export function endQuantities(
  time_s: Float64Array,
  pose: PoseColumns,
  at: 'start' | 'end',
  tol: StartEndTolerance,
): EndQuantity[] {
  const n = time_s.length;
  const out: EndQuantity[] = [];
  POSE_KEYS.forEach((key, k) => {
    const col = pose[key];
    const angular = k >= 3;
    const i = at === 'start' ? 0 : n - 1;
    out.push({
      quantity: NAMES[k] as string,
      unit: angular ? 'rad' : 'm',
      value: col[i] as number,
      limit: angular ? tol.angle_rad : tol.position_m,
    });
    out.push({
      quantity: `${NAMES[k]} rate`,
      unit: angular ? 'rad/s' : 'm/s',
      value: endRate(time_s, col, at),
      limit: angular ? tol.angularSpeed_radps : tol.speed_mps,
    });
  });
  return out;
}

/** d/dt at the first or last sample: the derivative of the quadratic through the three end samples. */
export function endRate(time_s: Float64Array, v: Float64Array, at: 'start' | 'end'): number {
  const n = time_s.length;
  if (n < 2) return 0;
  if (n === 2) {
    return ((v[1] as number) - (v[0] as number)) / ((time_s[1] as number) - (time_s[0] as number));
  }
  if (at === 'start') {
    const h1 = (time_s[1] as number) - (time_s[0] as number);
    const h2 = (time_s[2] as number) - (time_s[1] as number);
    return (
      (-(2 * h1 + h2) / (h1 * (h1 + h2))) * (v[0] as number) +
      ((h1 + h2) / (h1 * h2)) * (v[1] as number) -
      (h1 / (h2 * (h1 + h2))) * (v[2] as number)
    );
  }
  const h1 = (time_s[n - 2] as number) - (time_s[n - 3] as number);
  const h2 = (time_s[n - 1] as number) - (time_s[n - 2] as number);
  return (
    (h2 / (h1 * (h1 + h2))) * (v[n - 3] as number) -
    ((h1 + h2) / (h1 * h2)) * (v[n - 2] as number) +
    ((h1 + 2 * h2) / (h2 * (h1 + h2))) * (v[n - 1] as number)
  );
}

/**
 * The startEnd check on a uniform-grid pose track: one use per end (subject "start" or "end", its worst
 * ratio) and a hard finding for an end whose worst quantity is at or over its tolerance. The finding's
 * span is the end sample's interval; value and limit are those of the worst quantity, named with its unit.
 */
export function checkStartEnd(
  time_s: Float64Array,
  rate_hz: number,
  pose: PoseColumns,
  tolerance: StartEndTolerance = DEFAULT_START_END_TOLERANCE,
): { findings: Finding[]; uses: Use[] } {
  const n = time_s.length;
  const findings: Finding[] = [];
  const uses: Use[] = [];
  if (n === 0) return { findings, uses };
  const half = 0.5 / rate_hz;
  for (const at of ['start', 'end'] as const) {
    let worst: EndQuantity | null = null;
    let worstRatio = 0;
    for (const q of endQuantities(time_s, pose, at, tolerance)) {
      const r = Math.abs(q.value) / q.limit;
      if (r > worstRatio || worst === null) {
        worstRatio = r;
        worst = q;
      }
    }
    uses.push({ check: 'startEnd', subject: at, ratio: worstRatio });
    if (worst && worstRatio >= 1) {
      const t = time_s[at === 'start' ? 0 : n - 1] as number;
      findings.push({
        check: 'startEnd',
        severity: CHECK_SEVERITY.startEnd,
        subject: at,
        start_s: t - half,
        end_s: t + half,
        value: Math.abs(worst.value),
        limit: worst.limit,
        ratio: worstRatio,
        quantity: worst.quantity,
        unit: worst.unit,
      });
    }
  }
  return { findings, uses };
}
