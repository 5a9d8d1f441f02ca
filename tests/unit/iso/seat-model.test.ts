// Weighting the seats' specific force through the rigid-body seat model against weighting each seat's
// own signal. On a rigid platform the specific force is affine in the seat position (rigid-body
// kinematics: a_P = a_O + alpha x r + w x (w x r)) and the ISO 2631-1 weightings are linear filters, so
// both must give the same figures to round-off, whatever the seat layout.
import { describe, expect, it } from 'vitest';
import type { CheckInput, SeatForceModel } from '../../../shared/motion/checks';
import { comfortFigures, seatLayoutBasis } from '../../../shared/motion/checks';
import { platformMotion, seatForceFromMotion } from '../../../shared/motion/seat-force';

const rate = 100;
const n = 3000;
const col = (f: (t: number) => number) => Float64Array.from({ length: n }, (_, i) => f(i / rate));
// A brisk rotation and translation, so the seats' signals differ (centripetal and tangential terms).
const pose = {
  rate_hz: rate,
  x_m: col((t) => 0.1 * Math.sin(2.1 * t)),
  y_m: col((t) => 0.08 * Math.sin(3.3 * t + 1)),
  z_m: col((t) => 0.05 * Math.sin(7.7 * t) + 0.02 * Math.sin(19 * t)),
  roll_rad: col((t) => 0.12 * Math.sin(1.7 * t)),
  pitch_rad: col((t) => 0.1 * Math.sin(2.9 * t + 0.4)),
  yaw_rad: col((t) => 0.3 * Math.sin(0.9 * t)),
};
const motion = platformMotion(pose);
const force = (r: [number, number, number]) => {
  const f = seatForceFromMotion(motion, r);
  return [f.x, f.y, f.z] as const;
};

function inputs(seats: [number, number, number][]): { direct: CheckInput; model: CheckInput } {
  const seatForce_mps2 = seats.map(force);
  const origin = force([0, 0, 0]);
  const unit = (r: [number, number, number]) => {
    const f = force(r);
    return f.map((a, k) =>
      a.map((v, i) => v - ((origin[k] as Float64Array)[i] as number)),
    ) as unknown as readonly [Float64Array, Float64Array, Float64Array];
  };
  const seatForceModel: SeatForceModel = {
    origin,
    perMetre: [unit([1, 0, 0]), unit([0, 1, 0]), unit([0, 0, 1])],
    seats_m: seats,
  };
  const direct = { time_s: col((t) => t), rate_hz: rate, seatForce_mps2 } as unknown as CheckInput;
  return { direct, model: { ...direct, seatForceModel } };
}

describe('comfort figures through the seat model', () => {
  it.each([
    [
      'four seats in a plane',
      [
        [0.25, 0.4, 0.9],
        [0.25, -0.4, 0.9],
        [-0.35, 0.4, 0.9],
        [-0.35, -0.4, 0.9],
      ],
      2,
    ],
    [
      'three seats in a row',
      [
        [0.3, -0.5, 0.8],
        [0.3, 0, 0.8],
        [0.3, 0.5, 0.8],
      ],
      1,
    ],
    [
      'six seats on two tiers',
      [
        [0.4, 0.5, 0.8],
        [0.4, -0.5, 0.8],
        [0, 0.5, 1.0],
        [0, -0.5, 1.0],
        [-0.4, 0.5, 1.2],
        [-0.4, -0.5, 1.2],
      ],
      2,
    ],
    [
      'five seats in space',
      [
        [0.4, 0.5, 0.8],
        [0.4, -0.5, 0.9],
        [0, 0, 1.0],
        [-0.4, 0.5, 1.3],
        [-0.3, -0.6, 0.7],
      ],
      3,
    ],
  ] as [string, [number, number, number][], number][])(
    '%s: the same figures as seat by seat',
    (_, seats, dims) => {
      expect(seatLayoutBasis(seats).directions).toHaveLength(dims);
      const { direct, model } = inputs(seats);
      const a = comfortFigures(direct, rate);
      const b = comfortFigures(model, rate);
      expect(a).toBeDefined();
      for (const axis of ['x', 'y', 'z'] as const) {
        expect((b?.wrms_mps2[axis] ?? 0) / (a?.wrms_mps2[axis] ?? 1)).toBeCloseTo(1, 10);
        expect((b?.vdv_mps1_75[axis] ?? 0) / (a?.vdv_mps1_75[axis] ?? 1)).toBeCloseTo(1, 10);
        expect((b?.mtvv_mps2?.[axis] ?? 0) / (a?.mtvv_mps2?.[axis] ?? 1)).toBeCloseTo(1, 10);
        expect(b?.wrmsSeat[axis]).toBe(a?.wrmsSeat[axis]);
      }
      expect((b?.msdvZ_mps1_5 ?? 0) / (a?.msdvZ_mps1_5 ?? 1)).toBeCloseTo(1, 10);
      // The seats do feel different here, so the check compares something.
      const z = direct.seatForce_mps2.map((f) => f[0][1000] as number);
      expect(Math.max(...z) - Math.min(...z)).toBeGreaterThan(1e-3);
    },
  );
});
