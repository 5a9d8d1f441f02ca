// `legwork process --touchup`: the touch-up reaches the package through the whole pipeline, and a bad
// touch-up file exits 2 with a message naming the field. The expected effects are the definitions of the
// operations in shared/schemas/touchup.ts: a gain multiplies the departure from rest, a trim keeps only
// the span between trimIn_s and trimOut_s.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cliSandbox } from '../../factories/cli';
import { demoHexapodInput } from '../../../shared/schemas/motion-base';
import { makePoseTrackFrom, poseTrackCsv, smoothStep } from '../budget/track-builders';

const { dir, file, run } = cliSandbox('legwork-touchup-');

function readPose(folder: string): { names: string[]; rows: number[][] } {
  const lines = readFileSync(join(folder, 'pose.csv'), 'utf8').trim().split('\n');
  const names = (lines[0] as string).split(',');
  return { names, rows: lines.slice(1).map((l) => l.split(',').map(Number)) };
}

const basePath = file('base.json', JSON.stringify(demoHexapodInput, null, 2));
// A gentle heave lift and sway that start and end at neutral, at rest.
const takePath = file(
  'take.csv',
  poseTrackCsv(
    makePoseTrackFrom(100, 12, (t) => [
      0,
      0.03 * Math.sin(Math.PI * t) * (smoothStep(t, 0, 2) - smoothStep(t, 10, 12)),
      0.1 * (smoothStep(t, 1, 4) - smoothStep(t, 8, 11)),
      0,
      0,
      0,
    ]),
  ),
);

async function processWith(name: string, touchup?: object): Promise<{ names: string[]; rows: number[][] }> {
  const out = join(dir, name);
  const extra = touchup ? ['--touchup', file(`${name}.json`, JSON.stringify(touchup))] : [];
  const r = await run('process', '--base', basePath, '--in', takePath, '--out', out, ...extra);
  expect(r.err).toBe('');
  // A trim that cuts the take mid-motion can step it (exit 4); the package is written either way.
  expect([0, 3, 4]).toContain(r.code);
  return readPose(out);
}

describe('legwork process --touchup', () => {
  it('a gain of 0.5 on heave halves the heave the package plays and leaves sway alone', async () => {
    const plain = await processWith('plain');
    const half = await processWith('half', { gain: { z: 0.5 } });
    const z = plain.names.findIndex((n) => n.startsWith('z'));
    const y = plain.names.findIndex((n) => n.startsWith('y'));
    expect(z).toBeGreaterThan(0);
    expect(half.rows.length).toBe(plain.rows.length);
    let peak = 0;
    for (let i = 0; i < plain.rows.length; i++) {
      const p = plain.rows[i] as number[];
      const h = half.rows[i] as number[];
      peak = Math.max(peak, Math.abs(p[z] as number));
      expect(h[z]).toBeCloseTo(0.5 * (p[z] as number), 6);
      expect(h[y]).toBeCloseTo(p[y] as number, 9);
    }
    expect(peak).toBeGreaterThan(0.05);
    // The manifest records the touch-up that was applied; a package without one says null.
    const manifest = (name: string) =>
      JSON.parse(readFileSync(join(dir, name, 'manifest.json'), 'utf8')) as {
        touchup: { file: string; parameters: { gain: Record<string, number> } } | null;
      };
    expect(manifest('plain').touchup).toBeNull();
    expect(manifest('half').touchup?.file).toBe('half.json');
    expect(manifest('half').touchup?.parameters.gain).toEqual({ z: 0.5 });
  });

  it('a trim from 3 s to 9 s leaves a package 6 s long', async () => {
    const plain = await processWith('plain2');
    const trimmed = await processWith('trim', { trimIn_s: 3, trimOut_s: 9 });
    const span = (rows: number[][]) => (rows.at(-1) as number[])[0]! - (rows[0] as number[])[0]!;
    expect(span(plain.rows)).toBeCloseTo(12, 1);
    expect(span(trimmed.rows)).toBeCloseTo(6, 1);
  });

  it('fades of 1 s bring a take that starts and ends off neutral to neutral at its first and last frames', async () => {
    // Raised-cosine fade to rest (pose rest = neutral, offset 0): weight 0 at the ends by definition.
    const offPath = file('off.csv', poseTrackCsv(makePoseTrackFrom(100, 8, () => [0, 0.02, 0, 0, 0, 0])));
    const out = join(dir, 'faded');
    const tu = file('faded.json', JSON.stringify({ fadeIn_s: 1, fadeOut_s: 1 }));
    const r = await run('process', '--base', basePath, '--in', offPath, '--out', out, '--touchup', tu);
    expect(r.err).toBe('');
    const pose = readPose(out);
    const y = pose.names.findIndex((n) => n.startsWith('y'));
    expect(Math.abs((pose.rows[0] as number[])[y] as number)).toBeLessThan(1e-4);
    expect(Math.abs((pose.rows.at(-1) as number[])[y] as number)).toBeLessThan(1e-4);
    const mid = pose.rows[pose.rows.length >> 1] as number[];
    expect(mid[y]).toBeCloseTo(0.02, 4);
  });

  it('exits 2 for a bad touch-up file, naming the field', async () => {
    const bad = file('bad.json', JSON.stringify({ gain: { z: -1 } }));
    const r = await run(
      'process',
      '--base',
      basePath,
      '--in',
      takePath,
      '--out',
      join(dir, 'never'),
      '--touchup',
      bad,
    );
    expect(r.code).toBe(2);
    expect(r.err).toContain('bad.json');
    expect(r.err).toContain('gain.z');
  });

  it('exits 2 for an unknown touch-up field, naming it', async () => {
    const bad = file('odd.json', JSON.stringify({ gian: { z: 1 } }));
    const r = await run(
      'process',
      '--base',
      basePath,
      '--in',
      takePath,
      '--out',
      join(dir, 'never2'),
      '--touchup',
      bad,
    );
    expect(r.code).toBe(2);
    expect(r.err).toContain('gian');
  });
});
