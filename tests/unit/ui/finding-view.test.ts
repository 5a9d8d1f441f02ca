// The run page's workbench helpers: the window a finding zooms to, the timeline's lanes and ticks.
import { describe, expect, it } from 'vitest';
import type { Finding } from '../../../shared/schemas/findings';
import {
  findingWindow,
  nearestIndex,
  niceTicks,
  timelineLanes,
} from '../../../src/features/runs/utils/finding-view';

const finding = (over: Partial<Finding>): Finding => ({
  check: 'jerk',
  severity: 'comfort',
  subject: 'z',
  start_s: 0,
  end_s: 0.1,
  value: 30,
  limit: 25,
  ratio: 1.2,
  ...over,
});

describe('finding window', () => {
  it('adds max(0.5 s, half the span) on each side', () => {
    expect(findingWindow({ start_s: 10, end_s: 10.04 })).toEqual({ min: 9.5, max: 10.54 });
    const long = findingWindow({ start_s: 20, end_s: 24 });
    expect(long.min).toBeCloseTo(18, 12);
    expect(long.max).toBeCloseTo(26, 12);
  });
});

describe('timeline lanes', () => {
  it('puts hard-limit lanes first and never lets two marks of one row overlap', () => {
    const findings = [
      finding({ start_s: 1, end_s: 2 }),
      finding({ start_s: 1.5, end_s: 2.5 }),
      finding({ start_s: 3, end_s: 3.1 }),
      finding({ check: 'stroke', severity: 'hard', subject: 'leg3', start_s: 5, end_s: 6 }),
      finding({ subject: 'x', start_s: 0.2, end_s: 0.3 }),
    ];
    const lanes = timelineLanes(findings, 0.1);
    expect(lanes.map((l) => l.first.check + ' ' + l.first.subject)).toEqual([
      'stroke leg3',
      'jerk x',
      'jerk z',
    ]);
    // Hard first; then comfort lanes by their first finding (jerk x at 0.2 s before jerk z at 1 s).
    const jerkZ = lanes[2]!;
    expect(jerkZ.rows).toEqual([[0, 2], [1]]);
    for (const lane of lanes)
      for (const row of lane.rows)
        for (let k = 1; k < row.length; k++)
          expect(findings[row[k]!]!.start_s).toBeGreaterThan(findings[row[k - 1]!]!.end_s + 0.1);
    // Every finding is in exactly one place.
    expect(lanes.flatMap((l) => l.rows.flat()).sort()).toEqual([0, 1, 2, 3, 4]);
  });
});

describe('axis ticks', () => {
  it('steps by 1, 2 or 5 times a power of ten, about `target` ticks at most (the nice-number rule, common practice)', () => {
    // 66 s over 12 ticks is 5.5 s a step: the next nice step is 10 s.
    expect(niceTicks(-3, 63, 12)).toEqual([0, 10, 20, 30, 40, 50, 60]);
    expect(niceTicks(0, 1, 10)).toEqual([0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1]);
    expect(niceTicks(0, 7, 4)).toEqual([0, 2, 4, 6]);
    expect(niceTicks(5, 5)).toEqual([]);
  });

  it('finds the nearest time by bisection', () => {
    const t = [0, 0.5, 1, 1.5, 2];
    expect(nearestIndex(t, 0.74)).toBe(1);
    expect(nearestIndex(t, 0.76)).toBe(2);
    expect(nearestIndex(t, -5)).toBe(0);
    expect(nearestIndex(t, 9)).toBe(4);
  });
});
