import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { commands, main } from '../../../server/cli/legwork';
import type { CliIo } from '../../../server/cli/io';
import { parseTrackText, trackColumn } from '../../../shared/motion/track-reader';
import { hexapodGeometry, hexapodInverse } from '../../../shared/motion/hexapod';
import { demoHexapodBase } from '../../../shared/schemas/motion-base';
import { writeVehicleCsv } from '../../bench/sections/legwork-command';

const root = fileURLToPath(new URL('../../..', import.meta.url));
const fixture = (name: string) => join(root, 'tests/fixtures', name);

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const io: CliIo = { stdout: (t) => void (out += t), stderr: (t) => void (err += t) };
  const code = await main(argv, io);
  return { code, out, err };
}

describe('legwork command line', () => {
  it('lists every command with one line each and the caution', async () => {
    const r = await run('--help');
    expect(r.code).toBe(0);
    for (const name of Object.keys(commands)) expect(r.out).toMatch(new RegExp(`^  ${name} +\\S`, 'm'));
    expect(r.out).toMatch(/never replaces/);
    for (const name of Object.keys(commands)) {
      const h = await run(name, '--help');
      expect(h.code).toBe(0);
      expect(h.out).toMatch(new RegExp(`^Usage: legwork ${name} `));
    }
  });

  it('exits 2 with usage for unknown commands, unknown flags and missing options', async () => {
    expect((await run('fly')).code).toBe(2);
    const r = await run(
      'ik',
      '--base',
      fixture('base-hexapod.json'),
      '--in',
      fixture('pose-hexapod.csv'),
      '--speed',
      '3',
    );
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/Unknown option '--speed'/);
    expect(r.err).toMatch(/Usage: legwork ik/);
    expect((await run('fk', '--in', 'x.csv')).err).toMatch(/missing --base/);
  });

  it('ik writes time_s and six leg columns for a hexapod pose file in mm and deg', async () => {
    // Source: the same poses converted by hand factors (mm -> m, deg -> rad) through IK checked against mathjs
    // in hexapod.test.ts.
    const r = await run('ik', '--base', fixture('base-hexapod.json'), '--in', fixture('pose-hexapod.csv'));
    expect(r.code).toBe(0);
    expect(r.err).toBe('');
    const legs = parseTrackText(r.out, { file: 'out.csv' });
    expect(r.out.split('\n')[0]).toBe('time_s,leg1_m,leg2_m,leg3_m,leg4_m,leg5_m,leg6_m');
    const src = readFileSync(fixture('pose-hexapod.csv'), 'utf8').split('\n')[5]!.split(',').map(Number);
    const d = Math.PI / 180;
    const expected = hexapodInverse(hexapodGeometry(demoHexapodBase), {
      x_m: Float64Array.of(src[1]! / 1000),
      y_m: Float64Array.of(src[2]! / 1000),
      z_m: Float64Array.of(src[3]! / 1000),
      roll_rad: Float64Array.of(src[4]! * d),
      pitch_rad: Float64Array.of(src[5]! * d),
      yaw_rad: Float64Array.of(src[6]! * d),
    });
    expect(legs.time_s[4]).toBe(src[0]);
    for (let i = 0; i < 6; i++)
      expect(trackColumn(legs, `leg${i + 1}_m`)[4]).toBeCloseTo(expected[i]![0]!, 13);
  });

  it('fk inverts ik for both base kinds, through files', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'legwork-cli-'));
    for (const kind of ['hexapod', 'planar3']) {
      const legsPath = join(dir, `legs-${kind}.csv`);
      const posePath = join(dir, `pose-${kind}.csv`);
      expect(
        (
          await run(
            'ik',
            '--base',
            fixture(`base-${kind}.json`),
            '--in',
            fixture(`pose-${kind}.csv`),
            '--out',
            legsPath,
          )
        ).code,
      ).toBe(0);
      const r = await run('fk', '--base', fixture(`base-${kind}.json`), '--in', legsPath, '--out', posePath);
      expect(r.code).toBe(0);
      const original = parseTrackText(readFileSync(fixture(`pose-${kind}.csv`), 'utf8'), { file: 'a' });
      const back = parseTrackText(readFileSync(posePath, 'utf8'), { file: 'b' });
      expect(back.names).toEqual(original.names);
      original.columns.forEach((c, j) =>
        c.forEach((v, s) => expect(Math.abs(back.columns[j]![s]! - v)).toBeLessThan(1e-9)),
      );
    }
  });

  it('exits 2 naming file, line and column for a bad track, and the file for a bad base', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'legwork-cli-'));
    const bad = join(dir, 'pose.csv');
    writeFileSync(bad, 'time_s,x_m,y_m,z_m,roll_rad,pitch_rad,yaw_rad\n0,0,0,0,0,0,0\n0.01,0,0,0,0,1..2,0\n');
    const r = await run('ik', '--base', fixture('base-hexapod.json'), '--in', bad);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`${bad} line 3, column 6 (pitch_rad): not a number: "1..2"`);
    expect(r.out).toBe('');
    const base = join(dir, 'base.json');
    writeFileSync(base, '{\n  "kind": "hexapod",\n  "leg": }\n');
    const b = await run('ik', '--base', base, '--in', fixture('pose-hexapod.csv'));
    expect(b.code).toBe(2);
    expect(b.err).toMatch(/base\.json line 3, column 10: not valid JSON/);
    const wrongKind = await run(
      'ik',
      '--base',
      fixture('base-planar3.json'),
      '--in',
      fixture('pose-hexapod.csv'),
    );
    expect(wrongKind.code).toBe(2);
    expect(wrongKind.err).toMatch(/line 1: expected a planar-stage pose track/);
  });

  it('warns on stderr but still writes lengths outside the stroke', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'legwork-cli-'));
    const p = join(dir, 'pose.csv');
    writeFileSync(p, 'time_s,x_m,y_m,z_m,roll_rad,pitch_rad,yaw_rad\n0,0,0,0,0,0,0\n0.01,0,0,0.6,0,0,0\n');
    const r = await run('ik', '--base', fixture('base-hexapod.json'), '--in', p);
    expect(r.code).toBe(0);
    expect(r.err).toMatch(
      /warning: .*leg1 outside its stroke \[1\.5, 2\.3\] m at 1 sample\(s\), first at t = 0\.01 s \(line 3\)/,
    );
    expect(r.out.trim().split('\n')).toHaveLength(3);
  });

  it('fk exits 2 naming the line of unreachable leg lengths', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'legwork-cli-'));
    const p = join(dir, 'legs.csv');
    writeFileSync(
      p,
      'time_s,leg1_m,leg2_m,leg3_m,leg4_m,leg5_m,leg6_m\n0,1.874,1.874,1.874,1.874,1.874,1.874\n0.01,0.2,0.2,0.2,0.2,0.2,0.2\n',
    );
    const r = await run('fk', '--base', fixture('base-hexapod.json'), '--in', p);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(
      /legs\.csv line 3: sample 1 \(t = 0\.01 s\): forward kinematics found no continuous path from the previous sample/,
    );
  });

  it('is an installed command: node_modules/.bin/legwork runs the compiled bundle, npx finds it locally', () => {
    const bin = join(root, 'node_modules/.bin/legwork');
    const ok = spawnSync(
      bin,
      ['ik', '--base', 'tests/fixtures/base-planar3.json', '--in', 'tests/fixtures/pose-planar3.csv'],
      { cwd: root, encoding: 'utf8' },
    );
    expect(ok.status).toBe(0);
    expect(ok.stdout.split('\n')[0]).toBe('time_s,leg1_m,leg2_m,leg3_m');
    expect(existsSync(join(root, 'packages/cli/dist/legwork.mjs'))).toBe(true);
    const bad = spawnSync(
      bin,
      ['fk', '--base', 'tests/fixtures/base-planar3.json', '--in', 'tests/fixtures/pose-planar3.csv'],
      {
        cwd: root,
        encoding: 'utf8',
      },
    );
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/pose-planar3\.csv line 1: expected a planar-stage legs track/);
    // An unreachable registry and --no-install: npx must resolve the local bin and never ask the registry.
    const npx = spawnSync('npx', ['--no-install', 'legwork', '--help'], {
      cwd: root,
      encoding: 'utf8',
      env: { ...process.env, npm_config_registry: 'http://127.0.0.1:9/' },
    });
    expect(npx.status).toBe(0);
    expect(npx.stdout).toMatch(/^Usage: legwork <command>/);
  }, 60_000);

  it('process writes the same package with its second thread as on one thread, and as from sources', async () => {
    // Reference: the same command on one thread (the default) and in this process from the sources;
    // with LEGWORK_THREADS=1 a failed worker is an error, so the threaded run did use it.
    const dir = mkdtempSync(join(tmpdir(), 'legwork-threads-'));
    const csv = join(dir, 'ride.csv');
    writeVehicleCsv(csv, 30_000);
    const bin = join(root, 'node_modules/.bin/legwork');
    const args = (out: string) => [
      'process',
      '--base',
      fixture('base-hexapod.json'),
      '--in',
      csv,
      '--out',
      join(dir, out),
    ];
    const threaded = spawnSync(bin, args('two'), {
      cwd: root,
      encoding: 'utf8',
      env: { ...process.env, LEGWORK_THREADS: '1' },
    });
    const single = spawnSync(bin, args('one'), {
      cwd: root,
      encoding: 'utf8',
      env: { ...process.env, LEGWORK_THREADS: '0' },
    });
    expect(threaded.stderr).toBe('');
    expect([0, 3, 4]).toContain(threaded.status);
    expect(single.status).toBe(threaded.status);
    const inProcess = await run(...args('src'));
    expect(inProcess.code).toBe(threaded.status);
    const files = [
      'legs.csv',
      'pose.csv',
      'seat_force.csv',
      'findings.json',
      'spectra.json',
      'report.txt',
      'manifest.json',
    ];
    for (const f of files) {
      const two = readFileSync(join(dir, 'two', f));
      expect(two.length).toBeGreaterThan(0);
      expect(two.equals(readFileSync(join(dir, 'one', f)))).toBe(true);
      expect(two.equals(readFileSync(join(dir, 'src', f)))).toBe(true);
    }
    expect(readFileSync(join(dir, 'two', 'legs.csv'), 'utf8').split('\n').length).toBe(3000 + 2);
  }, 120_000);

  it('runs as a real process through tsx with the right exit codes', () => {
    const tsx = join(root, 'node_modules/.bin/tsx');
    const ok = spawnSync(
      tsx,
      [
        'server/cli/legwork.ts',
        'ik',
        '--base',
        'tests/fixtures/base-planar3.json',
        '--in',
        'tests/fixtures/pose-planar3.csv',
      ],
      { cwd: root, encoding: 'utf8' },
    );
    expect(ok.status).toBe(0);
    expect(ok.stdout.split('\n')[0]).toBe('time_s,leg1_m,leg2_m,leg3_m');
    const bad = spawnSync(
      tsx,
      [
        'server/cli/legwork.ts',
        'fk',
        '--base',
        'tests/fixtures/base-planar3.json',
        '--in',
        'tests/fixtures/pose-planar3.csv',
      ],
      { cwd: root, encoding: 'utf8' },
    );
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/pose-planar3\.csv line 1: expected a planar-stage legs track/);
  }, 30_000);
});
