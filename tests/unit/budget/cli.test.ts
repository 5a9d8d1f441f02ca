// `legwork check` and `legwork process` end to end on files: exit codes 0 / 2 / 3 / 4 (docs/motion-conventions.md
// section 7), error positions, and the package folder with its SHA-256 manifest.
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { cliSandbox } from '../../factories/cli';
import { checkResultSchema } from '../../../shared/schemas/findings';
import { demoHexapodInput } from '../../../shared/schemas/motion-base';
import { makeCsv } from '../../factories/motion';
import { makePoseTrackFrom, poseTrackCsv, smoothStep } from './track-builders';

const { dir, file, run } = cliSandbox('legwork-budget-');

const basePath = file('base.json', JSON.stringify(demoHexapodInput, null, 2));
const budgetText = readFileSync(new URL('../../fixtures/budget-demo.json', import.meta.url), 'utf8');
const budgetPath = file('budget.json', budgetText);
const quietPath = file('quiet.csv', poseTrackCsv(makePoseTrackFrom(100, 5, () => [0, 0, 0, 0, 0, 0])));
const liftPath = file(
  'lift.csv',
  poseTrackCsv(
    makePoseTrackFrom(100, 15, (t) => [0, 0, 0.5 * (smoothStep(t, 1, 6) - smoothStep(t, 8, 13)), 0, 0, 0]),
  ),
);
const swayPath = file(
  'sway.csv',
  // Faded in and out so that it starts and ends at neutral, at rest.
  poseTrackCsv(
    makePoseTrackFrom(100, 12, (t) => [
      0,
      0.05 * Math.sin(Math.PI * t) * (smoothStep(t, 0, 2) - smoothStep(t, 10, 12)),
      0,
      0,
      0,
      0,
    ]),
  ),
);

describe('legwork check', () => {
  it('prints findings JSON and exits 0 for a quiet track', async () => {
    const r = await run('check', '--base', basePath, '--budget', budgetPath, '--in', quietPath);
    expect(r.code).toBe(0);
    const parsed = checkResultSchema.parse(JSON.parse(r.out));
    expect(parsed.within).toBe(true);
    expect(parsed.findings).toEqual([]);
  });

  it('exits 4 over a hard limit (stroke)', async () => {
    const r = await run('check', '--base', basePath, '--budget', budgetPath, '--in', liftPath);
    expect(r.code).toBe(4);
    const parsed = checkResultSchema.parse(JSON.parse(r.out));
    expect(parsed.findings.some((f) => f.check === 'stroke' && f.subject === 'leg1')).toBe(true);
  });

  it('exits 3 over a comfort limit only', async () => {
    const strict = JSON.parse(budgetText) as { comfort: Record<string, number> };
    strict.comfort.jerkMax_mps3 = 1;
    const strictPath = file('strict.json', JSON.stringify(strict));
    const r = await run('check', '--base', basePath, '--budget', strictPath, '--in', swayPath);
    expect(r.code).toBe(3);
    const parsed = checkResultSchema.parse(JSON.parse(r.out));
    expect(parsed.findings.every((f) => f.severity === 'comfort')).toBe(true);
  });

  it('exits 2 naming file, line and column for a bad budget', async () => {
    const bad = file('bad-budget.json', budgetText.replace('"wrmsMax_mps2": 0.8', '"wrmsMax_mps2": "high"'));
    const r = await run('check', '--base', basePath, '--budget', bad, '--in', quietPath);
    expect(r.code).toBe(2);
    const lines = readFileSync(bad, 'utf8').split('\n');
    const line = lines.findIndex((l) => l.includes('"high"')) + 1;
    const column = (lines[line - 1] as string).indexOf('"high"') + 1;
    expect(r.err).toContain(`${bad}:${line}:${column}: comfort.wrmsMax_mps2: wrmsMax_mps2 must be a number`);
  });

  it('exits 2 naming the line of a bad base field', async () => {
    const broken = JSON.stringify(
      { ...demoHexapodInput, leg: { ...demoHexapodInput.leg, min_m: -1 } },
      null,
      2,
    );
    const bad = file('bad-base.json', broken);
    const r = await run('check', '--base', bad, '--budget', budgetPath, '--in', quietPath);
    expect(r.code).toBe(2);
    const line = broken.split('\n').findIndex((l) => l.includes('"min_m": -1')) + 1;
    expect(r.err).toMatch(
      new RegExp(`${bad.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}:${line}:\\d+: leg\\.min_m: `),
    );
  });

  it('exits 2 for a track with a bad number, naming line and column', async () => {
    const bad = file(
      'bad-track.csv',
      'time_s,x_m,y_m,z_m,roll_rad,pitch_rad,yaw_rad\n0,0,0,0,0,0,0\n0.01,0,zero,0,0,0,0\n',
    );
    const r = await run('check', '--base', basePath, '--budget', budgetPath, '--in', bad);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/line 3, column 3/);
  });

  it('exits 2 for a vehicle track, pointing at process', async () => {
    const v = file(
      'v.csv',
      makeCsv(
        ['time_s', 'fx_g', 'fy_g', 'fz_g', 'wx_degps', 'wy_degps', 'wz_degps'],
        [
          [0, 0, 0, 1, 0, 0, 0],
          [1, 0, 0, 1, 0, 0, 0],
        ],
      ),
    );
    const r = await run('check', '--base', basePath, '--budget', budgetPath, '--in', v);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/legwork process/);
  });

  it('prints help with the caution', async () => {
    const r = await run('check', '--help');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/never replaces/);
  });
});

