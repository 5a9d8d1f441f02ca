// Budget checks on tracks whose outcome is known in closed form: leg lengths from plane geometry
// (law of cosines), leg speed from the leg's direction at neutral, tilt from gravity.
import { describe, expect, it } from 'vitest';
import { processTrack } from '../../../shared/motion/process';
import { checkResultSchema, exitCodeFor } from '../../../shared/schemas/findings';
import { demoHexapodBase, demoHexapodInput } from '../../../shared/schemas/motion-base';
import { G0_MPS2 } from '../../../shared/motion/units';
import { RELAXED_START_END, makeBudget, makePoseTrackFrom, smoothStep } from './track-builders';

const base = demoHexapodBase;
const RATE = base.controllerRate_hz;
const DEG = Math.PI / 180;

/**
 * Leg length of the symmetric demo hexapod at a pure heave z (m): plane geometry of joint circles Rb,
 * Rp with angular offset d between a leg's joints, L = sqrt(Rb^2 + Rp^2 - 2 Rb Rp cos d + h^2)
 * (law of cosines), with h = h0 + z.
 */
function heaveLegLength(z_m: number): number {
  const p = demoHexapodInput;
  const d = (60 - p.baseHalfAngle_deg - p.platformHalfAngle_deg) * DEG;
  const h = p.neutralHeight_m + z_m;
  return Math.sqrt(
    p.baseRadius_m ** 2 +
      p.platformRadius_m ** 2 -
      2 * p.baseRadius_m * p.platformRadius_m * Math.cos(d) +
      h * h,
  );
}

describe('a quiet track', () => {
  const track = makePoseTrackFrom(RATE, 10, () => [0, 0, 0, 0, 0, 0]);
  const r = processTrack({ track, base, budget: makeBudget({}) });

  it('has no findings, is within budget and exits 0', () => {
    expect(r.check.findings).toEqual([]);
    expect(r.check.within).toBe(true);
    expect(r.exitCode).toBe(0);
    expect(checkResultSchema.safeParse(r.findings).success).toBe(true);
  });

  it('lists a use for every check and subject, stroke at neutral measured from mid-stroke', () => {
    const uses = new Map(r.check.uses.map((u) => [`${u.check}/${u.subject}`, u.ratio]));
    const expected = [
      ...['stroke', 'legSpeed', 'legAccel'].flatMap((c) => [1, 2, 3, 4, 5, 6].map((i) => `${c}/leg${i}`)),
      ...[1, 2, 3, 4].map((s) => `envelope/seat${s}`),
      ...['jerk', 'angularSpeed', 'angularAccel', 'wrms'].flatMap((c) =>
        ['x', 'y', 'z'].map((a) => `${c}/${a}`),
      ),
      'msdv/z',
      'startEnd/start',
      'startEnd/end',
      // The demo budget sets a conditioning limit.
      'conditioning/platform',
      ...['x', 'y', 'z', 'roll', 'pitch', 'yaw'].map((a) => `outOfBand/${a}`),
    ];
    expect([...uses.keys()].sort()).toEqual(expected.sort());
    // Usable band [1.5 + 0.02, 2.3 - 0.02] m: middle 1.90 m, half-width 0.38 m; 1.874 m at neutral
    // lies 0.026 m below the middle, so the use is 0.026 / 0.38 (the definition of stroke use).
    expect(uses.get('stroke/leg1')).toBeCloseTo(Math.abs(heaveLegLength(0) - 1.9) / 0.38, 9);
    // The use carries the worst value and the limit behind the ratio, in metres here.
    const stroke1 = r.check.uses.find((u) => u.check === 'stroke' && u.subject === 'leg1');
    expect(stroke1?.value).toBeCloseTo(Math.abs(heaveLegLength(0) - 1.9), 9);
    expect(stroke1?.limit).toBeCloseTo(0.38, 12);
    // At rest the rider feels exactly 1 g up; round-off in the filters leaves at most ~1e-14.
    for (const key of ['envelope/seat1', 'wrms/z', 'msdv/z', 'jerk/z', 'legSpeed/leg1']) {
      expect(uses.get(key)).toBeLessThan(1e-9);
    }
  });
});

