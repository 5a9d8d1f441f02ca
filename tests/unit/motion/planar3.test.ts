import { describe, expect, it } from 'vitest';
import { lusolve } from 'mathjs';
import { KinematicsError } from '../../../shared/motion/base-geometry';
import {
  planar3AssemblyModes,
  planar3Forward,
  planar3ForwardPose,
  planar3Geometry,
  planar3Inverse,
  planar3LegLengthsInto,
  poseDistance,
  wrapAngle,
} from '../../../shared/motion/planar3';
import type { Planar3Geometry, PlanarPose } from '../../../shared/motion/planar3';
import { demoPlanar3Base } from '../../../shared/schemas/motion-base';
import { makeRng } from '../../factories/motion';

function legsOf(g: Planar3Geometry, p: PlanarPose): [number, number, number] {
  const out = new Float64Array(3);
  planar3LegLengthsInto(g, p.x_m, p.y_m, p.yaw_rad, out);
  return [out[0]!, out[1]!, out[2]!];
}

function randomGeometry(rng: () => number, collinear = false): Planar3Geometry {
  if (collinear) {
    // Base joints on one line, platform joints on another (the reduced case).
    const ab = rng() * Math.PI;
    const ap = rng() * Math.PI;
    const tb = [-1.5 - rng(), rng() - 0.5, 1.5 + rng()];
    const tp = [-0.6 - 0.3 * rng(), 0.4 * (rng() - 0.5), 0.6 + 0.3 * rng()];
    return planar3Geometry({
      baseJoints_m: tb.map((t) => [t * Math.cos(ab), t * Math.sin(ab)]),
      platformJoints_m: tp.map((t) => [t * Math.cos(ap), t * Math.sin(ap)]),
    });
  }
  const pt = (r: number) => [r * (rng() - 0.5), r * (rng() - 0.5)];
  return planar3Geometry({
    baseJoints_m: [pt(4), pt(4), pt(4)],
    platformJoints_m: [pt(1.5), pt(1.5), pt(1.5)],
  });
}

function randomPose(rng: () => number): PlanarPose {
  return { x_m: rng() - 0.5, y_m: rng() - 0.5, yaw_rad: (rng() - 0.5) * 2 * Math.PI };
}

/** Plain multi-start Newton with mathjs lusolve and a numerical Jacobian: an independent search for modes. */
function multiStartModes(
  g: Planar3Geometry,
  l: [number, number, number],
  rng: () => number,
  starts: number,
): PlanarPose[] {
  const found: PlanarPose[] = [];
  const f = (q: number[]) => {
    const m = legsOf(g, { x_m: q[0]!, y_m: q[1]!, yaw_rad: q[2]! });
    return [m[0] - l[0], m[1] - l[1], m[2] - l[2]];
  };
  for (let s = 0; s < starts; s++) {
    let q = [(rng() - 0.5) * 6, (rng() - 0.5) * 6, (rng() - 0.5) * 2 * Math.PI];
    for (let it = 0; it < 60; it++) {
      const r = f(q);
      if (Math.max(...r.map(Math.abs)) < 1e-12) break;
      const h = 1e-7;
      const J = [0, 1, 2].map((i) =>
        [0, 1, 2].map((j) => {
          const qp = q.slice();
          const qm = q.slice();
          qp[j] = qp[j]! + h;
          qm[j] = qm[j]! - h;
          return (f(qp)[i]! - f(qm)[i]!) / (2 * h);
        }),
      );
      let d: number[];
      try {
        d = (
          lusolve(
            J,
            r.map((v) => -v),
          ) as number[][]
        ).map((v) => v[0]!);
      } catch {
        break;
      }
      q = q.map((v, i) => v + d[i]!);
    }
    const r = f(q);
    if (q.every(Number.isFinite) && Math.max(...r.map(Math.abs)) < 1e-9) {
      const p = { x_m: q[0]!, y_m: q[1]!, yaw_rad: wrapAngle(q[2]!) };
      if (!found.some((m) => poseDistance(m, p) < 1e-6)) found.push(p);
    }
  }
  return found;
}

