import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { unzip } from '../../factories/zip';
import { legsCsv, releasePackageInput } from '../../factories/release-package';
import {
  buildReleasePackage,
  escapeHtml,
  type ReleasePackageInput,
} from '../../../server/pipeline/release-package';
import { packageManifestSchema } from '../../../shared/schemas/package-manifest';
import { demoHexapodBase } from '../../../shared/schemas/motion-base';

const input = (title = 'Canyon Glide'): ReleasePackageInput =>
  releasePackageInput({ track: { id: 't1', title } });

describe('release package', () => {
  it('lists every other file with its SHA-256 and size, checked by yauzl and node:crypto', async () => {
    const built = await buildReleasePackage(input());
    const files = await unzip(built.zip);
    const manifest = packageManifestSchema.parse(JSON.parse(files.get('manifest.json')!.toString('utf8')));
    expect(new Set(manifest.files.map((f) => f.name))).toEqual(
      new Set([...files.keys()].filter((n) => n !== 'manifest.json')),
    );
    for (const f of manifest.files) {
      const data = files.get(f.name)!;
      expect(createHash('sha256').update(data).digest('hex'), f.name).toBe(f.sha256);
      expect(data.length, f.name).toBe(f.size_bytes);
    }
    expect(built.name).toBe('canyon-glide-take2-north-hall-r0b7f3a9e.zip');
    // Equal input gives equal bytes.
    expect((await buildReleasePackage(input())).sha256).toBe(built.sha256);
  });

  it('float32 frames decoded by Buffer.readFloatLE from the manifest layout equal the CSV and leg minus leg.min_m in mm', async () => {
    const built = await buildReleasePackage(input());
    const files = await unzip(built.zip);
    const manifest = packageManifestSchema.parse(JSON.parse(files.get('manifest.json')!.toString('utf8')));
    const layout = manifest.controller.binary;
    const bin = files.get(layout.file)!;
    expect(bin.length).toBe(layout.frames * layout.bytesPerFrame);
    const csvRows = files.get('controller/positions_mm.csv')!.toString('utf8').trim().split('\n').slice(1);
    const legRows = legsCsv.toString('utf8').trim().split('\n').slice(1);
    expect(csvRows.length).toBe(layout.frames);
    const minM = demoHexapodBase.leg.min_m;
    for (let k = 0; k < layout.frames; k++) {
      const csv = csvRows[k]!.split(',').map(Number);
      const legs = legRows[k]!.split(',').map(Number);
      for (let j = 0; j < layout.valuesPerFrame; j++) {
        const f = bin.readFloatLE(k * layout.bytesPerFrame + j * 4);
        // float32 has a 24-bit significand (IEEE 754): relative error under 2^-24; CSV has 3 decimals.
        expect(Math.abs(f - csv[1 + j]!)).toBeLessThan(Math.abs(csv[1 + j]!) * 2 ** -23 + 0.0005);
        expect(Math.abs(f - (legs[1 + j]! - minM) * 1000)).toBeLessThan(Math.abs(f) * 2 ** -23 + 1e-9);
      }
    }
  });

  it('escapes a track title with a script tag in report.html and says plainly when no park sequence is given', async () => {
    expect(escapeHtml('<a href="x">&\'')).toBe('&#60;a href=&#34;x&#34;&#62;&#38;&#39;');
    const files = await unzip((await buildReleasePackage(input('<script>alert(1)</script>'))).zip);
    const html = files.get('report.html')!.toString('utf8');
    expect(html).not.toContain('<script>');
    expect(html).toContain('&#60;script&#62;alert(1)&#60;/script&#62;');
    expect(html).toMatch(/No park or emergency-stop sequence is given/);
    expect(html).toMatch(/ASTM F2291/);
    expect(html).not.toMatch(/<link|src=|@import/);
  });
});

describe('force series in the release package', () => {
  const seatCsv =
    'time_s,seat1_fx_mps2,seat1_fy_mps2,seat1_fz_mps2\n0.000000,0.1,0,9.80665\n0.020000,0.2,0,9.9\n0.040000,0,0,9.80665\n';
  const forceCsv = 'time_s,leg1_N,leg2_N\n0.000000,1000.5,990\n0.020000,1001,991\n0.040000,1000,990\n';
  const withSeries = (): ReleasePackageInput => {
    const i = input();
    const entry = (name: string, text: string) => ({
      name,
      sha256: createHash('sha256').update(text).digest('hex'),
      size_bytes: Buffer.byteLength(text),
    });
    i.run.summary.files = [entry('seat_force.csv', seatCsv), entry('leg_force.csv', forceCsv)];
    i.readRunFile = async (name) =>
      name === 'legs.csv'
        ? legsCsv
        : name === 'seat_force.csv'
          ? Buffer.from(seatCsv)
          : name === 'leg_force.csv'
            ? Buffer.from(forceCsv)
            : Buffer.from(`${name}\n`);
    return i;
  };

  it("carries the run's seat and leg force series as they were stored, each listed with its columns", async () => {
    const files = await unzip((await buildReleasePackage(withSeries())).zip);
    const manifest = packageManifestSchema.parse(JSON.parse(files.get('manifest.json')!.toString('utf8')));
    expect(files.get('series/seat_force.csv')!.toString('utf8')).toBe(seatCsv);
    expect(files.get('series/leg_force.csv')!.toString('utf8')).toBe(forceCsv);
    const listed = new Map(manifest.series!.map((s) => [s.file, s]));
    expect(listed.get('series/seat_force.csv')).toMatchObject({
      unit: 'm/s^2',
      rate_hz: 50,
      columns: ['seat1_fx_mps2', 'seat1_fy_mps2', 'seat1_fz_mps2'],
    });
    expect(listed.get('series/leg_force.csv')).toMatchObject({ unit: 'N', columns: ['leg1_N', 'leg2_N'] });
    // Every series named in the manifest is in the zip and in the checksummed file list.
    for (const s of manifest.series!) {
      expect(files.has(s.file), s.file).toBe(true);
      expect(
        manifest.files.some((f) => f.name === s.file),
        s.file,
      ).toBe(true);
      const header = files.get(s.file)!.toString('utf8').split('\n')[0]!.split(',');
      expect(header).toEqual(['time_s', ...s.columns]);
    }
  });

  it('leaves the force series out for a run that did not store them', async () => {
    const files = await unzip((await buildReleasePackage(input())).zip);
    const manifest = packageManifestSchema.parse(JSON.parse(files.get('manifest.json')!.toString('utf8')));
    expect(files.has('series/seat_force.csv')).toBe(false);
    expect(manifest.series!.map((s) => s.file)).toEqual(['series/leg_speed.csv', 'series/leg_accel.csv']);
  });
});
