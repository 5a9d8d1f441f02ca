import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { fixedColumnsCsv, writeFixed } from '../../../shared/motion/fixed-csv';

// Oracle: ECMAScript's own Number.prototype.toFixed, which the writer must match character for character.
function viaToFixed(header: string, time_s: Float64Array, cols: Float64Array[], td: number, d: number) {
  const lines = [header];
  for (let i = 0; i < time_s.length; i++) {
    const row = [(time_s[i] as number).toFixed(td)];
    for (const c of cols) {
      const t = (c[i] as number).toFixed(d);
      row.push(/^-[0.]+$/.test(t) ? t.slice(1) : t);
    }
    lines.push(row.join(','));
  }
  return `${lines.join('\n')}\n`;
}

const text = (v: number, digits: number) => {
  const b = new Uint8Array(64);
  return new TextDecoder('latin1').decode(b.subarray(0, writeFixed(b, 0, v, digits, 10 ** digits)));
};

describe('fixed-point CSV writer', () => {
  it('prints every double as toFixed does, ties and edge values included', () => {
    fc.assert(
      fc.property(fc.double(), fc.integer({ min: 0, max: 12 }), (v, d) => {
        expect(text(v, d)).toBe(v.toFixed(d));
      }),
      { numRuns: 5000 },
    );
    // Values on and next to the half-way points of the last printed digit, where a product rounded in
    // floating point could round the other way.
    fc.assert(
      fc.property(
        fc.integer({ min: -9e9, max: 9e9 }),
        fc.constantFrom(6, 9),
        fc.integer({ min: -3, max: 3 }),
        (k, d, nudge) => {
          const v = (k + 0.5) / 10 ** d + nudge * Number.EPSILON;
          expect(text(v, d)).toBe(v.toFixed(d));
        },
      ),
      { numRuns: 5000 },
    );
    for (const v of [
      0,
      -0,
      1e-10,
      -1e-10,
      5e-10,
      -5e-10,
      2 ** 33 / 1e9,
      8589.934592,
      1e21,
      -1e21,
      NaN,
      Infinity,
      -Infinity,
    ])
      for (const d of [0, 6, 9]) expect(text(v, d)).toBe(v.toFixed(d));
  });

  it('prints integer parts from 2^31 up to 2^33 and ten or more decimals as toFixed does', () => {
    // Oracle: Number.prototype.toFixed. These take the writer's floating-point digit loops rather
    // than its 32-bit ones.
    fc.assert(
      fc.property(
        fc.double({ min: 2 ** 31 - 2, max: 2 ** 33, noNaN: true }),
        fc.boolean(),
        fc.integer({ min: 0, max: 2 }),
        (v, neg, d) => {
          const x = neg ? -v : v;
          expect(text(x, d)).toBe(x.toFixed(d));
        },
      ),
      { numRuns: 3000 },
    );
    fc.assert(
      fc.property(fc.double({ min: -8, max: 8, noNaN: true }), fc.integer({ min: 9, max: 12 }), (v, d) => {
        expect(text(v, d)).toBe(v.toFixed(d));
      }),
      { numRuns: 3000 },
    );
    for (const v of [2 ** 31 - 1, 2 ** 31, 2 ** 31 + 0.5, 2 ** 32 - 0.25, 999_999_999.9999, 1_000_000_000])
      for (const d of [0, 1, 2]) expect(text(v, d)).toBe(v.toFixed(d));
  });

  it('writes whole files as toFixed rows would, over several blocks, with minus zero as zero', () => {
    const n = 9000;
    const time = new Float64Array(n).map((_, i) => i / 100);
    const a = new Float64Array(n).map((_, i) => Math.sin(i) * 2.3);
    const b = new Float64Array(n).map((_, i) => (i % 5 === 0 ? -1e-12 : Math.cos(i * 0.37) * 1e-4));
    const out = fixedColumnsCsv('time_s,a,b', time, [a, b], 6, 9);
    expect(out).toBe(viaToFixed('time_s,a,b', time, [a, b], 6, 9));
    expect(out.split('\n')[1]).toBe('0.000000,0.000000000,0.000000000');
    expect(fixedColumnsCsv('h', new Float64Array(0), [], 6, 9)).toBe('h\n');
  });
});
