// The package's force series, decoded from the files `legwork process` writes: each seat's specific
// force (seat_force.csv) and each leg's axial force (leg_force.csv, a base with a payload), at the
// controller rate, listed in the manifest. Expected values come from outside the code:
// - specific force f = a - g (g = (0, 0, -g0)), so a platform at rest gives (0, 0, +g0) at every seat
//   and a pure heave z(t) = A sin(w t) gives fz = g0 - A w^2 sin(w t) (rigid-body kinematics,
//   common practice for motion-base cueing);
// - at neutral and at rest a symmetric six-leg base shares the payload's weight equally:
//   f = m g0 / (6 cos beta), cos beta = h / L with L from plane geometry (statics of a Stewart platform).
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cliSandbox } from '../../factories/cli';
import { demoHexapodInput } from '../../../shared/schemas/motion-base';
import { makePoseTrackFrom, poseTrackCsv, type PoseFn } from '../budget/track-builders';

const { dir, file, run } = cliSandbox('legwork-series-');
const G0 = 9.80665; // standard gravity (CGPM 1901)
const DEG = Math.PI / 180;
const payload = { mass_kg: 800, centreOfMass_m: [0, 0, 0.9], inertia_kgm2: [300, 320, 400, 0, 0, 0] };
const base = { ...demoHexapodInput, payload };
const basePath = file('base.json', JSON.stringify(base));

function csv(path: string): { names: string[]; rows: number[][] } {
  const lines = readFileSync(path, 'utf8').trim().split('\n');
  return { names: lines[0]!.split(','), rows: lines.slice(1).map((l) => l.split(',').map(Number)) };
}

async function processPose(name: string, f: PoseFn, duration_s = 10) {
  const take = file(`${name}.csv`, poseTrackCsv(makePoseTrackFrom(200, duration_s, f)));
  const out = join(dir, name);
  const r = await run('process', '--base', basePath, '--in', take, '--out', out);
  expect(r.err).toBe('');
  const manifest = JSON.parse(readFileSync(join(out, 'manifest.json'), 'utf8')) as {
    files: { name: string }[];
  };
  return { out, manifest };
}

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

describe('force series in the package', () => {
  it('at rest: every seat feels (0, 0, g0) and every leg carries m g0 / (6 cos beta)', async () => {
    const { out, manifest } = await processPose('rest', () => [0, 0, 0, 0, 0, 0], 4);
    expect(manifest.files.map((f) => f.name)).toEqual(
      expect.arrayContaining(['seat_force.csv', 'leg_force.csv']),
    );
    const seats = csv(join(out, 'seat_force.csv'));
    const seatCount = demoHexapodInput.seats_m.length;
    expect(seats.names).toEqual([
      'time_s',
      ...Array.from({ length: seatCount }, (_, s) =>
        ['x', 'y', 'z'].map((a) => `seat${s + 1}_f${a}_mps2`),
      ).flat(),
    ]);
    // At the controller rate: the same time column as legs.csv.
    const legs = csv(join(out, 'legs.csv'));
    expect(seats.rows.map((r) => r[0])).toEqual(legs.rows.map((r) => r[0]));
    expect(seats.rows[1]![0]! - seats.rows[0]![0]!).toBeCloseTo(1 / demoHexapodInput.controllerRate_hz, 6);
    for (const row of seats.rows) {
      for (let s = 0; s < seatCount; s++) {
        expect(Math.abs(row[1 + 3 * s]!)).toBeLessThan(1e-6);
        expect(Math.abs(row[2 + 3 * s]!)).toBeLessThan(1e-6);
        expect(row[3 + 3 * s]).toBeCloseTo(G0, 5);
      }
    }
    const forces = csv(join(out, 'leg_force.csv'));
    expect(forces.names).toEqual(['time_s', 'leg1_N', 'leg2_N', 'leg3_N', 'leg4_N', 'leg5_N', 'leg6_N']);
    const share = (payload.mass_kg * G0) / (6 * neutralCosBeta());
    for (const row of forces.rows) for (let j = 1; j <= 6; j++) expect(row[j]).toBeCloseTo(share, 2);
  });

  it('in a pure heave z = A sin(w t): fz = g0 - A w^2 sin(w t) at every seat', async () => {
    const A = 0.02;
    const w = 2 * Math.PI * 0.5;
    const { out } = await processPose('heave', (t) => [0, 0, A * Math.sin(w * t), 0, 0, 0]);
    const seats = csv(join(out, 'seat_force.csv'));
    const amp = A * w * w;
    let worst = 0;
    // Away from the ends (where the take starts moving from nothing), within 0.1 % of the amplitude.
    for (const row of seats.rows) {
      const t = row[0]!;
      if (t < 1 || t > 9) continue;
      const expected = G0 - amp * Math.sin(w * t);
      for (let s = 0; s < demoHexapodInput.seats_m.length; s++) {
        worst = Math.max(worst, Math.abs(row[3 + 3 * s]! - expected));
        expect(Math.abs(row[1 + 3 * s]!)).toBeLessThan(1e-6);
      }
    }
    expect(worst).toBeLessThan(1e-3 * amp);
  });

  it('a base without a payload has no leg_force.csv in its package', async () => {
    const plain = file('plain-base.json', JSON.stringify(demoHexapodInput));
    const take = file('plain.csv', poseTrackCsv(makePoseTrackFrom(200, 2, () => [0, 0, 0, 0, 0, 0])));
    const out = join(dir, 'plain');
    await run('process', '--base', plain, '--in', take, '--out', out);
    const manifest = JSON.parse(readFileSync(join(out, 'manifest.json'), 'utf8')) as {
      files: { name: string }[];
    };
    expect(manifest.files.map((f) => f.name)).toContain('seat_force.csv');
    expect(manifest.files.map((f) => f.name)).not.toContain('leg_force.csv');
  });
});