describe('legwork process', () => {
  // A 30 s vehicle track at 200 Hz: gentle braking, a curve and a bump, in g and deg/s.
  const rows: number[][] = [];
  for (let i = 0; i <= 30 * 200; i++) {
    const t = i / 200;
    rows.push([
      t,
      -0.2 * smoothStep(t, 5, 7) * (1 - smoothStep(t, 12, 14)),
      0.1 * Math.sin(0.3 * t),
      1 + 0.05 * Math.sin(2 * t),
      2 * Math.sin(0.5 * t),
      0,
      8 * Math.sin(0.2 * t),
    ]);
  }
  const vehiclePath = file(
    'ride.csv',
    makeCsv(['time_s', 'fx_g', 'fy_g', 'fz_g', 'wx_degps', 'wy_degps', 'wz_degps'], rows),
  );
  const out = join(dir, 'pkg');

  it('writes the package with a manifest whose SHA-256 sums match the files', async () => {
    const r = await run(
      'process',
      '--base',
      basePath,
      '--budget',
      budgetPath,
      '--in',
      vehiclePath,
      '--out',
      out,
    );
    expect(r.err).toBe('');
    expect([0, 3, 4]).toContain(r.code);
    const manifest = JSON.parse(readFileSync(join(out, 'manifest.json'), 'utf8')) as {
      files: { name: string; sha256: string; size_bytes: number }[];
      input: { file: string; sha256: string; rows: number };
      software: { version: string };
      rates: { controller_hz: number };
      budget: { demo: boolean; sha256: string };
      profile: { default: boolean };
      result: { exitCode: number };
    };
    expect(manifest.files.map((f) => f.name).sort()).toEqual([
      'findings.json',
      'legs.csv',
      'pose.csv',
      'report.txt',
      'seat_force.csv',
      'spectra.json',
    ]);
    for (const f of manifest.files) {
      const bytes = readFileSync(join(out, f.name));
      // node:crypto's SHA-256 (FIPS 180-4) of the bytes on disk.
      expect(f.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
      expect(f.size_bytes).toBe(bytes.byteLength);
    }
    expect(manifest.input.sha256).toBe(createHash('sha256').update(readFileSync(vehiclePath)).digest('hex'));
    expect(manifest.budget.sha256).toBe(createHash('sha256').update(budgetText).digest('hex'));
    expect(manifest.input.rows).toBe(rows.length);
    expect(manifest.software.version).toBe(
      (
        JSON.parse(readFileSync(new URL('../../../package.json', import.meta.url), 'utf8')) as {
          version: string;
        }
      ).version,
    );
    expect(manifest.rates.controller_hz).toBe(100);
    expect(manifest.budget.demo).toBe(false);
    expect(manifest.profile.default).toBe(true);
    expect(manifest.result.exitCode).toBe(r.code);
  });

  it('writes legs and pose at the controller rate, and a report with the cautions', () => {
    const legs = readFileSync(join(out, 'legs.csv'), 'utf8').trim().split('\n');
    expect(legs[0]).toBe('time_s,leg1_m,leg2_m,leg3_m,leg4_m,leg5_m,leg6_m');
    expect(legs).toHaveLength(30 * 100 + 2);
    expect(legs[2]?.startsWith('0.010000,')).toBe(true);
    const report = readFileSync(join(out, 'report.txt'), 'utf8');
    expect(report).toMatch(/can injure riders and staff/);
    expect(report).toMatch(/ASTM F2291/);
    expect(report).toMatch(/EN 13814 \/\s*ISO 17842-1/);
    expect(report).toMatch(/local authority/);
    expect(report).toMatch(/whatever the venue entered/);
    const spectra = JSON.parse(readFileSync(join(out, 'spectra.json'), 'utf8')) as {
      unit: string;
      band: { low_hz: number; high_hz: number };
      axes: Record<string, { psd: number[] }>;
    };
    expect(spectra.unit).toBe('(m/s^2)^2/Hz');
    expect(spectra.band).toMatchObject({ low_hz: 0.1, high_hz: 0.5 });
    expect(spectra.axes.z?.psd.length).toBeGreaterThan(100);
  });

  it('gives the same findings when its pose.csv is checked again', async () => {
    const again = await run(
      'check',
      '--base',
      basePath,
      '--budget',
      budgetPath,
      '--in',
      join(out, 'pose.csv'),
    );
    const first = JSON.parse(readFileSync(join(out, 'findings.json'), 'utf8')) as {
      uses: { ratio: number }[];
    };
    const second = JSON.parse(again.out) as { uses: { ratio: number }[] };
    // pose.csv holds nine decimals; the re-derived ratios agree to well under 1 %.
    first.uses.forEach((u, i) =>
      expect(Math.abs((second.uses[i]?.ratio ?? NaN) - u.ratio)).toBeLessThan(0.01),
    );
  });

  it('processes a legs track through forward kinematics', async () => {
    const legsOut = join(dir, 'pkg-legs');
    const r = await run('process', '--base', basePath, '--in', join(out, 'legs.csv'), '--out', legsOut);
    expect([0, 3, 4]).toContain(r.code);
    const pose = readFileSync(join(legsOut, 'pose.csv'), 'utf8').split('\n');
    const orig = readFileSync(join(out, 'pose.csv'), 'utf8').split('\n');
    // FK(IK(pose)) returns the pose (to the legs file's nine decimals).
    const a = (pose[1500] as string).split(',').map(Number);
    const b = (orig[1500] as string).split(',').map(Number);
    a.forEach((v, k) => expect(Math.abs(v - (b[k] as number))).toBeLessThan(1e-6));
    expect(readFileSync(join(legsOut, 'report.txt'), 'utf8')).toMatch(/DEMO budget/);
  });

  it('processes a planar3 legs track (forward kinematics of the stage)', async () => {
    const fixture = (name: string) => fileURLToPath(new URL(`../../fixtures/${name}`, import.meta.url));
    const planarOut = join(dir, 'pkg-planar');
    const r = await run(
      'process',
      '--base',
      fixture('base-planar3.json'),
      '--budget',
      budgetPath,
      '--in',
      fixture('legs-planar3.csv'),
      '--out',
      planarOut,
    );
    expect(r.err).toBe('');
    expect([0, 3, 4]).toContain(r.code);
    expect(readFileSync(join(planarOut, 'pose.csv'), 'utf8').split('\n')[0]).toBe('time_s,x_m,y_m,yaw_rad');
    const findings = checkResultSchema.parse(
      JSON.parse(readFileSync(join(planarOut, 'findings.json'), 'utf8')),
    );
    expect(findings.uses.filter((u) => u.check === 'stroke').map((u) => u.subject)).toEqual([
      'leg1',
      'leg2',
      'leg3',
    ]);
  });

  it('exits 2 naming the input line where forward kinematics finds no pose', async () => {
    // Leg 1 shrinks to 0.3 m from row 52 on: no pose of the platform has legs that unequal.
    const rows: number[][] = [];
    for (let i = 0; i <= 100; i++)
      rows.push([i / 100, i >= 50 ? 0.3 : 1.874, 1.874, 1.874, 1.874, 1.874, 1.874]);
    const bad = file(
      'bad-legs.csv',
      makeCsv(['time_s', 'leg1_m', 'leg2_m', 'leg3_m', 'leg4_m', 'leg5_m', 'leg6_m'], rows),
    );
    const r = await run('process', '--base', basePath, '--in', bad, '--out', join(dir, 'never'));
    expect(r.code).toBe(2);
    // Header on line 1, so time 0.5 s sits on line 52; the smooth resampling leaves the path a little earlier.
    const m = /bad-legs\.csv line (\d+): forward kinematics failed/.exec(r.err);
    expect(m).not.toBeNull();
    expect(Number(m?.[1])).toBeGreaterThanOrEqual(50);
    expect(Number(m?.[1])).toBeLessThanOrEqual(52);
  });

  it('exits 2 without --out', async () => {
    const r = await run('process', '--base', basePath, '--in', vehiclePath);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/missing --out/);
  });
});