describe('planar3 assembly modes', () => {
  it('returns at most 6 modes, each reproducing the leg lengths, including the pose that made them', () => {
    // Source: Gosselin and Merlet 1994 (Mech. Mach. Theory) / Hunt 1983: at most 6 real assembly modes for a
    // general 3-RPR; the generating pose is a mode by construction.
    const rng = makeRng(31);
    const counts: number[] = [];
    for (let k = 0; k < 60; k++) {
      const g = randomGeometry(rng);
      const p = randomPose(rng);
      const l = legsOf(g, p);
      const modes = planar3AssemblyModes(g, ...l);
      counts.push(modes.length);
      expect(modes.length).toBeLessThanOrEqual(6);
      expect(modes.some((m) => poseDistance(m, p) < 1e-8)).toBe(true);
      for (const m of modes) {
        const lm = legsOf(g, m);
        for (let i = 0; i < 3; i++) expect(Math.abs(lm[i]! - l[i]!)).toBeLessThan(1e-9);
      }
    }
    // Several modes must actually occur, or the test would not exercise the search.
    expect(Math.max(...counts)).toBeGreaterThanOrEqual(4);
  });

  it('returns at most 4 modes when base joints and platform joints are each collinear', () => {
    // Source: Gosselin and Merlet 1994: the reduced (collinear) 3-RPR has at most 4 assembly modes.
    const rng = makeRng(32);
    for (let k = 0; k < 40; k++) {
      const g = randomGeometry(rng, true);
      const p = randomPose(rng);
      const l = legsOf(g, p);
      const modes = planar3AssemblyModes(g, ...l);
      expect(modes.length).toBeLessThanOrEqual(4);
      expect(modes.some((m) => poseDistance(m, p) < 1e-8)).toBe(true);
    }
  });

  it('returns both mirror-image modes of a stage whose base joints lie on the x axis', () => {
    // Source: plane geometry. Base joints on the x axis and collinear platform joints P_i = s_i (cos a, sin a):
    // reflecting the platform in the x axis keeps every leg length, and the reflected platform is the pose
    // (x, -y, -yaw - 2a). So (x, y, yaw) and (x, -y, -yaw - 2a) are two known modes.
    const a = 0.4;
    const g = planar3Geometry({
      baseJoints_m: [
        [-1.8, 0],
        [0.3, 0],
        [2.1, 0],
      ],
      platformJoints_m: [-0.7, 0.1, 0.8].map((t) => [t * Math.cos(a), t * Math.sin(a)]),
    });
    const p = { x_m: 0.2, y_m: 1.1, yaw_rad: 0.3 };
    const mirror = { x_m: 0.2, y_m: -1.1, yaw_rad: wrapAngle(-0.3 - 2 * a) };
    const modes = planar3AssemblyModes(g, ...legsOf(g, p));
    expect(modes.some((m) => poseDistance(m, p) < 1e-9)).toBe(true);
    expect(modes.some((m) => poseDistance(m, mirror) < 1e-9)).toBe(true);
    expect(modes.length).toBeLessThanOrEqual(4);
  });

  it('finds every mode that an independent multi-start Newton search finds', () => {
    // Source: plain Newton from 300 random starts with mathjs lusolve and a numerical Jacobian (no elimination).
    const rng = makeRng(33);
    let found = 0;
    for (let k = 0; k < 8; k++) {
      const g = randomGeometry(rng);
      const l = legsOf(g, randomPose(rng));
      const ours = planar3AssemblyModes(g, ...l);
      const theirs = multiStartModes(g, l, rng, 300);
      found += theirs.length;
      for (const m of theirs) expect(ours.some((o) => poseDistance(o, m) < 1e-6)).toBe(true);
    }
    // The independent search must find something, or the comparison proves nothing.
    expect(found).toBeGreaterThanOrEqual(16);
  });
});

describe('planar3 kinematics on tracks', () => {
  const g = planar3Geometry(demoPlanar3Base);

  it('recovers a smooth track from its leg lengths by continuity', () => {
    // Source: FK(IK(track)) = track.
    const n = 2000;
    const t = Float64Array.from({ length: n }, (_, i) => i / 100);
    const pose = {
      x_m: t.map((v) => 0.2 * Math.sin(0.7 * v)),
      y_m: t.map((v) => 0.15 * Math.sin(1.1 * v + 1)),
      yaw_rad: t.map((v) => 0.3 * Math.sin(0.5 * v + 0.3)),
    };
    const back = planar3Forward(g, planar3Inverse(g, pose), { time_s: t });
    for (const k of ['x_m', 'y_m', 'yaw_rad'] as const) {
      for (let s = 0; s < n; s++) expect(Math.abs(back[k][s]! - pose[k][s]!)).toBeLessThan(1e-9);
    }
  });

  it('follows a coarse leg file (2 Hz) by sub-steps to the pose it came from, where one solve per sample is lost', () => {
    // Source: FK(IK(track)) = track at every sample; the 3-RPR has up to six assembly modes (Gosselin
    // and Merlet 1994, from memory), and a brisk motion sampled at 2 Hz changes the legs by tens of
    // centimetres.
    const n = 41;
    const t = Float64Array.from({ length: n }, (_, i) => i / 2);
    const pose = {
      x_m: t.map((v) => 0.35 * Math.sin(2 * Math.PI * 0.45 * v)),
      y_m: t.map((v) => 0.3 * Math.sin(2 * Math.PI * 0.55 * v + 1)),
      yaw_rad: t.map((v) => 0.9 * Math.sin(2 * Math.PI * 0.5 * v + 0.3)),
    };
    const legs = planar3Inverse(g, pose);
    const back = planar3Forward(g, legs, { time_s: t });
    for (const k of ['x_m', 'y_m', 'yaw_rad'] as const) {
      for (let s = 0; s < n; s++)
        expect(Math.abs(back[k][s]! - pose[k][s]!), `${k} at ${s}`).toBeLessThan(1e-9);
    }
    // The naive way, one Newton solve from the previous sample's pose, loses the track somewhere.
    const q = new Float64Array(3);
    const row = new Float64Array(3);
    let lost = false;
    for (let s = 0; s < n; s++) {
      for (let i = 0; i < 3; i++) row[i] = legs[i]![s]!;
      const it = planar3ForwardPose(g, row, 0, q);
      const err = Math.max(
        Math.abs(q[0]! - pose.x_m[s]!),
        Math.abs(q[1]! - pose.y_m[s]!),
        Math.abs(wrapAngle(q[2]! - pose.yaw_rad[s]!)),
      );
      if (it < 0 || err > 1e-6) {
        lost = true;
        break;
      }
    }
    expect(lost).toBe(true);
  });

  it('throws a KinematicsError naming the sample for unreachable lengths', () => {
    // Source: geometry; legs of 0.1 m cannot reach from joints on a 2 m circle to a 0.6 m circle.
    const legs = [
      Float64Array.of(1.7, 1.7, 0.1),
      Float64Array.of(1.7, 1.7, 0.1),
      Float64Array.of(1.7, 1.7, 0.1),
    ];
    expect(() => planar3Forward(g, legs, { time_s: Float64Array.of(0, 0.01, 0.02) })).toThrow(
      KinematicsError,
    );
    expect(() => planar3Forward(g, legs, { time_s: Float64Array.of(0, 0.01, 0.02) })).toThrow(
      /sample 2 \(t = 0\.02 s\)/,
    );
  });
});
