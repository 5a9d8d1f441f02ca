// Actuator forces from the platform's rigid-body inverse dynamics (legs massless), checked against
// closed forms and against the same statics solved independently with mathjs:
// - at neutral and at rest, centre of mass on the axis of the symmetric demo layout, the weight is
//   shared equally: f = m g0 / (6 cos(beta)), cos(beta) = h / L, L from plane geometry
//   L = sqrt(Rb^2 + Rp^2 - 2 Rb Rp cos d + h^2) (statics of a symmetric Stewart platform; plane geometry);
// - a pure vertical acceleration a of the same pose scales every force by (g0 + a) / g0 (Newton's
//   second law: the legs supply m (g0 + a) instead of m g0).
import { cross, lusolve, matrix, multiply, rotationMatrix, transpose } from 'mathjs';
import type { Matrix } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { hexapodGeometry } from '../../../shared/motion/hexapod';
import type { PoseColumns } from '../../../shared/motion/hexapod';
import { hexapodLegForces } from '../../../shared/motion/leg-force';
import type { PlatformPayload } from '../../../shared/motion/leg-force';
import { processTrack } from '../../../shared/motion/process';
import { buildRunSeries } from '../../../shared/motion/run-series';
import { platformMotion } from '../../../shared/motion/seat-force';
import { G0_MPS2 } from '../../../shared/motion/units';
import { DEMO_BUDGET } from '../../../shared/schemas/budget';
import { demoHexapodBase, demoHexapodInput, parseMotionBase } from '../../../shared/schemas/motion-base';
import type { HexapodBase } from '../../../shared/schemas/motion-base';

const g = hexapodGeometry(demoHexapodBase);
const DEG = Math.PI / 180;
const payload: PlatformPayload = {
  mass_kg: 800,
  centreOfMass_m: [0, 0, 0.9],
  inertia_kgm2: [300, 320, 400, 0, 0, 0],
};

const constPose = (n: number, v: readonly number[] = [0, 0, 0, 0, 0, 0]): PoseColumns => ({
  x_m: new Float64Array(n).fill(v[0] as number),
  y_m: new Float64Array(n).fill(v[1] as number),
  z_m: new Float64Array(n).fill(v[2] as number),
  roll_rad: new Float64Array(n).fill(v[3] as number),
  pitch_rad: new Float64Array(n).fill(v[4] as number),
  yaw_rad: new Float64Array(n).fill(v[5] as number),
});

/** cos of each leg's angle to the vertical at neutral, from plane geometry. */
function neutralCosBeta(): number {
  const p = demoHexapodInput;
  const d = (60 - p.baseHalfAngle_deg - p.platformHalfAngle_deg) * DEG;
  const h = p.neutralHeight_m;
  const L = Math.sqrt(
    p.baseRadius_m ** 2 +
      p.platformRadius_m ** 2 -
      2 * p.baseRadius_m * p.platformRadius_m * Math.cos(d) +
      h * h,
  );
  return h / L;
}

describe('hexapod leg forces', () => {
  it('at neutral and at rest share the weight equally: m g0 / (6 cos beta)', () => {
    const pose = constPose(5);
    const f = hexapodLegForces(g, pose, platformMotion({ rate_hz: 100, ...pose }), payload);
    const expected = (payload.mass_kg * G0_MPS2) / (6 * neutralCosBeta());
    for (const leg of f) for (const v of leg) expect(v / expected).toBeCloseTo(1, 12);
  });

  it('a pure vertical acceleration a scales every force by (g0 + a) / g0', () => {
    const n = 1;
    const pose = constPose(n);
    const still = constPose(3);
    const rest = hexapodLegForces(g, still, platformMotion({ rate_hz: 100, ...still }), payload);
    for (const a of [3, -4.5]) {
      const motion = {
        length: n,
        rotation: Float64Array.of(1, 0, 0, 0, 1, 0, 0, 0, 1),
        accel_mps2: Float64Array.of(0, 0, a),
        omega_radps: new Float64Array(3),
        alpha_radps2: new Float64Array(3),
      };
      const f = hexapodLegForces(g, pose, motion, payload);
      f.forEach((leg, i) =>
        expect((leg[0] as number) / (rest[i]?.[0] as number)).toBeCloseTo((G0_MPS2 + a) / G0_MPS2, 12),
      );
    }
  });

  it('agrees with Newton-Euler and J^T f = w solved by mathjs at a general pose and motion', () => {
    const q = [0.05, -0.08, 0.1, 6 * DEG, -4 * DEG, 12 * DEG];
    const pose = constPose(1, q);
    const acc = [1.2, -0.7, 2.1];
    const om = [0.3, -0.2, 0.5];
    const al = [1.5, 0.8, -2.0];
    const load: PlatformPayload = {
      mass_kg: 650,
      centreOfMass_m: [0.15, -0.1, 0.8],
      inertia_kgm2: [250, 280, 350, 12, -8, 5],
    };
    // R = Rz Ry Rx from mathjs.
    const R = multiply(
      multiply(
        rotationMatrix(q[5] as number, matrix([0, 0, 1])),
        rotationMatrix(q[4] as number, matrix([0, 1, 0])),
      ),
      rotationMatrix(q[3] as number, matrix([1, 0, 0])),
    ) as Matrix;
    const Rrows = R.toArray() as number[][];
    const motion = {
      length: 1,
      rotation: Float64Array.from(Rrows.flat()),
      accel_mps2: Float64Array.from(acc),
      omega_radps: Float64Array.from(om),
      alpha_radps2: Float64Array.from(al),
    };
    const f = hexapodLegForces(g, pose, motion, load).map((c) => c[0] as number);

    const vec = (m: unknown) => (m as Matrix).toArray() as number[];
    const c = vec(multiply(R, matrix([...load.centreOfMass_m])));
    const ac = acc.map(
      (v, i) => v + (cross(al, c) as number[])[i]! + (cross(om, cross(om, c) as number[]) as number[])[i]!,
    );
    const F = [load.mass_kg * ac[0]!, load.mass_kg * ac[1]!, load.mass_kg * (ac[2]! + G0_MPS2)];
    const [ixx, iyy, izz, ixy, ixz, iyz] = load.inertia_kgm2 as number[];
    const Ip = matrix([
      [ixx!, ixy!, ixz!],
      [ixy!, iyy!, iyz!],
      [ixz!, iyz!, izz!],
    ]);
    const Iw = multiply(multiply(R, Ip), transpose(R)) as Matrix;
    const Mc = vec(multiply(Iw, matrix(al))).map(
      (v, i) => v + (cross(om, vec(multiply(Iw, matrix(om)))) as number[])[i]!,
    );
    const MO = Mc.map((v, i) => v + (cross(c, F) as number[])[i]!);
    const p = [q[0]!, q[1]!, q[2]! + demoHexapodBase.neutralHeight_m];
    const JT: number[][] = [[], [], [], [], [], []];
    demoHexapodBase.baseJoints_m.forEach((B, i) => {
      const a = vec(multiply(R, matrix([...(demoHexapodBase.platformJoints_m[i] as number[])])));
      const L = [p[0]! + a[0]! - B[0], p[1]! + a[1]! - B[1], p[2]! + a[2]! - B[2]];
      const l = Math.hypot(...L);
      const u = L.map((v) => v / l);
      const m = cross(a, u) as number[];
      [...u, ...m].forEach((v, r) => (JT[r] as number[]).push(v));
    });
    const sol = (lusolve(JT, [...F, ...MO]) as number[][]).map((r) => r[0] as number);
    f.forEach((v, i) => expect(v).toBeCloseTo(sol[i] as number, 6));
  });
});

