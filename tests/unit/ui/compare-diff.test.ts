// The run comparison's pure rules: which selections may be compared, the budget rows side by side
// with their change from the first run, and the alignment of each run's own time axis.
import { describe, expect, it } from 'vitest';
import type { Finding, Use } from '../../../shared/schemas/findings';
import { ratioTone } from '../../../src/components/charts/run-badges';
import {
  alignOnSharedAxis,
  bucketAt,
  budgetRows,
  compareSelection,
  deltaText,
  findingCounts,
  legsComparable,
  parseRunIds,
  sharedKeys,
} from '../../../src/features/compare/utils/compare-diff';

const run = (id: string, takeId: string, takeNumber: number, state = 'awaiting_review') => ({
  id,
  takeId,
  takeNumber,
  state,
});

describe('compareSelection', () => {
  it('needs two or more finished runs of one take, and says why not', () => {
    expect(compareSelection([]).ok).toBe(false);
    expect(compareSelection([run('a', 't1', 1)]).reason).toMatch(/at least one more/);
    const twoTakes = compareSelection([run('a', 't1', 1), run('b', 't2', 2)]);
    expect(twoTakes).toEqual({ ok: false, reason: expect.stringMatching(/different takes \(1, 2\)/) });
    const cueing = compareSelection([run('a', 't1', 1), run('b', 't1', 1, 'cueing')]);
    expect(cueing.ok).toBe(false);
    expect(cueing.reason).toMatch(/no result/);
    expect(compareSelection([run('a', 't1', 1), run('b', 't1', 1, 'held')])).toEqual({
      ok: true,
      reason: 'Compare 2 runs of take 1.',
    });
    const five = ['a', 'b', 'c', 'd', 'e'].map((id) => run(id, 't1', 1));
    expect(compareSelection(five).reason).toMatch(/at most 4/);
  });
});

describe('parseRunIds', () => {
  it('keeps the order and drops blanks and repeats', () => {
    expect(parseRunIds(' a,b,,a , c')).toEqual(['a', 'b', 'c']);
    expect(parseRunIds(null)).toEqual([]);
  });
});

const use = (check: Use['check'], subject: string, ratio: number, axis?: Use['axis']): Use =>
  axis ? { check, subject, ratio, axis } : { check, subject, ratio };
const finding = (
  f: Partial<Finding> & Pick<Finding, 'check' | 'subject' | 'limit' | 'severity'>,
): Finding => ({
  start_s: 1,
  end_s: 2,
  value: f.limit * 1.1,
  ratio: 1.1,
  ...f,
});

describe('budgetRows', () => {
  const a = {
    uses: [use('stroke', 'leg1', 0.5), use('jerk', 'seat1', 0.79, 'z'), use('jerk', 'seat1', 0.3, 'z')],
    findings: [],
  };
  const b = {
    uses: [use('stroke', 'leg1', 0.45), use('jerk', 'seat1', 1.1, 'z'), use('wrms', 'seat1', 0.2, 'x')],
    findings: [finding({ check: 'jerk', subject: 'seat1', axis: 'z', limit: 12, severity: 'comfort' })],
  };

  it('puts each check and subject on one row with every run’s worst use and its change from the first', () => {
    const rows = budgetRows([a, b]);
    const jerk = rows.find((r) => r.check === 'jerk');
    // The first run reports jerk on seat 1 z twice; its worst (0.79) is the one compared.
    expect(jerk?.ratios).toEqual([0.79, 1.1]);
    expect(jerk?.deltas[1]).toBeCloseTo(1.1 - 0.79, 12);
    expect(jerk?.limits).toEqual([null, 12]);
    expect(jerk?.values).toEqual([null, null]);
    // Largest use first.
    expect(rows.map((r) => r.worst)).toEqual([...rows.map((r) => r.worst)].sort((x, y) => y - x));
    const stroke = rows.find((r) => r.check === 'stroke');
    expect(stroke?.deltas[1]).toBeCloseTo(0.45 - 0.5, 12);
    // A check only the second run reports has no change to show.
    const wrms = rows.find((r) => r.check === 'wrms');
    expect(wrms?.ratios).toEqual([null, 0.2]);
    expect(wrms?.deltas).toEqual([null, null]);
  });

  it('takes each run’s worst value and limit from its use, the limit of a finding only where the use has none', () => {
    const rows = budgetRows([
      { uses: [{ check: 'legSpeed', subject: 'leg2', ratio: 0.5, value: 0.2, limit: 0.4 }], findings: [] },
      {
        uses: [
          { check: 'legSpeed', subject: 'leg2', ratio: 0.25, value: 0.1, limit: 0.4 },
          { check: 'legSpeed', subject: 'leg2', ratio: 0.75, value: 0.3, limit: 0.4 },
        ],
        findings: [],
      },
    ]);
    expect(rows[0]?.values).toEqual([0.2, 0.3]);
    expect(rows[0]?.limits).toEqual([0.4, 0.4]);
  });

  it('names a move into another tier with the same bands as the app’s use bars', () => {
    const rows = budgetRows([a, b]);
    const jerk = rows.find((r) => r.check === 'jerk');
    expect([ratioTone(0.79), ratioTone(1.1)]).toEqual(['ok', 'over']);
    expect(jerk?.shifts[1]).toBe('worse');
    expect(rows.find((r) => r.check === 'stroke')?.shifts[1]).toBe('same');
    const down = budgetRows([
      { uses: [use('legSpeed', 'leg2', 0.85)], findings: [] },
      { uses: [use('legSpeed', 'leg2', 0.5)], findings: [] },
    ]);
    expect(down[0]?.shifts[1]).toBe('better');
  });

  it('shows no change on actuator checks when the runs play on different bases', () => {
    const rows = budgetRows([a, b], { legsComparable: false });
    const stroke = rows.find((r) => r.check === 'stroke');
    expect(stroke?.ratios).toEqual([0.5, 0.45]);
    expect(stroke?.deltas).toEqual([null, null]);
    expect(rows.find((r) => r.check === 'jerk')?.deltas[1]).toBeCloseTo(1.1 - 0.79, 12);
  });
});