describe('a heave past the stroke', () => {
  // Up 0.5 m over 5 s (cosine ramp), hold 2 s, down over 5 s: slow enough to stay inside every other limit.
  const lift = (t: number) => 0.5 * (smoothStep(t, 1, 6) - smoothStep(t, 8, 13));
  const track = makePoseTrackFrom(RATE, 15, (t) => [0, 0, lift(t), 0, 0, 0]);
  const r = processTrack({ track, base, budget: makeBudget({}) });

  it('finds a stroke overrun on every leg, and only that, spanning the time above the bound', () => {
    const hard = r.check.findings.filter((f) => f.severity === 'hard');
    expect(hard.map((f) => f.check)).toEqual(Array(6).fill('stroke'));
    expect(hard.map((f) => f.subject).sort()).toEqual(['leg1', 'leg2', 'leg3', 'leg4', 'leg5', 'leg6']);
    // Heave at which the plane-geometry length reaches max - margin = 2.28 m, and when the ramps cross it.
    const h0 = demoHexapodInput.neutralHeight_m;
    const zStar = Math.sqrt(2.28 ** 2 - (heaveLegLength(0) ** 2 - h0 ** 2)) - h0;
    const s = zStar / 0.5;
    const tUp = 1 + (5 * Math.acos(1 - 2 * s)) / Math.PI;
    const tDown = 8 + (5 * Math.acos(1 - 2 * (1 - s))) / Math.PI;
    for (const f of hard) {
      expect(Math.abs(f.start_s - tUp)).toBeLessThan(1.5 / RATE);
      expect(Math.abs(f.end_s - tDown)).toBeLessThan(1.5 / RATE);
      // Excursion from mid-stroke 1.90 m against the half-width 0.38 m.
      expect(f.limit).toBeCloseTo(0.38, 12);
      expect(f.value).toBeCloseTo(heaveLegLength(0.5) - 1.9, 6);
      expect(f.ratio).toBeCloseTo((heaveLegLength(0.5) - 1.9) / 0.38, 6);
    }
    expect(r.exitCode).toBe(4);
  });
});

describe('a fast sway', () => {
  // y = A sin(wt): at neutral the speed of leg i is u_i . v (docs/motion-conventions.md section 2), and legs 4 and 5
  // lean furthest sideways. Their unit vectors, computed here from the joints, pick the peak speed so
  // that legs 4 and 5 run 10 % over the limit while the others stay far below.
  const u = base.baseJoints_m.map((B, i) => {
    const P = base.platformJoints_m[i] as [number, number, number];
    const L = [P[0] - B[0], P[1] - B[1], P[2] + base.neutralHeight_m - B[2]];
    return (L[1] as number) / Math.hypot(...L);
  });
  const uMax = Math.max(...u.map(Math.abs));
  const V = (1.1 * base.leg.speedMax_mps) / uMax;
  const A = 0.25;
  const w = V / A;
  const track = makePoseTrackFrom(RATE, 3, (t) => [0, A * Math.sin(w * t), 0, 0, 0, 0]);
  // A generous rider envelope keeps this about the legs (0.9 g of sway is outside the demo's y band).
  const budget = makeBudget({ envelope: { y: [[0, -2, 2]] }, startEnd: RELAXED_START_END });
  const r = processTrack({ track, base, budget });

  it('finds leg-speed overruns on legs 4 and 5 only, each span around a pass through neutral', () => {
    const speed = r.check.findings.filter((f) => f.check === 'legSpeed');
    const legs = new Set(speed.map((f) => f.subject));
    expect([...legs].sort()).toEqual(['leg4', 'leg5']);
    expect(Math.abs(u[3] as number)).toBe(uMax);
    const crossings: number[] = [];
    for (let k = 0; (k * Math.PI) / w <= 3; k++) crossings.push((k * Math.PI) / w);
    for (const leg of ['leg4', 'leg5']) {
      const mine = speed.filter((f) => f.subject === leg);
      expect(mine).toHaveLength(crossings.length);
      mine.forEach((f, k) => {
        expect(f.start_s).toBeLessThanOrEqual((crossings[k] as number) + 1 / RATE);
        expect(f.end_s).toBeGreaterThanOrEqual((crossings[k] as number) - 1 / RATE);
        expect(f.end_s - f.start_s).toBeLessThan(Math.PI / w / 2);
        expect(f.ratio).toBeGreaterThan(1.05);
        expect(f.ratio).toBeLessThan(1.15);
      });
    }
    expect(r.check.findings.filter((f) => f.severity === 'hard' && f.check !== 'legSpeed')).toEqual([]);
    expect(r.exitCode).toBe(4);
  });
});

