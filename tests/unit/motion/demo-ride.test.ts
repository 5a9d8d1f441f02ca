// The demo ride is read back the way an inertial navigation system would read it: the body rates are
// integrated into an attitude with three.js quaternions (an independent rotation library), the specific
// force is turned into the world frame and gravity added back (f = a - g, Newton), and the result
// integrated into a velocity. A physically consistent take starts and ends at rest and level, and its
// speed never goes backwards. Strapdown integration: Titterton and Weston, "Strapdown Inertial
// Navigation Technology", 2nd ed., ch. 3 (from memory).
import { Quaternion, Vector3 } from 'three';
import { describe, expect, it } from 'vitest';
import { demoRideCsv, demoRideSamples } from '../../../shared/demo-ride';
import { parseTrackText } from '../../../shared/motion/track-reader';

// Standard gravity, 3rd CGPM (1901).
const G0 = 9.80665;

function deadReckon(intensity: number, bumps = 1) {
  const rate = 400;
  const { time_s, samples } = demoRideSamples({ rate_hz: rate, intensity, bumps });
  const q = new Quaternion();
  const v = new Vector3();
  let minForwardSpeed = Infinity;
  let maxSpeed = 0;
  const dt = 1 / rate;
  for (let i = 0; i < time_s.length - 1; i++) {
    const a = samples[i]!;
    const b = samples[i + 1]!;
    // Trapezoidal step of the world acceleration, then the attitude by the mean body rate.
    const accel = (s: typeof a, att: Quaternion) =>
      new Vector3(s[0], s[1], s[2]).applyQuaternion(att).add(new Vector3(0, 0, -G0));
    const a0 = accel(a, q);
    const w = new Vector3((a[3] + b[3]) / 2, (a[4] + b[4]) / 2, (a[5] + b[5]) / 2);
    const angle = w.length() * dt;
    if (angle > 0) q.multiply(new Quaternion().setFromAxisAngle(w.clone().normalize(), angle));
    const a1 = accel(b, q);
    v.addScaledVector(a0.add(a1), dt / 2);
    const forward = new Vector3(1, 0, 0).applyQuaternion(q);
    minForwardSpeed = Math.min(minForwardSpeed, v.dot(forward));
    maxSpeed = Math.max(maxSpeed, v.length());
  }
  const up = new Vector3(0, 0, 1).applyQuaternion(q);
  return { v, up, minForwardSpeed, maxSpeed, first: samples[0]!, last: samples.at(-1)! };
}

describe('demo ride', () => {
  it('reads +g0 on z at rest, level, at both ends', () => {
    const { first, last } = deadReckon(1);
    for (const s of [first, last]) {
      expect(s[0]).toBeCloseTo(0, 6);
      expect(s[1]).toBeCloseTo(0, 6);
      expect(s[2]).toBeCloseTo(G0, 6);
      for (const w of s.slice(3)) expect(w).toBeCloseTo(0, 6);
    }
  });

  it.each([0.9, 1, 1.6])('integrates back to a ride that ends at rest and level (intensity %s)', (k) => {
    const r = deadReckon(k);
    // Dead reckoning drifts a little; a ride that did not stop would be metres per second off.
    expect(r.v.length()).toBeLessThan(0.05);
    expect(r.up.z).toBeGreaterThan(Math.cos(0.2 * (Math.PI / 180)));
    // It goes somewhere at coaster pace and never rolls backwards.
    expect(r.maxSpeed).toBeGreaterThan(8);
    expect(r.minForwardSpeed).toBeGreaterThan(-0.05);
  });

  it('has a launch, banked turns, a drop and bumps in its specific force and rates', () => {
    const { time_s, samples } = demoRideSamples({ rate_hz: 100 });
    const during = (t0: number, t1: number, j: number) =>
      samples.filter((_, i) => time_s[i]! >= t0 && time_s[i]! <= t1).map((s) => s[j]!);
    // Launch: surge force well forward; brake: well backward.
    expect(Math.max(...during(2, 6, 0))).toBeGreaterThan(4);
    expect(Math.min(...during(42, 48, 0))).toBeLessThan(-3);
    // Turns: yaw rate one way, then the other.
    expect(Math.max(...during(6.5, 15.5, 5))).toBeGreaterThan(0.1);
    expect(Math.min(...during(27, 34, 5))).toBeLessThan(-0.1);
    // Drop: light at the pushover, heavy at the pull-out.
    expect(Math.min(...during(20, 23, 2))).toBeLessThan(0.85 * G0);
    expect(Math.max(...during(23, 26, 2))).toBeGreaterThan(1.15 * G0);
    // Bumps: vertical force swings both ways around g0.
    const bumps = during(36, 40.5, 2);
    expect(Math.max(...bumps)).toBeGreaterThan(G0 + 0.5);
    expect(Math.min(...bumps)).toBeLessThan(G0 - 0.5);
  });

  it('is a vehicle track the product reads', () => {
    const track = parseTrackText(demoRideCsv({ duration_s: 10, rate_hz: 50 }), { file: 'ride.csv' });
    expect(track.kind).toBe('vehicle');
    expect(track.length).toBe(501);
  });
});
