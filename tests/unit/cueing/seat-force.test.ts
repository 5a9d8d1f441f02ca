import { Euler, Matrix4, Vector3 } from 'three';
import { describe, expect, it } from 'vitest';
import type { PoseOffsetTrack } from '../../../shared/motion/seat-force';
import { platformMotion, seatForceFromMotion, seatSpecificForce } from '../../../shared/motion/seat-force';
import { G0_MPS2 } from '../../../shared/motion/units';

type PoseFn = (t: number) => [number, number, number, number, number, number];

function track(rate_hz: number, duration_s: number, fn: PoseFn): PoseOffsetTrack {
  const n = Math.round(duration_s * rate_hz) + 1;
  const cols = Array.from({ length: 6 }, () => new Float64Array(n));
  for (let i = 0; i < n; i++) {
    const v = fn(i / rate_hz);
    for (let c = 0; c < 6; c++) cols[c]![i] = v[c]!;
  }
  const [x_m, y_m, z_m, roll_rad, pitch_rad, yaw_rad] = cols as [
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
    Float64Array,
  ];
  return { rate_hz, x_m, y_m, z_m, roll_rad, pitch_rad, yaw_rad };
}

/** three.js rotation R = Rz Ry Rx (Euler order 'ZYX', Matrix4.makeRotationFromEuler), independent of rotation.ts. */
function threeRotation(roll: number, pitch: number, yaw: number): Matrix4 {
  return new Matrix4().makeRotationFromEuler(new Euler(roll, pitch, yaw, 'ZYX'));
}

/**
 * Specific force at a seat by differentiating the seat's own base-frame trajectory p(t) + R(t) r twice
 * (central difference, step h) with three.js rotations, then f = R^T (a - g). A second route to the
 * rigid-body formula the module implements.
 */
function seatForceByTrajectory(fn: PoseFn, r: Vector3, t: number, h = 1e-4): Vector3 {
  const at = (tt: number) => {
    const [x, y, z, roll, pitch, yaw] = fn(tt);
    return r
      .clone()
      .applyMatrix4(threeRotation(roll, pitch, yaw))
      .add(new Vector3(x, y, z));
  };
  const a = at(t + h)
    .add(at(t - h))
    .sub(at(t).multiplyScalar(2))
    .divideScalar(h * h);
  a.z += G0_MPS2; // a - g with g = (0, 0, -g0)
  const [, , , roll, pitch, yaw] = fn(t);
  return a.applyMatrix4(threeRotation(roll, pitch, yaw).transpose());
}