describe('a sustained pitch', () => {
  // Pitch 10 deg held for 3 s: gravity then gives f_x = -g0 sin(pitch) at every seat (docs/motion-conventions.md
  // section 1: positive pitch puts the nose down), 0.174 g, over a surge row allowing 0.1 g for 1 s.
  const theta = 10 * DEG;
  const pitch = (t: number) => theta * (smoothStep(t, 1, 3) - smoothStep(t, 6, 8));
  const track = makePoseTrackFrom(RATE, 10, (t) => [0, 0, 0, 0, pitch(t), 0]);
  const budget = makeBudget({
    envelope: {
      x: [
        [0, -1, 1],
        [1, -0.1, 0.1],
      ],
    },
  });
  const r = processTrack({ track, base, budget });

  it('finds an envelope breach on x at every seat, spanning the time past 0.1 g', () => {
    const env = r.check.findings.filter((f) => f.check === 'envelope');
    expect(env.map((f) => f.subject).sort()).toEqual(['seat1', 'seat2', 'seat3', 'seat4']);
    // Where g0 sin(pitch) crosses 0.1 g on the cosine ramps; the rider low-pass and the seats'
    // rotational terms move the crossings by less than 0.15 s.
    const s = Math.asin(0.1) / theta;
    const tIn = 1 + (2 * Math.acos(1 - 2 * s)) / Math.PI;
    const tOut = 6 + (2 * Math.acos(1 - 2 * (1 - s))) / Math.PI;
    for (const f of env) {
      expect(f.axis).toBe('x');
      expect(f.row).toBe(1);
      expect(f.severity).toBe('hard');
      expect(Math.abs(f.start_s - tIn)).toBeLessThan(0.15);
      expect(Math.abs(f.end_s - tOut)).toBeLessThan(0.15);
      // Timed row: value = time outside (s), limit = the row's duration.
      expect(f.value).toBeCloseTo(f.end_s - f.start_s, 9);
      expect(f.limit).toBe(1);
      expect(f.ratio).toBeCloseTo(f.value, 9);
    }
    // The held tilt itself: -g0 sin(theta) on x at the seats, after the low-pass.
    const fx = r.check.rider.seatForceLp_mps2[0]?.[0] as Float64Array;
    expect((fx[Math.round(5 * RATE)] as number) / G0_MPS2).toBeCloseTo(-Math.sin(theta), 4);
    expect(r.exitCode).toBe(4);
  });
});

describe('comfort limits only', () => {
  // A gentle sway, 0.05 m at 0.5 Hz: jerk A w^3 = 1.55 m/s^3, inside every hard limit.
  const w = 2 * Math.PI * 0.5;
  const track = makePoseTrackFrom(RATE, 12, (t) => [0, 0.05 * Math.sin(w * t), 0, 0, 0, 0]);

  it('a jerk limit below the motion gives comfort findings on y only and exit code 3', () => {
    const r = processTrack({
      track,
      base,
      budget: makeBudget({ comfort: { jerkMax_mps3: 1 }, startEnd: RELAXED_START_END }),
    });
    expect(r.check.findings.length).toBeGreaterThan(0);
    for (const f of r.check.findings) {
      expect(f).toMatchObject({ check: 'jerk', severity: 'comfort', subject: 'y', limit: 1 });
    }
    // Peak jerk of A sin(wt) is A w^3 (textbook); the 5 Hz low-pass barely touches 0.5 Hz once the
    // start (where the jerk jumps from rest to its peak and the filter overshoots) is past.
    const peak = Math.max(...r.check.findings.filter((f) => f.start_s > 1).map((f) => f.value));
    expect(peak / (0.05 * w ** 3)).toBeCloseTo(1, 2);
    expect(exitCodeFor(r.check)).toBe(3);
    expect(r.exitCode).toBe(3);
  });

  it('a whole-track wrms limit gives one finding spanning the track', () => {
    const r = processTrack({
      track,
      base,
      budget: makeBudget({ comfort: { wrmsMax_mps2: 0.01 }, startEnd: RELAXED_START_END }),
    });
    const wrms = r.check.findings.filter((f) => f.check === 'wrms');
    expect(wrms.map((f) => f.subject)).toEqual(['y']);
    expect(wrms[0]?.start_s).toBeCloseTo(-0.5 / RATE, 12);
    expect(wrms[0]?.end_s).toBeCloseTo(12 + 0.5 / RATE, 9);
    expect(r.exitCode).toBe(3);
  });

  it('a conditioning limit is checked only when the budget sets one, with subject "platform"', () => {
    const { conditioningMax: _unset, ...noLimit } = makeBudget({}).comfort;
    expect(
      processTrack({
        track,
        base,
        budget: { ...makeBudget({}), comfort: noLimit },
      }).check.uses.some((u) => u.check === 'conditioning'),
    ).toBe(false);
    const r = processTrack({
      track,
      base,
      budget: makeBudget({ comfort: { conditioningMax: 1.0001 } }),
    });
    const cond = r.check.findings.filter((f) => f.check === 'conditioning');
    expect(cond.length).toBeGreaterThan(0);
    expect(cond.every((f) => f.subject === 'platform' && f.severity === 'comfort')).toBe(true);
  });
});

