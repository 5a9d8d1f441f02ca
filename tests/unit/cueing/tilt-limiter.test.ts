// Tilt coordination's smooth limiter: the tilt rate stays within the rate limit (3 deg/s, Groen and
// Bles 2004, J. Vestib. Res. 14(5)) and its angular acceleration within the profile's limit (5 deg/s^2
// by default, common practice), with no step in the rate at any processing rate; below the knees the
// tilt equals the command.
import { describe, expect, it } from 'vitest';
import { smoothTiltInto } from '../../../shared/motion/washout';
import { cueingProfileSchema, defaultCueingProfile } from '../../../shared/schemas/cueing-profile';

const DEG = Math.PI / 180;

describe('smooth tilt limiter', () => {
  for (const rate of [100, 1000]) {
    it(`a 5 deg step command at ${rate} Hz: rate within 3 deg/s, acceleration within 5 deg/s^2, settles on the command`, () => {
      const n = rate * 12;
      const cmd = Float64Array.from({ length: n }, (_, i) => (i >= rate ? 5 * DEG : 0));
      const out = new Float64Array(n);
      smoothTiltInto(cmd, 1 / rate, { rate: 3 * DEG, accel: 5 * DEG }, out);
      let maxRate = 0;
      let maxAccel = 0;
      for (let i = 1; i < n - 1; i++) {
        maxRate = Math.max(maxRate, (Math.abs((out[i + 1] as number) - (out[i] as number)) * rate) / DEG);
        const acc = ((out[i + 1] as number) - 2 * (out[i] as number) + (out[i - 1] as number)) * rate * rate;
        maxAccel = Math.max(maxAccel, Math.abs(acc) / DEG);
      }
      expect(maxRate).toBeLessThanOrEqual(3 + 1e-9);
      expect(maxRate).toBeGreaterThan(2.5);
      expect(maxAccel).toBeLessThanOrEqual(5 + 1e-6);
      // No overshoot past the command, and on it at the end.
      for (const v of out) expect(v).toBeLessThanOrEqual(5 * DEG + 1e-9);
      expect((out[n - 1] as number) / DEG).toBeCloseTo(5, 2);
    });
  }

  it('follows a slow command exactly (below the knees it is the command)', () => {
    const rate = 100;
    const cmd = Float64Array.from({ length: 2000 }, (_, i) => 1 * DEG * (1 - Math.cos(0.2 * (i / rate))));
    const out = new Float64Array(cmd.length);
    smoothTiltInto(cmd, 1 / rate, { rate: 3 * DEG, accel: 5 * DEG }, out);
    out.forEach((v, i) => expect(v).toBeCloseTo(cmd[i] as number, 12));
  });

  it('the acceleration limit is a profile parameter with a default, and stored profiles without it still parse', () => {
    expect(defaultCueingProfile().tilt.accelLimit_degps2).toBe(5);
    const old = { lowPassFrequency_radps: 5, damping: 1, rateLimit_degps: 3, angleLimit_deg: 10 };
    const parsed = cueingProfileSchema.parse({ version: 1, name: 'stored before the limit', tilt: old });
    expect(parsed.tilt.accelLimit_degps2).toBe(5);
    expect(
      cueingProfileSchema.safeParse({ version: 1, name: 'x', tilt: { ...old, accelLimit_degps2: -1 } })
        .success,
    ).toBe(false);
  });
});
