// Take touch-up: each operation checked against its own definition on synthetic takes (gain scales
// the departure from rest, the offset shifts time, the trim cuts, the fades start and end at rest,
// the smoothing is a zero-phase 2nd-order Butterworth whose gain at a tone is |H(f)|^2 of the
// Audio EQ Cookbook low-pass, R. Bristow-Johnson).
import { describe, expect, it } from 'vitest';
import { TouchupError, applyTouchup } from '../../../shared/motion/touchup';
import { digitalMagnitude, lowPass2 } from '../../../shared/motion/filters';
import type { Track } from '../../../shared/motion/track-reader';
import { touchupSchema } from '../../../shared/schemas/touchup';
import { G0_MPS2 } from '../../../shared/motion/units';

const VEHICLE = ['fx_mps2', 'fy_mps2', 'fz_mps2', 'wx_radps', 'wy_radps', 'wz_radps'];
const POSE = ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'];

function makeTrack(
  kind: 'vehicle' | 'pose',
  rate_hz: number,
  duration_s: number,
  f: (name: string, t: number) => number,
): Track {
  const n = Math.round(duration_s * rate_hz) + 1;
  const time_s = Float64Array.from({ length: n }, (_, i) => i / rate_hz);
  const names = kind === 'vehicle' ? VEHICLE : POSE;
  return {
    kind,
    layout: kind === 'vehicle' ? 'vehicle' : 'hexapod',
    length: n,
    time_s,
    names,
    columns: names.map((name) => time_s.map((t) => f(name, t))),
  };
}

const col = (tr: Track, name: string) => tr.columns[tr.names.indexOf(name)] as Float64Array;
const tu = (v: unknown) => touchupSchema.parse(v);

// A vehicle take: 1 m/s^2 of surge, a heave bump around gravity, a slow yaw rate.
const vehicle = () =>
  makeTrack('vehicle', 100, 10, (name, t) =>
    name === 'fx_mps2' ? 1 : name === 'fz_mps2' ? G0_MPS2 + 0.5 * Math.sin(t) : name === 'wz_radps' ? 0.1 : 0,
  );

describe('take touch-up', () => {
  it('gain scales the departure from rest, never gravity', () => {
    const out = applyTouchup(vehicle(), tu({ gain: { fx: 0.5, fz: 2 } }));
    expect(col(out, 'fx_mps2')[300]).toBeCloseTo(0.5, 12);
    // fz' = g0 + 2 (fz - g0): at t = 3 s, fz - g0 = 0.5 sin 3.
    expect(col(out, 'fz_mps2')[300]).toBeCloseTo(G0_MPS2 + Math.sin(3), 12);
    expect(col(out, 'wz_radps')[300]).toBe(0.1);
  });

  it('offset shifts every sample by offset_s and keeps the values', () => {
    const src = vehicle();
    const out = applyTouchup(src, tu({ offset_s: 2.5 }));
    expect(out.time_s[0]).toBe(2.5);
    expect(out.time_s[out.length - 1]).toBeCloseTo(12.5, 12);
    expect(col(out, 'fz_mps2')).toEqual(col(src, 'fz_mps2'));
  });

  it('trim cuts to [trimIn, trimOut] after the offset, ends interpolated', () => {
    const out = applyTouchup(vehicle(), tu({ offset_s: 1, trimIn_s: 2.005, trimOut_s: 6 }));
    expect(out.time_s[0]).toBe(2.005);
    expect(out.time_s[out.length - 1]).toBe(6);
    // Source time = trimmed time - offset; the ends lie on the straight line between samples.
    const fz0 = col(out, 'fz_mps2')[0] as number;
    const a = G0_MPS2 + 0.5 * Math.sin(1.0);
    const b = G0_MPS2 + 0.5 * Math.sin(1.01);
    expect(fz0).toBeCloseTo((a + b) / 2, 12);
    for (let i = 1; i < out.length; i++) expect(out.time_s[i]).toBeGreaterThan(out.time_s[i - 1] as number);
    expect(out.length).toBe(401);
  });

  it('fades start and end exactly at rest and leave the middle alone', () => {
    const out = applyTouchup(vehicle(), tu({ fadeIn_s: 1, fadeOut_s: 2 }));
    const fx = col(out, 'fx_mps2');
    const fz = col(out, 'fz_mps2');
    expect(fx[0]).toBe(0);
    expect(fx[out.length - 1]).toBe(0);
    expect(fz[0]).toBe(G0_MPS2);
    expect(fz[out.length - 1]).toBe(G0_MPS2);
    // Half-way through the 1 s raised-cosine fade-in the weight is 0.5.
    expect(fx[50]).toBeCloseTo(0.5, 12);
    expect(fx[500]).toBe(1);
    expect(col(out, 'wz_radps')[out.length - 101]).toBeCloseTo(0.1 * 0.5, 12);
  });

  it('smoothing passes a slow tone and attenuates a fast one by |H|^2 of the 2nd-order Butterworth', () => {
    const rate = 200;
    const cutoff = 2;
    const take = makeTrack('pose', rate, 40, (name, t) =>
      name === 'z_m' ? 0.01 * Math.sin(2 * Math.PI * 0.2 * t) + 0.01 * Math.sin(2 * Math.PI * 10 * t) : 0,
    );
    const out = applyTouchup(take, tu({ smoothing_hz: { z: cutoff } }));
    const z = col(out, 'z_m');
    const h10 = digitalMagnitude(lowPass2(cutoff, Math.SQRT1_2, rate), 10) ** 2;
    const h02 = digitalMagnitude(lowPass2(cutoff, Math.SQRT1_2, rate), 0.2) ** 2;
    // Away from the ends, the output is h02 x slow + h10 x fast, in phase (zero-phase filtering).
    let worst = 0;
    for (let i = 2000; i < 6000; i++) {
      const t = i / rate;
      const want = 0.01 * h02 * Math.sin(2 * Math.PI * 0.2 * t) + 0.01 * h10 * Math.sin(2 * Math.PI * 10 * t);
      worst = Math.max(worst, Math.abs((z[i] as number) - want));
    }
    expect(h10).toBeLessThan(0.05);
    expect(worst).toBeLessThan(1e-5);
  });

  it('names a setting that does not fit the track', () => {
    expect(() => applyTouchup(vehicle(), tu({ gain: { roll: 2 } }))).toThrow(
      /gain\.roll: this vehicle track has no roll axis/,
    );
    expect(() => applyTouchup(vehicle(), tu({ smoothing_hz: { fx: 60 } }))).toThrow(TouchupError);
    expect(() => applyTouchup(vehicle(), tu({ trimIn_s: 50 }))).toThrow(/trimIn_s/);
    expect(touchupSchema.safeParse({ trimIn_s: 5, trimOut_s: 2 }).success).toBe(false);
    expect(touchupSchema.safeParse({ gain: { fq: 1 } }).success).toBe(false);
  });
});
