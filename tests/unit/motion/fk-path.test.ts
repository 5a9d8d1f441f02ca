// Forward kinematics of coarse leg files: the legs of a known pose track sampled at 2 Hz change by tens
// of centimetres between samples, where one Newton solve from the previous pose can land on another
// assembly mode (the general 6-6 platform has up to 40: Raghavan 1993, Husty 1996). Following the legs
// by sub-steps must give back the pose the legs came from, at every sample; the truth is the pose
// track itself, whose leg lengths the IK tests hold to mathjs' rotationMatrix.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../../server/cli/legwork';
import { KinematicsError } from '../../../shared/motion/base-geometry';
import type { PoseColumns } from '../../../shared/motion/hexapod';
import { FK_SUBSTEP_M } from '../../../shared/motion/continuation';
import { hexapodForward, hexapodGeometry, hexapodInverse } from '../../../shared/motion/hexapod';
import { parseTrackText } from '../../../shared/motion/track-reader';
import { demoHexapodBase, demoHexapodInput } from '../../../shared/schemas/motion-base';

const g = hexapodGeometry(demoHexapodBase);
const DEG = Math.PI / 180;
const KEYS = ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad'] as const;

/** A brisk motion (about 0.5 Hz, 20 cm, 20-30 deg) sampled at 2 Hz; a single Newton solve per sample loses it. */
function coarseTrack(): { time_s: Float64Array; pose: PoseColumns } {
  const rate = 2;
  const n = 41;
  const f = 0.5255;
  const phase = 93;
  const time_s = Float64Array.from({ length: n }, (_, i) => i / rate);
  const env = (t: number) => Math.min(1, t / 1.5);
  const mk = (fn: (t: number) => number) => time_s.map((t) => env(t) * fn(t));
  return {
    time_s,
    pose: {
      x_m: mk((t) => 0.2 * Math.sin(2 * Math.PI * f * t + phase)),
      y_m: mk((t) => 0.2 * Math.sin(2 * Math.PI * f * 0.7 * t + 2 * phase)),
      z_m: mk((t) => 0.15 * Math.sin(2 * Math.PI * f * 1.3 * t)),
      roll_rad: mk((t) => 15 * DEG * Math.sin(2 * Math.PI * f * 1.1 * t + phase)),
      pitch_rad: mk((t) => 15 * DEG * Math.sin(2 * Math.PI * f * 0.9 * t + 3 * phase)),
      yaw_rad: mk((t) => 25 * DEG * Math.sin(2 * Math.PI * f * 0.8 * t + phase)),
    },
  };
}

function worstError(a: PoseColumns, b: PoseColumns): number {
  let e = 0;
  for (const k of KEYS)
    for (let i = 0; i < a[k].length; i++)
      e = Math.max(e, Math.abs((a[k][i] as number) - (b[k][i] as number)));
  return e;
}

describe('forward kinematics on a coarse (2 Hz) legs track', () => {
  const { time_s, pose } = coarseTrack();
  const legs = hexapodInverse(g, pose);

  it('changes legs by far more than one sub-step between samples (so the test exercises the path following)', () => {
    let d = 0;
    for (const l of legs)
      for (let i = 1; i < l.length; i++) d = Math.max(d, Math.abs((l[i] as number) - (l[i - 1] as number)));
    expect(d).toBeGreaterThan(20 * FK_SUBSTEP_M);
  });

  it('gives back the pose the legs came from at every sample', () => {
    const back = hexapodForward(g, legs, { time_s });
    expect(worstError(back, pose)).toBeLessThan(1e-9);
  });

  it('reaches a first sample far from neutral from the neutral pose (0.2 m surge, 10 deg pitch)', () => {
    const one = (v: number) => Float64Array.of(v, v);
    const start: PoseColumns = {
      x_m: one(0.2),
      y_m: one(0),
      z_m: one(0.05),
      roll_rad: one(0),
      pitch_rad: one(10 * DEG),
      yaw_rad: one(0),
    };
    const back = hexapodForward(g, hexapodInverse(g, start), { time_s: Float64Array.of(0, 0.5) });
    expect(worstError(back, start)).toBeLessThan(1e-9);
  });

  it('stops with a KinematicsError naming the sample when no continuous path reaches it', () => {
    const cut = legs.map((l) => l.slice());
    for (const l of cut) l[7] = 0.2; // unreachable: shorter than any pose allows
    let err: unknown;
    try {
      hexapodForward(g, cut, { time_s });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(KinematicsError);
    expect((err as KinematicsError).code).toBe('noPath');
    expect((err as KinematicsError).sampleIndex).toBe(7);
    expect((err as Error).message).toMatch(
      /^sample 7 \(t = 3\.5 s\): forward kinematics found no continuous path/,
    );
  });
});

describe('legwork fk on a coarse file', () => {
  const dir = mkdtempSync(join(tmpdir(), 'legwork-fk-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const basePath = join(dir, 'base.json');
  writeFileSync(basePath, JSON.stringify(demoHexapodInput));
  const { time_s, pose } = coarseTrack();
  const legs = hexapodInverse(g, pose);
  const csv = (cols: Float64Array[]) =>
    [
      'time_s,leg1_m,leg2_m,leg3_m,leg4_m,leg5_m,leg6_m',
      ...Array.from(time_s, (t, i) => [t, ...cols.map((c) => c[i])].join(',')),
    ].join('\n') + '\n';

  async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
    let out = '';
    let err = '';
    const code = await main(argv, { stdout: (t) => void (out += t), stderr: (t) => void (err += t) });
    return { code, out, err };
  }

  it('exits 0 with the true poses', async () => {
    const p = join(dir, 'coarse.csv');
    writeFileSync(p, csv(legs));
    const r = await run('fk', '--base', basePath, '--in', p);
    expect(r.code).toBe(0);
    const back = parseTrackText(r.out, { file: 'out.csv' });
    const cols = Object.fromEntries(
      KEYS.map((k, i) => [k, back.columns[i] as Float64Array]),
    ) as unknown as PoseColumns;
    expect(worstError(cols, pose)).toBeLessThan(1e-9);
  });

  it('exits 2 naming the line of a sample no continuous path reaches', async () => {
    const cut = legs.map((l) => l.slice());
    for (const l of cut) l[7] = 0.2;
    const p = join(dir, 'cut.csv');
    writeFileSync(p, csv(cut));
    const r = await run('fk', '--base', basePath, '--in', p);
    expect(r.code).toBe(2);
    // Sample 7 is on line 9 (the header is line 1).
    expect(r.err).toMatch(
      /cut\.csv line 9: sample 7 \(t = 3\.5 s\): forward kinematics found no continuous path/,
    );
  });
});
