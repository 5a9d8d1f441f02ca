import { describe, expect, it } from 'vitest';
import {
  CUEING_PROFILE_VERSION,
  DEFAULT_CUEING_PROFILE,
  defaultCueingProfile,
  parseCueingProfile,
  parseCueingProfileJson,
} from '../../../shared/schemas/cueing-profile';

describe('default cueing profile', () => {
  it('validates and carries the version', () => {
    const p = defaultCueingProfile();
    expect(p.version).toBe(CUEING_PROFILE_VERSION);
    expect(p.name).toMatch(/common practice/);
  });

  it('limits the tilt rate to 3 deg/s', () => {
    // Groen and Bles 2004 (J. Vestib. Res. 14(5)); docs/motion-conventions.md section 4 default.
    expect(defaultCueingProfile().tilt.rateLimit_degps).toBe(3);
  });

  it('uses a third-order translational high-pass on every axis', () => {
    // docs/motion-conventions.md section 4: so a sustained input washes out to neutral.
    const t = defaultCueingProfile().translational;
    expect([t.x.order, t.y.order, t.z.order]).toEqual([3, 3, 3]);
  });

  it('fills sections left out of a file from the defaults', () => {
    const r = parseCueingProfileJson(
      '{ "version": 1, "name": "Canyon drop, gentle", "tilt": { "lowPassFrequency_radps": 4, "damping": 0.9, "rateLimit_degps": 2.5, "angleLimit_deg": 8 } }',
    );
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.profile.tilt.rateLimit_degps).toBe(2.5);
    expect(r.profile.scale).toEqual(DEFAULT_CUEING_PROFILE.scale);
  });
});

describe('bad profiles', () => {
  it('names every bad field by its path', () => {
    const r = parseCueingProfile({
      version: 1,
      name: 'x',
      scale: { ...DEFAULT_CUEING_PROFILE.scale, heave: -1 },
      translational: { ...DEFAULT_CUEING_PROFILE.translational, y: { order: 4 } },
      poseLimit: { ...DEFAULT_CUEING_PROFILE.poseLimit, pitch_deg: 80 },
    });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const paths = r.issues.map((i) => i.path);
    expect(paths).toEqual(
      expect.arrayContaining(['scale.heave', 'translational.y.order', 'poseLimit.pitch_deg']),
    );
  });

  it('rejects unknown keys so that a misspelt field is not silently ignored', () => {
    const r = parseCueingProfile({
      version: 1,
      name: 'x',
      tilt: { ...DEFAULT_CUEING_PROFILE.tilt, rateLimit_degs: 2 },
    });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.issues[0]?.path).toBe('tilt');
    if (!r.ok) expect(r.issues[0]?.message).toMatch(/rateLimit_degs/);
  });

  it('rejects another format version', () => {
    const r = parseCueingProfile({ version: 2, name: 'x' });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.issues.map((i) => i.path)).toContain('version');
  });

  it('gives the line and column of a bad value in JSON text', () => {
    const text = '{\n  "version": 1,\n  "name": "x",\n  "riderReference_m": [0, 0, "high"]\n}';
    const r = parseCueingProfileJson(text);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues[0]).toMatchObject({ path: 'riderReference_m[2]', line: 4, column: 30 });
  });

  it('gives the line and column of a JSON syntax error', () => {
    const r = parseCueingProfileJson('{\n  "version": 1,\n  "name": "x",\n}');
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues[0]?.message).toMatch(/not valid JSON/);
    expect(r.issues[0]?.line).toBe(4);
  });

  it('points a missing field at its enclosing object', () => {
    const r = parseCueingProfileJson('{ "version": 1,\n "name": "x",\n "scale": { "surge": 1 } }');
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const sway = r.issues.find((i) => i.path === 'scale.sway');
    expect(sway).toMatchObject({ message: 'required field is missing', line: 3, column: 11 });
  });
});

describe('wrong types', () => {
  it('says what type was found, not that the field is missing', () => {
    const r = parseCueingProfile({
      version: 1,
      name: 'x',
      tilt: { ...DEFAULT_CUEING_PROFILE.tilt, rateLimit_degps: 'fast' },
    });
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.issues[0]).toMatchObject({
        path: 'tilt.rateLimit_degps',
        message: expect.stringMatching(/expected number, received string/),
      });
  });
});
