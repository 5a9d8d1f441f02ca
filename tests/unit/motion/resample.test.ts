import { describe, expect, it } from 'vitest';
import { resampleLinear, resampleTrack, uniformGridLength } from '../../../shared/motion/resample';
import { derivative } from '../../../shared/motion/track-derivative';
import { parseTrackText } from '../../../shared/motion/track-reader';

describe('resampling to a controller rate', () => {
  it('puts the grid at t0 + k / rate up to the last sample', () => {
    // Source: hand count; 0..2 s at 100 Hz is 201 points, 0.5..1.2345 s at 10 Hz is 0.5, 0.6, .., 1.2 (8 points).
    expect(uniformGridLength(0, 2, 100)).toBe(201);
    expect(uniformGridLength(0.5, 1.2345, 10)).toBe(8);
    expect(() => uniformGridLength(0, 1, 0)).toThrow(/rate must be positive/);
  });

  it('reproduces a linear signal exactly from uneven samples', () => {
    // Source: linear interpolation is exact for straight lines.
    const t = Float64Array.of(0, 0.013, 0.05, 0.051, 0.2, 0.31);
    const y = t.map((v) => 3 - 2 * v);
    const r = resampleLinear(t, [y], 100);
    expect(r.time_s.length).toBe(32);
    r.time_s.forEach((tk, k) => {
      expect(tk).toBeCloseTo(k / 100, 14);
      expect(r.columns[0]![k]).toBeCloseTo(3 - 2 * tk, 13);
    });
  });

  it('interpolates between samples by hand values', () => {
    // Source: hand calculation; halfway between 1 and 3 is 2, a quarter of the way from 3 to -1 is 2.
    const r = resampleLinear(Float64Array.of(0, 1, 2), [Float64Array.of(1, 3, -1)], 4);
    expect(Array.from(r.columns[0]!)).toEqual([1, 1.5, 2, 2.5, 3, 2, 1, 0, -1]);
  });

  it('keeps kind, layout and names of a track', () => {
    const track = parseTrackText('time_s,x_m,y_m,yaw_deg\n0,0,0,0\n0.1,1,1,10\n', { file: 'p.csv' });
    const r = resampleTrack(track, 100);
    expect([r.kind, r.layout, r.length]).toEqual(['pose', 'planar3', 11]);
    expect(r.names).toEqual(['x_m', 'y_m', 'yaw_rad']);
    expect(r.columns[2]![5]).toBeCloseTo((5 * Math.PI) / 180, 14);
  });
});

describe('derivative on uneven grids', () => {
  it('is exact for quadratics, interior and ends', () => {
    // Source: the three-point formulas are exact for polynomials of degree 2 (numerical analysis texts).
    const t = Float64Array.of(0, 0.1, 0.25, 0.3, 0.7, 0.71, 1.2);
    const y = t.map((v) => 2 * v * v - 3 * v + 1);
    const d = derivative(t, y);
    t.forEach((v, i) => expect(d[i]).toBeCloseTo(4 * v - 3, 10));
  });
});
