// The acceleration-duration rule of docs/motion-conventions.md section 5 on signals whose excursions are known by
// construction: "for each row (duration d, lower, upper), the longest continuous time outside
// [lower, upper] must be shorter than d"; d = 0 is an absolute bound (spec section 7).
import { describe, expect, it } from 'vitest';
import type { EnvelopeRow } from '../../../shared/schemas/budget';
import { checkEnvelopeAxis } from '../../../shared/motion/envelope';

const RATE = 100;

/** n samples of `base` with `level` on samples [first, first + count). */
function pulse(n: number, base: number, level: number, first: number, count: number): Float64Array {
  const s = new Float64Array(n).fill(base);
  s.fill(level, first, first + count);
  return s;
}

const X_ROWS: EnvelopeRow[] = [
  [0, -1.0, 1.0],
  [1.0, -0.5, 0.5],
];

describe('envelope rule', () => {
  it('flags an excursion lasting exactly the row duration (the rule asks for strictly shorter)', () => {
    // 100 samples at 100 Hz outside the 1 s row: 100 / 100 = 1.00 s, not shorter than 1 s.
    const s = pulse(500, 0, 0.7, 100, 100);
    const r = checkEnvelopeAxis(s, 0, 1, s.length, RATE, X_ROWS, 0);
    expect(r.violations).toHaveLength(1);
    const v = r.violations[0];
    expect(v).toMatchObject({ row: 1, firstIndex: 100, lastIndex: 199, value: 1, limit: 1, ratio: 1 });
    expect(r.ratio).toBe(1);
  });

  it('passes an excursion one sample shorter than the row duration', () => {
    const s = pulse(500, 0, 0.7, 100, 99);
    const r = checkEnvelopeAxis(s, 0, 1, s.length, RATE, X_ROWS, 0);
    expect(r.violations).toHaveLength(0);
    // 0.99 s of a 1 s row; the absolute row sees 0.7 g of 1 g.
    expect(r.ratio).toBeCloseTo(0.99, 12);
    expect(r.worstRow).toBe(1);
  });

  it('a value exactly on an absolute bound has ratio 1 and is a finding; on a timed row it is inside', () => {
    // Findings are for use ratios at or over 1 (the budget rule); 1.0 g against a 1.0 g bound is ratio 1.
    const onBound = new Float64Array(300).fill(1.0);
    const r = checkEnvelopeAxis(onBound, 0, 1, onBound.length, RATE, [[0, -1, 1]], 0);
    expect(r.ratio).toBe(1);
    expect(r.violations).toHaveLength(1);
    expect(r.violations[0]?.ratio).toBe(1);
    expect(r.violations[0]?.value).toBe(1);
    expect(r.violations[0]?.limit).toBe(1);
    // A timed row asks for strictly less time outside [lower, upper]; the bound itself is inside.
    const timed = checkEnvelopeAxis(onBound, 0, 1, onBound.length, RATE, [[0.5, -1, 1]], 0);
    expect(timed.violations).toHaveLength(0);
    expect(timed.rows[0]?.totalOutside_s).toBe(0);
    const below = new Float64Array(300).fill(0.999);
    expect(checkEnvelopeAxis(below, 0, 1, below.length, RATE, [[0, -1, 1]], 0).violations).toHaveLength(0);
  });

  it('reports the whole time outside a row and the number of excursions: ten 0.4 s dips against 1 s', () => {
    // Ten separate 0.4 s excursions: none breaks a 1 s row (each is shorter), 4 s outside in all.
    const s = new Float64Array(RATE * 30);
    for (let k = 0; k < 10; k++) s.fill(0.7, RATE * (2 + 2.5 * k), RATE * (2 + 2.5 * k) + RATE * 0.4);
    const r = checkEnvelopeAxis(s, 0, 1, s.length, RATE, [[1, -0.5, 0.5]], 0);
    expect(r.violations).toHaveLength(0);
    expect(r.rows[0]?.excursions).toBe(10);
    expect(r.rows[0]?.totalOutside_s).toBeCloseTo(4, 9);
    expect(r.ratio).toBeCloseTo(0.4, 9);
    // One of them lengthened to 1.2 s: a finding, which carries the row's totals.
    s.fill(0.7, RATE * 2, RATE * 3.2);
    const v = checkEnvelopeAxis(s, 0, 1, s.length, RATE, [[1, -0.5, 0.5]], 0).violations;
    expect(v).toHaveLength(1);
    expect(v[0]?.rowExcursions).toBe(10);
    expect(v[0]?.rowOutside_s).toBeCloseTo(4.8, 9);
  });

  it('measures only the longest continuous stretch: a short and a long excursion', () => {
    const s = new Float64Array(1000);
    s.fill(0.6, 100, 150); // 0.5 s outside the 1 s row
    s.fill(-0.6, 400, 550); // 1.5 s outside
    const r = checkEnvelopeAxis(s, 0, 1, s.length, RATE, X_ROWS, 0);
    expect(r.violations.map((v) => [v.firstIndex, v.lastIndex, v.value])).toEqual([[400, 549, 1.5]]);
    expect(r.ratio).toBeCloseTo(1.5, 12);
  });

  it('flags every sample past an absolute bound, with its peak, and measures z from +1 g at rest', () => {
    const z = new Float64Array(400).fill(1);
    z[50] = 1.9; // 0.9 g over rest of the 0.8 g the band allows above rest
    z.fill(0.1, 200, 203); // 0.9 g under rest of the 0.8 g allowed below
    z[201] = 0.05;
    const r = checkEnvelopeAxis(z, 0, 1, z.length, RATE, [[0, 0.2, 1.8]], 1);
    expect(r.violations).toHaveLength(2);
    const [up, down] = r.violations;
    expect(up).toMatchObject({ firstIndex: 50, lastIndex: 50, value: 1.9, limit: 1.8 });
    expect(up?.ratio).toBeCloseTo(0.9 / 0.8, 12);
    expect(down).toMatchObject({ firstIndex: 200, lastIndex: 202, value: 0.05, limit: 0.2 });
    expect(down?.ratio).toBeCloseTo(0.95 / 0.8, 12);
  });

  it('reads a strided (interleaved) signal', () => {
    const n = 500;
    const xyz = new Float64Array(3 * n);
    for (let i = 0; i < n; i++) xyz[3 * i + 2] = 1;
    for (let i = 100; i < 260; i++) xyz[3 * i] = 0.55; // 1.6 s on x
    const r = checkEnvelopeAxis(xyz, 0, 3, n, RATE, X_ROWS, 0);
    expect(r.violations).toHaveLength(1);
    expect(r.violations[0]?.value).toBeCloseTo(1.6, 12);
    const rz = checkEnvelopeAxis(xyz, 2, 3, n, RATE, [[0, 0.2, 1.8]], 1);
    expect(rz.ratio).toBe(0);
  });
});
