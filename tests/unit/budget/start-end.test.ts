// The startEnd check: a track must start and end at neutral and at rest (a controller takes the first
// sample as it is, so an offset or a speed there is a jump). Expected values come from the motions'
// closed forms: a held offset reads itself, and d/dt [a sin(w (t - T))] at t = T is a w (textbook).
import { describe, expect, it } from 'vitest';
import { processTrack } from '../../../shared/motion/process';
import { checkStartEnd, endRate } from '../../../shared/motion/start-end';
import { DEFAULT_START_END_TOLERANCE, budgetSchema } from '../../../shared/schemas/budget';
import { checkResultSchema } from '../../../shared/schemas/findings';
import { demoHexapodBase } from '../../../shared/schemas/motion-base';
import { makeBudget, makePoseTrackFrom, smoothStep } from './track-builders';

const base = demoHexapodBase;
const RATE = base.controllerRate_hz;
const DEG = Math.PI / 180;
const tol = DEFAULT_START_END_TOLERANCE;

const startEnd = (r: ReturnType<typeof processTrack>) =>
  r.check.findings.filter((f) => f.check === 'startEnd');

describe('startEnd', () => {
  it('a track at neutral and at rest at both ends has no startEnd finding and uses 0', () => {
    // Moves in the middle (a heave bump), still at both ends.
    const track = makePoseTrackFrom(RATE, 10, (t) => [
      0,
      0,
      0.1 * (smoothStep(t, 2, 4) - smoothStep(t, 6, 8)),
      0,
      0,
      0,
    ]);
    const r = processTrack({ track, base, budget: makeBudget({}) });
    expect(startEnd(r)).toEqual([]);
    const uses = r.check.uses.filter((u) => u.check === 'startEnd');
    expect(uses.map((u) => u.subject)).toEqual(['start', 'end']);
    // The anti-alias low-pass (pass-band ripple 3e-4) leaves the ends still to within a few 1e-5 of a tolerance.
    for (const u of uses) expect(u.ratio).toBeLessThan(1e-3);
    expect(r.exitCode).toBe(0);
  });

  it('a track starting at 0.2 m surge is a hard finding at the start naming x', () => {
    const track = makePoseTrackFrom(RATE, 10, (t) => [0.2 * (1 - smoothStep(t, 2, 6)), 0, 0, 0, 0, 0]);
    const r = processTrack({ track, base, budget: makeBudget({}) });
    const f = startEnd(r);
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({
      check: 'startEnd',
      severity: 'hard',
      subject: 'start',
      quantity: 'x',
      unit: 'm',
      limit: tol.position_m,
    });
    // Within 1e-6 m: the anti-alias low-pass passes a held offset to within its pass-band ripple.
    expect(f[0]?.value).toBeCloseTo(0.2, 6);
    expect(f[0]?.ratio).toBeCloseTo(0.2 / tol.position_m, 4);
    expect(f[0]?.start_s).toBeCloseTo(-0.5 / RATE, 12);
    expect(f[0]?.end_s).toBeCloseTo(0.5 / RATE, 12);
    expect(r.exitCode).toBe(4);
    expect(checkResultSchema.safeParse(r.findings).success).toBe(true);
  });

  it('a track starting at 10 deg pitch is a hard finding at the start naming pitch, in rad', () => {
    const track = makePoseTrackFrom(RATE, 10, (t) => [0, 0, 0, 0, 10 * DEG * (1 - smoothStep(t, 2, 6)), 0]);
    const r = processTrack({ track, base, budget: makeBudget({}) });
    const f = startEnd(r);
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ subject: 'start', quantity: 'pitch', unit: 'rad', severity: 'hard' });
    expect(f[0]?.value).toBeCloseTo(10 * DEG, 6);
    expect(f[0]?.ratio).toBeCloseTo((10 * DEG) / tol.angle_rad, 4);
    expect(r.exitCode).toBe(4);
  });

  it('a track still moving at the end (back at neutral, but with speed) is a hard finding at the end', () => {
    // x = a sin(w (t - T)) faded in: x(T) = 0, dx/dt(T) = a w = 0.0628 m/s against 0.01 m/s.
    const T = 10;
    const a = 0.02;
    const w = 2 * Math.PI * 0.5;
    const track = makePoseTrackFrom(RATE, T, (t) => [
      a * Math.sin(w * (t - T)) * smoothStep(t, 2, 5),
      0,
      0,
      0,
      0,
      0,
    ]);
    const r = processTrack({ track, base, budget: makeBudget({}) });
    const f = startEnd(r);
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ subject: 'end', quantity: 'x rate', unit: 'm/s', limit: tol.speed_mps });
    // The one-sided three-point derivative errs by about (w h)^2 / 3 relative: 3e-4 here.
    expect((f[0]?.value as number) / (a * w)).toBeCloseTo(1, 3);
    expect(f[0]?.end_s).toBeCloseTo(T + 0.5 / RATE, 9);
    expect(r.exitCode).toBe(4);
  });

  it('a vehicle at rest and level, cued by the default washout, stays at neutral: no finding', () => {
    const n = 5 * RATE + 1;
    const time_s = Float64Array.from({ length: n }, (_, i) => i / RATE);
    const cols = [0, 0, 9.80665, 0, 0, 0].map((v) => new Float64Array(n).fill(v));
    const r = processTrack({
      track: {
        kind: 'vehicle',
        layout: 'vehicle',
        length: n,
        time_s,
        names: ['fx_mps2', 'fy_mps2', 'fz_mps2', 'wx_radps', 'wy_radps', 'wz_radps'],
        columns: cols,
      },
      base,
      budget: makeBudget({}),
    });
    expect(startEnd(r)).toEqual([]);
  });

  it('the tolerances come from the budget; a value exactly at the tolerance is a finding (ratio 1)', () => {
    const n = 11;
    const time_s = Float64Array.from({ length: n }, (_, i) => i / 10);
    const zero = () => new Float64Array(n);
    const pose = {
      x_m: zero(),
      y_m: zero(),
      z_m: zero(),
      roll_rad: zero(),
      pitch_rad: zero(),
      yaw_rad: zero(),
    };
    pose.y_m.fill(0.25); // held: rate 0
    const custom = { position_m: 0.25, angle_rad: 0.1, speed_mps: 0.1, angularSpeed_radps: 0.1 };
    const r = checkStartEnd(time_s, 10, pose, custom);
    expect(r.findings.map((f) => [f.subject, f.quantity, f.ratio])).toEqual([
      ['start', 'y', 1],
      ['end', 'y', 1],
    ]);
    expect(checkStartEnd(time_s, 10, pose, { ...custom, position_m: 0.3 }).findings).toEqual([]);
  });

  it('the end rate is exact for a quadratic on an uneven grid', () => {
    const time_s = Float64Array.of(0, 0.1, 0.25, 0.3, 0.6);
    const v = time_s.map((t) => 3 * t * t - 2 * t + 1);
    expect(endRate(time_s, v, 'start')).toBeCloseTo(-2, 12);
    expect(endRate(time_s, v, 'end')).toBeCloseTo(6 * 0.6 - 2, 12);
  });

  it('the budget schema takes a startEnd block and refuses a tolerance that is not positive', () => {
    const budget = makeBudget({});
    expect(budgetSchema.safeParse({ ...budget, startEnd: tol }).success).toBe(true);
    const bad = budgetSchema.safeParse({ ...budget, startEnd: { ...tol, speed_mps: 0 } });
    expect(bad.success).toBe(false);
    expect(JSON.stringify(bad.error?.issues)).toContain('startEnd.speed_mps must be greater than 0');
  });
});