describe('the legForce check in the pipeline', () => {
  const withPayload = (forceMax_N?: number) =>
    parseMotionBase({
      ...demoHexapodInput,
      payload,
      leg: { ...demoHexapodInput.leg, ...(forceMax_N !== undefined ? { forceMax_N } : {}) },
    }) as HexapodBase;
  // A heave bump, at rest at both ends.
  const n = 601;
  const time_s = Float64Array.from({ length: n }, (_, i) => i / 100);
  const bump = time_s.map((t) => (t > 1 && t < 5 ? 0.05 * (1 - Math.cos((Math.PI * (t - 1)) / 2)) : 0));
  const zero = () => new Float64Array(n);
  const track = {
    kind: 'pose' as const,
    layout: 'hexapod' as const,
    length: n,
    time_s,
    names: ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'],
    columns: [zero(), zero(), bump, zero(), zero(), zero()],
  };
  const share = (payload.mass_kg * G0_MPS2) / (6 * neutralCosBeta());

  it('is within a generous rating, with a use per leg, and the forces are charted with the legs', () => {
    const base = withPayload(20_000);
    const r = processTrack({ track, base, budget: DEMO_BUDGET });
    const uses = r.check.uses.filter((u) => u.check === 'legForce');
    expect(uses.map((u) => u.subject)).toEqual(['leg1', 'leg2', 'leg3', 'leg4', 'leg5', 'leg6']);
    // At rest at the start each leg carries its equal share (to 0.1 %: the pipeline's band-limited
    // derivatives see a little of the bump's onset at the first sample).
    expect((r.legForce_N?.[0]?.[0] as number) / share).toBeCloseTo(1, 3);
    expect(r.check.findings.filter((f) => f.check === 'legForce')).toEqual([]);
    const series = buildRunSeries(r, track, base);
    expect(series.legForce).toHaveLength(6);
    expect(series.forceMax_N).toBe(20_000);
  });

  it('is a hard finding per leg when the rating is below the static share', () => {
    const r = processTrack({ track, base: withPayload(share * 0.9), budget: DEMO_BUDGET });
    const f = r.check.findings.filter((x) => x.check === 'legForce');
    expect(new Set(f.map((x) => x.subject)).size).toBe(6);
    expect(f.every((x) => x.severity === 'hard')).toBe(true);
    expect(r.exitCode).toBe(4);
  });

  it('a payload without a rating is charted and noted, not checked; a base without payload has no forces', () => {
    const r = processTrack({ track, base: withPayload(), budget: DEMO_BUDGET });
    expect(r.legForce_N).toHaveLength(6);
    expect(r.check.uses.some((u) => u.check === 'legForce')).toBe(false);
    expect(r.notes.join(' ')).toMatch(/payload but no actuator force rating/);
    expect(processTrack({ track, base: demoHexapodBase, budget: DEMO_BUDGET }).legForce_N).toBeNull();
  });

  it('refuses an inertia tensor no body can have', () => {
    expect(() =>
      parseMotionBase({ ...demoHexapodInput, payload: { ...payload, inertia_kgm2: [10, 10, 100, 0, 0, 0] } }),
    ).toThrow(/payload.inertia_kgm2: not a physical inertia tensor/);
  });
});
