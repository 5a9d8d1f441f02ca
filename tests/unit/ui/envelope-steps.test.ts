// The budget editor's envelope chart (envelopeSteps) against the envelope check the worker runs
// (shared/motion/envelope.ts, checkEnvelopeAxis): a level held for T seconds is inside the charted
// band at T exactly when the check finds no use ratio at or over 1.
import { describe, expect, it } from 'vitest';
import { checkEnvelopeAxis } from '../../../shared/motion/envelope';
import { DEMO_BUDGET, REST_G } from '../../../shared/schemas/budget';
import type { EnvelopeRow } from '../../../shared/schemas/budget';
import { envelopeSteps } from '../../../src/features/profiles/components/envelope-chart';

const RATE_HZ = 1000;

/** The band the chart draws for an excursion lasting t (s): the last step at or before t. */
function bandAt(rows: readonly EnvelopeRow[], t: number): [number, number] | null {
  const s = envelopeSteps(rows);
  let k = -1;
  for (let i = 0; i < s.duration_s.length; i++) if ((s.duration_s[i] as number) <= t) k = i;
  if (k < 0) return null;
  return [s.lower_g[k] as number, s.upper_g[k] as number];
}

/** Rest for 1 s, `level_g` for `t_s`, rest for 1 s, checked as the worker checks it. */
function passes(rows: readonly EnvelopeRow[], rest: number, level_g: number, t_s: number): boolean {
  const n0 = RATE_HZ;
  const n1 = Math.round(t_s * RATE_HZ);
  const signal = new Float64Array(2 * n0 + n1).fill(rest);
  signal.fill(level_g, n0, n0 + n1);
  return checkEnvelopeAxis(signal, 0, 1, signal.length, RATE_HZ, rows, rest).ratio < 1;
}

describe('envelope chart steps', () => {
  it('draws the demo rows as a band that narrows at each row duration', () => {
    const s = envelopeSteps(DEMO_BUDGET.envelope.z);
    // Demo z rows: [0, 0.2, 1.8] and [1, 0.5, 1.5]; the duration-0 row starts a decade left of 1 s.
    expect(s.duration_s).toEqual([0.1, 1, 10]);
    expect(s.lower_g).toEqual([0.2, 0.5, 0.5]);
    expect(s.upper_g).toEqual([1.8, 1.5, 1.5]);
  });

  it('agrees with the envelope check for levels held for various durations', () => {
    for (const axis of ['x', 'y', 'z'] as const) {
      const rows = DEMO_BUDGET.envelope[axis];
      const rest = REST_G[axis];
      for (const t of [0.3, 0.7, 1.5, 4]) {
        const band = bandAt(rows, t)!;
        for (const level of [band[0] - 0.05, band[0] + 0.05, band[1] - 0.05, band[1] + 0.05]) {
          const inside = level > band[0] && level < band[1];
          expect(passes(rows, rest, level, t), `${axis} ${level} g for ${t} s`).toBe(inside);
        }
      }
    }
  });

  it('takes the tightest of the rows that apply, in any order', () => {
    const rows: EnvelopeRow[] = [
      [2, -0.3, 0.6],
      [0, -1, 1],
      [0.5, -0.5, 0.4],
    ];
    const s = envelopeSteps(rows);
    expect(s.duration_s).toEqual([0.05, 0.5, 2, 20]);
    expect(s.upper_g).toEqual([1, 0.4, 0.4, 0.4]);
    expect(s.lower_g).toEqual([-1, -0.5, -0.3, -0.3]);
    expect(envelopeSteps([])).toEqual({ duration_s: [], lower_g: [], upper_g: [] });
  });
});