describe('seat specific force', () => {
  it('is exactly (0, 0, +g0) at neutral and at rest, at any seat', () => {
    // docs/motion-conventions.md section 3: at rest and level f = (0, 0, +g0).
    const f = seatSpecificForce(
      track(100, 2, () => [0, 0, 0, 0, 0, 0]),
      [0.4, -0.3, 0.9],
    );
    for (let i = 0; i < f.x.length; i++) {
      expect(f.x[i]).toBe(0);
      expect(f.y[i]).toBe(0);
      expect(f.z[i]).toBe(G0_MPS2);
    }
  });

  it('a static pitch tilts gravity into the seat axes: f_x = -g0 sin(pitch)', () => {
    // Physics: f = R^T (0, 0, g0); three.js supplies R for the comparison.
    const pitch = 0.12;
    const f = seatSpecificForce(
      track(100, 1, () => [0, 0, 0, 0, pitch, 0]),
      [0.2, 0.1, 1],
    );
    const expected = new Vector3(0, 0, G0_MPS2).applyMatrix4(threeRotation(0, pitch, 0).transpose());
    // 1e-11 m/s^2: the derivative filters' 49-tap sums of a constant leave round-off of that order.
    expect(f.x[50]).toBeCloseTo(expected.x, 11);
    expect(f.x[50]).toBeCloseTo(-G0_MPS2 * Math.sin(pitch), 11);
    expect(f.z[50]).toBeCloseTo(expected.z, 11);
  });

  it('a steady yaw spin gives the centripetal force -W^2 rho toward the axis', () => {
    // Physics: uniform circular motion, a = W^2 rho toward the centre.
    const W = 0.5;
    const rho = 0.8;
    const f = seatSpecificForce(
      track(100, 4, (t) => [0, 0, 0, 0, 0, W * t]),
      [rho, 0, 0.9],
    );
    for (const i of [0, 100, 200, 400]) {
      expect(f.x[i]).toBeCloseTo(-W * W * rho, 9);
      expect(f.y[i]).toBeCloseTo(0, 9);
      expect(f.z[i]).toBeCloseTo(G0_MPS2, 12);
    }
  });

  it('a heave sine gives f_z = g0 - A w^2 sin(w t) to O(dt^2)', () => {
    // Closed form of the second derivative of A sin(w t).
    const A = 0.05;
    const w = 2 * Math.PI * 1.5;
    const f = seatSpecificForce(
      track(500, 2, (t) => [0, 0, A * Math.sin(w * t), 0, 0, 0]),
      [0, 0, 1],
    );
    for (let i = 0; i < f.z.length; i += 37) {
      expect(f.z[i]).toBeCloseTo(G0_MPS2 - A * w * w * Math.sin((w * i) / 500), 3);
    }
  });

  it('matches the seat trajectory differentiated directly, for combined translation and rotation', () => {
    // Second route: double-differentiated seat position with three.js rotations (seatForceByTrajectory).
    const fn: PoseFn = (t) => [
      0.1 * Math.sin(1.3 * t),
      0.05 * Math.cos(0.7 * t),
      0.04 * Math.sin(2.1 * t),
      0.08 * Math.sin(0.9 * t),
      0.1 * Math.sin(1.1 * t + 0.4),
      0.15 * Math.sin(0.5 * t),
    ];
    const rate = 1000;
    const seat = new Vector3(0.6, -0.4, 1.1);
    const f = seatSpecificForce(track(rate, 6, fn), [seat.x, seat.y, seat.z]);
    for (const i of [0, 1, 500, 1700, 3000, 4250, 5999, 6000]) {
      const e = seatForceByTrajectory(fn, seat, i / rate);
      // O(dt^2) finite differences everywhere, one-sided at the ends (observed about 1e-7 here).
      expect(Math.abs(f.x[i]! - e.x)).toBeLessThan(1e-5);
      expect(Math.abs(f.y[i]! - e.y)).toBeLessThan(1e-5);
      expect(Math.abs(f.z[i]! - e.z)).toBeLessThan(1e-5);
    }
  });

  it('derives the base-frame angular velocity of a pure yaw spin', () => {
    const m = platformMotion(track(50, 1, (t) => [0, 0, 0, 0.1, 0, 0.3 * t]));
    // Physics: about the fixed z axis, w = (0, 0, yaw rate) whatever the constant roll.
    expect(m.omega_radps[3 * 10 + 2]).toBeCloseTo(0.3, 12);
    expect(m.omega_radps[3 * 10]).toBeCloseTo(0, 12);
  });

  it('rejects columns of different lengths', () => {
    const p = track(100, 1, () => [0, 0, 0, 0, 0, 0]);
    expect(() => seatSpecificForce({ ...p, yaw_rad: new Float64Array(3) }, [0, 0, 0])).toThrow(
      /yaw_rad has 3 samples/,
    );
  });
});

describe('bad pose input', () => {
  it('names a non-finite pose sample and a bad seat point', () => {
    const p = track(100, 1, () => [0, 0, 0, 0, 0, 0]);
    p.roll_rad[5] = Number.NaN;
    expect(() => seatSpecificForce(p, [0, 0, 1])).toThrow(/roll_rad, sample 5/);
    const q = track(100, 1, () => [0, 0, 0, 0, 0, 0]);
    expect(() => seatSpecificForce(q, [0, Number.POSITIVE_INFINITY, 1])).toThrow(/seat point/);
  });
});

describe('the per-seat and the shared-motion paths', () => {
  it.each([1, 2, 3, 4, 5, 400])('agree on a %i-sample track', (n) => {
    // Same formula two ways: fused per sample, and via the stored platform motion used for many seats.
    const fn: PoseFn = (t) => [
      0.1 * Math.sin(1.3 * t),
      0.05 * Math.cos(0.7 * t),
      0.04 * Math.sin(2.1 * t),
      0.08 * Math.sin(0.9 * t),
      0.1 * Math.sin(1.1 * t + 0.4),
      0.15 * Math.sin(0.5 * t),
    ];
    const p = track(100, (n - 1) / 100, fn);
    expect(p.x_m.length).toBe(n);
    const seat: [number, number, number] = [0.6, -0.4, 1.1];
    const a = seatSpecificForce(p, seat);
    const b = seatForceFromMotion(platformMotion(p), seat);
    for (let i = 0; i < n; i++) {
      expect(a.x[i]).toBeCloseTo(b.x[i]!, 9);
      expect(a.y[i]).toBeCloseTo(b.y[i]!, 9);
      expect(a.z[i]).toBeCloseTo(b.z[i]!, 9);
    }
  });
});