describe('small words and counts', () => {
  it('writes a change with its direction, rounded to the hundredth', () => {
    expect(deltaText(0.123)).toBe('▲ +0.12');
    expect(deltaText(-0.05)).toBe('▼ −0.05');
    expect(deltaText(0.004)).toBe('= 0.00');
  });
  it('counts hard and comfort findings', () => {
    expect(findingCounts([{ severity: 'hard' }, { severity: 'comfort' }, { severity: 'comfort' }])).toEqual({
      hard: 1,
      comfort: 2,
    });
  });
  it('compares legs only on one venue, and pose axes every base has', () => {
    const dome = { venueId: 'v1', venueName: 'Dome', legCount: 6 };
    expect(legsComparable([dome, dome]).ok).toBe(true);
    const mixed = legsComparable([dome, { venueId: 'v2', venueName: 'Arcade', legCount: 3 }]);
    expect(mixed.ok).toBe(false);
    expect(mixed.reason).toContain('Dome, Arcade');
    expect(
      sharedKeys([
        ['x_m', 'z_m', 'yaw_rad'],
        ['yaw_rad', 'x_m', 'y_m'],
      ]),
    ).toEqual({
      shared: ['x_m', 'yaw_rad'],
      notShared: ['z_m', 'y_m'],
    });
  });
});

// A deterministic pseudo-random sequence (a linear congruential generator, Numerical Recipes' constants).
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

describe('time axes', () => {
  it('finds the bucket of an instant as a linear scan with Array.findLastIndex does', () => {
    const rand = lcg(7);
    for (let trial = 0; trial < 50; trial++) {
      const axis: number[] = [];
      let t = rand() * 3;
      for (let i = 0; i < 1 + Math.floor(rand() * 40); i++) {
        axis.push(t);
        t += 0.01 + rand();
      }
      const last = axis[axis.length - 1] ?? 0;
      for (let q = 0; q < 20; q++) {
        const at = (axis[0] ?? 0) - 1 + rand() * (last - (axis[0] ?? 0) + 2);
        const scan = at > last ? -1 : axis.findLastIndex((x) => x <= at);
        expect(bucketAt(axis, at)).toBe(scan < 0 ? null : scan);
      }
      // Every bucket start is its own bucket.
      axis.forEach((x, i) => expect(bucketAt(axis, x)).toBe(i));
    }
    expect(bucketAt([], 1)).toBeNull();
  });

  it('places every run’s values at its own instants on the shared axis, null elsewhere', () => {
    const axisA = [0, 0.5, 1, 1.5];
    const axisB = [0, 0.4, 1.2, 1.6, 2];
    const a = [[1, 2, 3, 4]];
    const b = [[10, 20, 30, 40, 50]];
    const { x, columns } = alignOnSharedAxis([axisA, axisB], [a, b]);
    expect(x).toEqual([0, 0.4, 0.5, 1, 1.2, 1.5, 1.6, 2]);
    axisA.forEach((t, i) => expect(columns[0]?.[0]?.[x.indexOf(t)]).toBe(a[0]?.[i]));
    axisB.forEach((t, i) => expect(columns[1]?.[0]?.[x.indexOf(t)]).toBe(b[0]?.[i]));
    expect(columns[0]?.[0]?.filter((v) => v === null)).toHaveLength(x.length - axisA.length);
  });
});