describe('a singular pose', () => {
  it('is a conditioning finding with a finite value, not an error', async () => {
    const { runChecks, SINGULAR_CONDITION } = await import('../../../shared/motion/checks');
    const n = 50;
    const time_s = Float64Array.from({ length: n }, (_, i) => i / 100);
    const zeros = () => new Float64Array(n);
    const rest = () => [zeros(), zeros(), new Float64Array(n).fill(G0_MPS2)] as const;
    const conditioning = new Float64Array(n).fill(3);
    conditioning[20] = Infinity;
    const r = runChecks(
      {
        time_s,
        rate_hz: 100,
        legLength_m: [new Float64Array(n).fill(1.9)],
        legSpeed_mps: [zeros()],
        legAccel_mps2: [zeros()],
        seatForce_mps2: [rest()],
        omega_radps: [zeros(), zeros(), zeros()],
        conditioning,
        legLimits: base.leg,
      },
      makeBudget({ comfort: { conditioningMax: 100 } }),
    );
    expect(r.findings).toHaveLength(1);
    expect(r.findings[0]).toMatchObject({
      check: 'conditioning',
      subject: 'platform',
      value: SINGULAR_CONDITION,
      limit: 100,
    });
    expect(r.findings[0]?.start_s).toBeCloseTo(0.195, 12);
    expect(r.findings[0]?.end_s).toBeCloseTo(0.205, 12);
  });
});

describe('stroke use, from its definition', () => {
  // Stroke use: usable band [min + margin, max - margin], middle m, half-width h; use = |L - m| / h.
  // With the demo base's stroke 1.5-2.3 m and a 0.02 m margin: m = 1.90 m, h = 0.38 m.
  const legRun = async (lengths: number[]) => {
    const { runChecks } = await import('../../../shared/motion/checks');
    const n = lengths.length;
    const time_s = Float64Array.from({ length: n }, (_, i) => i / 100);
    const zeros = () => new Float64Array(n);
    return runChecks(
      {
        time_s,
        rate_hz: 100,
        legLength_m: [Float64Array.from(lengths)],
        legSpeed_mps: [zeros()],
        legAccel_mps2: [zeros()],
        seatForce_mps2: [[zeros(), zeros(), new Float64Array(n).fill(G0_MPS2)]],
        omega_radps: [zeros(), zeros(), zeros()],
        legLimits: base.leg,
      },
      makeBudget({ strokeMargin_m: 0.02 }),
    );
  };

  it('reads 0 for a leg resting mid-stroke', async () => {
    const r = await legRun(Array(40).fill(1.9));
    expect(r.uses.find((u) => u.check === 'stroke')?.ratio).toBeCloseTo(0, 12);
    expect(r.findings.filter((f) => f.check === 'stroke')).toEqual([]);
  });

  it('reads 1 for a leg at max - margin, and the same at min + margin', async () => {
    for (const edge of [2.28, 1.52]) {
      const r = await legRun([...Array(20).fill(1.9), ...Array(20).fill(edge)]);
      expect(r.uses.find((u) => u.check === 'stroke')?.ratio).toBeCloseTo(1, 12);
    }
  });

  it('reads 0.5 half way to the edge, and a finding carries the excursion and the half-width in m', async () => {
    const half = await legRun(Array(40).fill(1.9 + 0.19));
    expect(half.uses.find((u) => u.check === 'stroke')?.ratio).toBeCloseTo(0.5, 12);
    const over = await legRun([...Array(20).fill(1.9), ...Array(20).fill(2.3)]);
    const f = over.findings.find((x) => x.check === 'stroke');
    expect(f?.value).toBeCloseTo(0.4, 12);
    expect(f?.limit).toBeCloseTo(0.38, 12);
    expect(f?.ratio).toBeCloseTo(0.4 / 0.38, 12);
  });
});
