import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import {
  demoHexapodBase,
  demoHexapodInput,
  demoPlanar3Base,
  MotionBaseError,
  parseMotionBase,
} from '../../../shared/schemas/motion-base';

function issuesOf(input: unknown): { path: string; message: string }[] {
  try {
    parseMotionBase(input);
  } catch (e) {
    if (e instanceof MotionBaseError) return [...e.issues];
    throw e;
  }
  throw new Error('expected a MotionBaseError');
}

const explicit = JSON.parse(JSON.stringify(demoHexapodBase)) as typeof demoHexapodBase;

describe('motion base schema', () => {
  it('accepts the demo bases and the fixtures, and keeps the joint form', () => {
    expect(parseMotionBase(explicit)).toEqual(demoHexapodBase);
    expect(demoHexapodBase.name).toBe('Harbour Lights Dome');
    expect(demoPlanar3Base.name).toBe('Tidewater Arcade');
    for (const f of ['base-hexapod.json', 'base-hexapod-parametric.json', 'base-planar3.json']) {
      const base = parseMotionBase(
        JSON.parse(readFileSync(new URL(`../../fixtures/${f}`, import.meta.url), 'utf8')),
      );
      expect(['hexapod', 'planar3']).toContain(base.kind);
    }
  });

  it('generates joints from the parametric form counter-clockwise seen from above', () => {
    // Source: docs/motion-conventions.md section 2 (legs numbered counter-clockwise seen from above): the base joint angle
    // atan2(y, x) increases from leg 1 to leg 6.
    const angles = demoHexapodBase.baseJoints_m.map(([x, y]) => Math.atan2(y, x));
    const unwrapped = angles.map((a) => (a < angles[0]! ? a + 2 * Math.PI : a));
    for (let i = 1; i < 6; i++) expect(unwrapped[i]!).toBeGreaterThan(unwrapped[i - 1]!);
    for (const [x, y, z] of demoHexapodBase.baseJoints_m) {
      expect(Math.hypot(x, y)).toBeCloseTo(demoHexapodInput.baseRadius_m, 14);
      expect(z).toBe(0);
    }
  });

  it('names coincident joints', () => {
    const b = structuredClone(explicit);
    b.baseJoints_m[3] = [...b.baseJoints_m[2]!];
    const issues = issuesOf(b);
    expect(issues).toContainEqual({
      path: 'baseJoints_m[3]',
      message: expect.stringMatching(/joint 4 coincides with joint 3/),
    });
    const p = structuredClone(explicit);
    p.platformJoints_m[5] = [
      p.platformJoints_m[0]![0] + 1e-4,
      p.platformJoints_m[0]![1],
      p.platformJoints_m[0]![2],
    ];
    expect(issuesOf(p)[0]).toMatchObject({
      path: 'platformJoints_m[5]',
      message: expect.stringMatching(/coincides with joint 1/),
    });
  });

  it('names a neutral pose outside the stroke, leg by leg', () => {
    // Demo neutral legs are 1.874 m (closed form, see hexapod tests); a 2.0-2.5 m stroke excludes them.
    const issues = issuesOf({ ...explicit, leg: { ...explicit.leg, min_m: 2.0, max_m: 2.5 } });
    expect(issues).toHaveLength(6);
    expect(issues[0]).toEqual({
      path: 'neutralHeight_m',
      message: 'leg 1 is 1.874 m long at the neutral pose, outside the stroke [2, 2.5] m',
    });
  });

  it('rejects min >= max, non-positive rates, wrong counts and unknown keys with their paths', () => {
    expect(issuesOf({ ...explicit, leg: { ...explicit.leg, min_m: 2.3 } })).toEqual([
      { path: 'leg.min_m', message: 'must be below leg.max_m (2.3 >= 2.3 m)' },
    ]);
    const many = issuesOf({
      ...explicit,
      controllerRate_hz: 0,
      leg: { ...explicit.leg, speedMax_mps: -1 },
      baseJoints_m: explicit.baseJoints_m.slice(0, 5),
      extra: 1,
    });
    const paths = many.map((i) => i.path);
    expect(paths).toEqual(
      expect.arrayContaining(['controllerRate_hz', 'leg.speedMax_mps', 'baseJoints_m', '(root)']),
    );
    expect(issuesOf({ kind: 'crane' })).toEqual([
      { path: 'kind', message: 'expected "hexapod" or "planar3", got "crane"' },
    ]);
    expect(issuesOf(null)[0]!.path).toBe('(root)');
  });

  it('rejects a singular neutral pose (all legs vertical)', () => {
    // Source: common practice / statics: legs all parallel to z cannot hold the platform in x, y or yaw.
    const b = structuredClone(explicit);
    b.platformJoints_m = b.baseJoints_m.map(([x, y]) => [x, y, 0]);
    b.neutralHeight_m = 1.9;
    const issues = issuesOf(b);
    expect(issues[0]).toMatchObject({
      path: 'platformJoints_m',
      message: expect.stringMatching(/singular at the neutral pose/),
    });
  });

  it('checks parametric bases after generating their joints', () => {
    const issues = issuesOf({ ...demoHexapodInput, neutralHeight_m: 2.5 });
    expect(issues[0]!.message).toMatch(/outside the stroke .* \(joints generated from the parametric form\)/);
    expect(issuesOf({ ...demoHexapodInput, baseHalfAngle_deg: 0 })[0]!.path).toBe('baseHalfAngle_deg');
  });

  it('checks planar3 bases the same way', () => {
    const b = structuredClone(demoPlanar3Base);
    b.baseJoints_m[2] = [...b.baseJoints_m[0]!];
    expect(issuesOf(b)[0]).toMatchObject({ path: 'baseJoints_m[2]' });
    const s = structuredClone(demoPlanar3Base);
    s.leg = { ...s.leg, min_m: 0.5, max_m: 1.0 };
    expect(issuesOf(s)[0]).toMatchObject({
      path: 'platformJoints_m',
      message: expect.stringMatching(/leg 1 is 1\.77\d+ m long/),
    });
  });
});
