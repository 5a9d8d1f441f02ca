import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { rmSync } from 'node:fs';
import { help, run } from '../../../server/cli/commands/cue';
import { CliInputError } from '../../../server/cli/io';
import { G0_MPS2 } from '../../../shared/motion/units';

const dir = mkdtempSync(join(tmpdir(), 'legwork-cue-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function file(name: string, text: string): string {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}

function capture() {
  const out: string[] = [];
  const err: string[] = [];
  return {
    io: { stdout: (t: string) => void out.push(t), stderr: (t: string) => void err.push(t) },
    out,
    err,
  };
}

/** A fictional coaster-dark-ride vehicle log: at rest, then a forward push of 0.1 g from t = 2 s, in g and deg/s columns. */
function vehicleCsv(): string {
  const rows = ['time_s,fx_g,fy_g,fz_g,wx_degps,wy_degps,wz_degps'];
  for (let i = 0; i <= 800; i++) {
    const t = i / 100;
    rows.push(`${t},${t >= 2 ? 0.1 : 0},0,1,0,0,0`);
  }
  return `${rows.join('\n')}\n`;
}

describe('legwork cue', () => {
  it('writes the pose CSV at the requested rate, starting at neutral, pitching nose-up for a forward push', async () => {
    const input = file('ride.csv', vehicleCsv());
    const outPath = join(dir, 'pose.csv');
    const c = capture();
    expect(await run(['--in', input, '--rate', '50', '--out', outPath], c.io)).toBe(0);
    const lines = readFileSync(outPath, 'utf8').trim().split('\n');
    expect(lines[0]).toBe('time_s,x_m,y_m,z_m,roll_rad,pitch_rad,yaw_rad');
    expect(lines.length).toBe(1 + 8 * 50 + 1);
    // Before the push: exactly neutral (docs/motion-conventions.md section 4).
    expect(lines[50]).toBe('0.98,0,0,0,0,0,0');
    // At the end the tilt gives the rider the scaled push through gravity (default surge gain 0.6).
    const last = lines[lines.length - 1]!.split(',').map(Number);
    expect(last[5]!).toBeLessThan(0);
    expect(Number.isFinite(last[1]!)).toBe(true);
    const tilt = -last[5]!;
    expect(tilt).toBeLessThanOrEqual(((3 * Math.PI) / 180) * 6 + 1e-12); // 3 deg/s for 6 s at most
    expect(G0_MPS2 * Math.sin(tilt)).toBeLessThanOrEqual(0.6 * 0.1 * G0_MPS2 + 1e-9);
  });

  it('refuses a pose track and explains why', async () => {
    const input = file(
      'pose.csv',
      'time_s,x_m,y_m,z_m,roll_rad,pitch_rad,yaw_rad\n0,0,0,0,0,0,0\n1,0,0,0,0,0,0\n',
    );
    await expect(run(['--in', input], capture().io)).rejects.toThrow(
      /line 1: expected a vehicle track.*found a hexapod pose track/s,
    );
  });

  it('names the file, line, column and field of a bad profile value', async () => {
    const input = file('ride2.csv', vehicleCsv());
    const profile = file(
      'p.json',
      '{\n  "version": 1,\n  "name": "Harbour Flight",\n  "scale": { "surge": 0.5, "sway": 0.5, "heave": -2, "roll": 1, "pitch": 1, "yaw": 1 }\n}\n',
    );
    const e = await run(['--in', input, '--profile', profile], capture().io).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(CliInputError);
    expect((e as Error).message).toMatch(/p\.json:4:\d+: scale\.heave: /);
  });

  it('rejects a rate that is not a number', async () => {
    await expect(run(['--in', 'x.csv', '--rate', '100Hz'], capture().io)).rejects.toThrow(/--rate/);
  });

  it('carries the safety caution in its help', async () => {
    const c = capture();
    expect(await run(['--help'], c.io)).toBe(0);
    expect(c.out.join('')).toBe(help);
    expect(help).toMatch(/never replaces/);
  });
});
