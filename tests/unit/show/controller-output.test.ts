// Controller output: the float32 frame file decoded by an independent reader (Node's
// Buffer.readFloatLE, following only the layout written in the manifest) equals the CSV; encoder
// counts follow their definition; the ramps start and end at neutral and join the show smoothly
// (the quintic Hermite basis meets position, speed and acceleration: checked by finite differences).
import { describe, expect, it } from 'vitest';
import {
  actuatorPositions_mm,
  controllerCsv,
  encoderCounts,
  float32Frames,
  frameLayout,
  int32Frames,
  withNeutralRamps,
} from '../../../shared/motion/controller-output';
import { controllerOutputSchema } from '../../../shared/schemas/controller-output';
import type { PoseColumns } from '../../../shared/motion/hexapod';

const rate = 100;
const n = 500;
const time = Float64Array.from({ length: n }, (_, i) => i / rate);
const legs = Array.from({ length: 6 }, (_, j) =>
  time.map((t) => 1.9 + 0.05 * Math.sin(2 * Math.PI * 0.3 * t + j) + 0.001 * j),
);

describe('controller files', () => {
  it('float32 frames decoded with readFloatLE from the manifest layout equal the CSV values', () => {
    const pos = actuatorPositions_mm(legs, 1.5);
    const bytes = Buffer.from(float32Frames(pos));
    const layout = frameLayout(
      'legs.f32',
      ['leg1_mm', 'leg2_mm', 'leg3_mm', 'leg4_mm', 'leg5_mm', 'leg6_mm'],
      n,
      rate,
    );
    const csvRows = controllerCsv(time, pos).trim().split('\n').slice(1);
    expect(bytes.length).toBe(layout.frames * layout.bytesPerFrame);
    for (let k = 0; k < layout.frames; k++) {
      const cells = (csvRows[k] as string).split(',').map(Number);
      for (let j = 0; j < layout.valuesPerFrame; j++) {
        const v = bytes.readFloatLE(k * layout.bytesPerFrame + 4 * j);
        // CSV keeps 3 decimals (0.0005 mm); float32 near 400 mm keeps about 3e-5 mm.
        expect(Math.abs(v - (cells[1 + j] as number))).toBeLessThan(6e-4);
      }
    }
    // Position from fully retracted: 1.9 m leg with 1.5 m retracted reads about 400 mm.
    expect(bytes.readFloatLE(0)).toBeCloseTo(400 + 50 * Math.sin(0), 2);
  });

  it('encoder counts are round(mm x counts per mm + zero offset)', () => {
    const pos = [Float64Array.of(0, 12.3456, 400)];
    const counts = encoderCounts(pos, { countsPerMm: 100, zeroOffset_counts: -5 });
    expect(Array.from(counts[0] as Float64Array)).toEqual([-5, 1230, 39995]);
    const csv = controllerCsv(Float64Array.of(0, 0.01, 0.02), pos, counts);
    expect(csv.split('\n')[0]).toBe('time_s,leg1_mm,leg1_counts');
    expect(csv.split('\n')[2]).toBe('0.010000,12.346,1230');
  });
});

describe('encoder count frames', () => {
  it('int32 frames decoded with readInt32LE equal the counts, and the layout says int32 counts', () => {
    const pos = actuatorPositions_mm(legs, 1.5);
    const counts = encoderCounts(pos, { countsPerMm: 409.6, zeroOffset_counts: -1000 });
    const bytes = Buffer.from(int32Frames(counts));
    const layout = frameLayout('c.i32', ['a', 'b', 'c', 'd', 'e', 'f'], n, rate, 'counts');
    expect([layout.format, layout.unit, layout.bytesPerFrame]).toEqual(['int32', 'counts', 24]);
    for (let k = 0; k < n; k += 37) {
      for (let j = 0; j < 6; j++) {
        const expected = Math.round(((legs[j] as Float64Array)[k] as number) * 409600 - 1.5 * 409600 - 1000);
        expect(bytes.readInt32LE(k * 24 + 4 * j)).toBe(expected);
      }
    }
  });

  it('refuses counts outside the signed 32-bit range, naming the leg and frame', () => {
    expect(() => int32Frames([Float64Array.of(0, 2 ** 31)])).toThrow(/leg1 frame 1/);
  });
});

describe('ramps from and to neutral', () => {
  const showPose = (): PoseColumns => ({
    // A show that starts and ends away from neutral and moving.
    x_m: time.map((t) => 0.1 + 0.02 * t),
    y_m: new Float64Array(n),
    z_m: time.map((t) => 0.05 * Math.sin(t)),
    roll_rad: new Float64Array(n),
    pitch_rad: time.map(() => 0.05),
    yaw_rad: new Float64Array(n),
  });

  it('puts the first and last frames at neutral and keeps the show in between', () => {
    const ramp = controllerOutputSchema.parse({ ramp: { duration_s: 2 } }).ramp;
    const r = withNeutralRamps(time, showPose(), rate, ramp);
    expect(r.rampIn_s).toBe(2);
    expect(r.time_s.length).toBe(n + 400);
    // The show keeps its own times: the ramp in plays before 0 s, the ramp out after the last sample.
    expect(r.time_s[0]).toBeCloseTo(-2, 12);
    expect(r.time_s[200]).toBe(0);
    expect(r.time_s[r.time_s.length - 1]).toBeCloseTo((n - 1) / rate + 2, 9);
    expect([r.showStartFrame, r.showEndFrame]).toEqual([200, 200 + n - 1]);
    for (const key of ['x_m', 'z_m', 'pitch_rad'] as const) {
      const c = r.pose[key];
      expect(c[0]).toBe(0);
      expect(c[c.length - 1]).toBe(0);
      expect(c[200]).toBe(showPose()[key][0]);
      expect(c[200 + n - 1]).toBe(showPose()[key][n - 1]);
    }
  });

  it('quintic ramps start at rest and meet the show with no step in speed', () => {
    const ramp = { duration_s: 2, profile: 'quintic' as const };
    const r = withNeutralRamps(time, showPose(), rate, ramp);
    const x = r.pose.x_m;
    const dt = 1 / rate;
    // Speed by central differences around the join (index 200) against the show's 0.02 m/s.
    expect(((x[201] as number) - (x[199] as number)) / (2 * dt)).toBeCloseTo(0.02, 4);
    // From rest the quintic's speed grows as u^2: after one frame of 200 it is about 1e-5 m/s.
    expect(((x[1] as number) - (x[0] as number)) / dt).toBeLessThan(1e-4);
    // Largest change of speed from one frame to the next along the whole ramped track: a jump in speed
    // at a join would show as one change of about the show's own speed (0.02 m/s).
    const worstStep = (c: Float64Array) => {
      let worst = 0;
      for (let k = 2; k < c.length; k++) {
        worst = Math.max(
          worst,
          Math.abs((c[k] as number) - 2 * (c[k - 1] as number) + (c[k - 2] as number)) / dt,
        );
      }
      return worst;
    };
    expect(worstStep(x)).toBeLessThan(0.005);
    // The raised cosine meets position only: its speed steps by the show's 0.02 m/s at the join.
    const cos = withNeutralRamps(time, showPose(), rate, { duration_s: 2, profile: 'raisedCosine' });
    expect(worstStep(cos.pose.x_m)).toBeGreaterThan(0.015);
  });

  it('no ramp when the duration is zero', () => {
    const r = withNeutralRamps(time, showPose(), rate, { duration_s: 0, profile: 'quintic' });
    expect(r.time_s).toBe(time);
    expect(r.rampIn_s).toBe(0);
  });
});
