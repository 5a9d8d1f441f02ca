// `legwork process --controller`: the venue controller's ramps reach the package (the first and last
// pose rows at neutral, the ramp in before the show's first sample), the settings are recorded in the
// manifest, and a bad settings file exits 2 naming the field.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cliSandbox } from '../../factories/cli';
import { demoHexapodInput } from '../../../shared/schemas/motion-base';
import { makePoseTrackFrom, poseTrackCsv } from '../budget/track-builders';

const { dir, file, run } = cliSandbox('legwork-controller-');
const basePath = file('base.json', JSON.stringify(demoHexapodInput, null, 2));
// A take held 20 mm off neutral in sway from start to end: it would jump the platform at show start.
const offPath = file('off.csv', poseTrackCsv(makePoseTrackFrom(100, 8, () => [0, 0.02, 0, 0, 0, 0])));

const rows = (folder: string, name: string) =>
  readFileSync(join(folder, name), 'utf8')
    .trim()
    .split('\n')
    .slice(1)
    .map((l) => l.split(',').map(Number));

describe('legwork process --controller', () => {
  it('ramps of 2 s put the first and last frames at neutral and clear the start and end check', async () => {
    const plainOut = join(dir, 'plain');
    const plain = await run('process', '--base', basePath, '--in', offPath, '--out', plainOut);
    expect(plain.code).toBe(4);
    const findings = (folder: string) =>
      (JSON.parse(readFileSync(join(folder, 'findings.json'), 'utf8')) as { findings: { check: string }[] })
        .findings;
    expect(findings(plainOut).some((f) => f.check === 'startEnd')).toBe(true);

    const out = join(dir, 'ramped');
    const settings = { ramp: { duration_s: 2, profile: 'quintic' }, encoder: { countsPerMm: 100 } };
    const c = file('controller.json', JSON.stringify(settings));
    const r = await run('process', '--base', basePath, '--in', offPath, '--out', out, '--controller', c);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    expect(findings(out).some((f) => f.check === 'startEnd')).toBe(false);
    const pose = rows(out, 'pose.csv');
    expect(pose[0]![0]).toBeCloseTo(-2, 6);
    expect(Math.abs(pose[0]![2]!)).toBeLessThan(1e-9);
    expect(Math.abs(pose.at(-1)![2]!)).toBeLessThan(1e-9);
    expect(pose.at(-1)![0]).toBeCloseTo(8 + 2, 6);
    const manifest = JSON.parse(readFileSync(join(out, 'manifest.json'), 'utf8')) as Record<string, unknown>;
    expect(manifest.ramp).toEqual({ in_s: 2, out_s: 2, profile: 'quintic' });
    expect(manifest.controller).toEqual({
      ramp: { duration_s: 2, profile: 'quintic' },
      encoder: { countsPerMm: 100, zeroOffset_counts: 0 },
    });
  });

  it('exits 2 for a bad controller file, naming each field', async () => {
    const bad = file(
      'bad-controller.json',
      JSON.stringify({ ramp: { duration_s: -1 }, encoder: { countsPerMm: 0 }, rampe: 1 }),
    );
    const r = await run(
      'process',
      '--base',
      basePath,
      '--in',
      offPath,
      '--out',
      join(dir, 'never'),
      '--controller',
      bad,
    );
    expect(r.code).toBe(2);
    expect(r.err).toContain('bad-controller.json');
    expect(r.err).toContain('ramp.duration_s');
    expect(r.err).toContain('encoder.countsPerMm');
    expect(r.err).toContain('rampe');
  });
});
