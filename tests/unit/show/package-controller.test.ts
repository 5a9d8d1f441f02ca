// Encoder counts, ramps and touch-up in a release package. The int32 file is decoded by an independent
// reader (Node's Buffer.readInt32LE, following only the manifest's layout) and must equal the
// definition round(mm x countsPerMm + zeroOffset_counts), mm measured from the fully retracted length;
// the counts CSV must agree with it.
import { describe, expect, it } from 'vitest';
import {
  COUNTS_BIN,
  COUNTS_CSV,
  PackageInputError,
  buildReleasePackage,
  parseLegsCsv,
} from '../../../server/pipeline/release-package';
import { packageManifestSchema } from '../../../shared/schemas/package-manifest';
import { legsCsv, releasePackageInput } from '../../factories/release-package';
import { zipEntries } from '../../factories/zip';

const encoder = { countsPerMm: 409.6, zeroOffset_counts: -2000 };
const ramp = { duration_s: 0.4, profile: 'quintic' as const };

async function built(over: Parameters<typeof releasePackageInput>[0] = {}) {
  const input = releasePackageInput(over);
  const pkg = await buildReleasePackage(input);
  const entries = new Map((await zipEntries(pkg.zip)).map((e) => [e.name, e.data]));
  const manifest = packageManifestSchema.parse(
    JSON.parse((entries.get('manifest.json') as Buffer).toString()),
  );
  return { input, entries, manifest };
}

describe('encoder counts in the package', () => {
  it('int32 frames decoded with readInt32LE from the manifest layout equal the definition and the CSV', async () => {
    const { input, entries, manifest } = await built({ controller: { encoder, ramp } });
    const counts = manifest.controller.counts;
    expect(counts).toMatchObject({ csv: COUNTS_CSV, countsPerMm: 409.6, zeroOffset_counts: -2000 });
    const layout = counts!.binary;
    expect([layout.file, layout.format, layout.unit, layout.byteOrder]).toEqual([
      COUNTS_BIN,
      'int32',
      'counts',
      'little-endian',
    ]);
    const bin = entries.get(layout.file) as Buffer;
    const { legs } = parseLegsCsv(legsCsv.toString());
    const min = input.motionBase.base.leg.min_m;
    expect(bin.length).toBe(layout.frames * layout.bytesPerFrame);
    const csvRows = (entries.get(COUNTS_CSV) as Buffer).toString().trim().split('\n');
    expect(csvRows[0]).toContain('leg1_counts');
    for (let k = 0; k < layout.frames; k++) {
      const cells = (csvRows[k + 1] as string).split(',').map(Number);
      for (let j = 0; j < layout.valuesPerFrame; j++) {
        const v = bin.readInt32LE(k * layout.bytesPerFrame + 4 * j);
        const leg = (legs[j] as Float64Array)[k] as number;
        expect(v).toBe(Math.round((leg - min) * 1000 * 409.6 - 2000));
        expect(cells[7 + j]).toBe(v);
      }
    }
  });

  it('a venue without an encoder gets millimetres only', async () => {
    const { entries, manifest } = await built({ controller: { ramp } });
    expect(manifest.controller.counts).toBeUndefined();
    expect(entries.has(COUNTS_BIN)).toBe(false);
    expect((entries.get('report.html') as Buffer).toString()).toContain('none (millimetres only)');
  });

  it('counts that overflow a signed 32-bit integer are refused with the leg and frame', async () => {
    const input = releasePackageInput({
      controller: { encoder: { countsPerMm: 409.6, zeroOffset_counts: 2_147_400_000 }, ramp },
    });
    await expect(buildReleasePackage(input)).rejects.toThrow(PackageInputError);
    await expect(buildReleasePackage(input)).rejects.toThrow(/leg1 frame 0/);
  });
});

describe('ramps and touch-up in the package', () => {
  it("the manifest gives the show's first and last frames inside the ramped files", async () => {
    const base = releasePackageInput();
    const summary = { ...base.run.summary, ramp: { in_s: 0.4, out_s: 0.4, profile: 'quintic' as const } };
    const { manifest, entries } = await built({ run: { ...base.run, summary } });
    const frames = manifest.controller.binary.frames;
    // 0.4 s at the package's 50 Hz is 20 frames of ramp at each end.
    expect(manifest.controller.ramp).toEqual({
      in_s: 0.4,
      out_s: 0.4,
      profile: 'quintic',
      showStartFrame: 20,
      showEndFrame: frames - 21,
    });
    const report = (entries.get('report.html') as Buffer).toString();
    expect(report).toContain('0.4 s in and 0.4 s out, quintic from rest');
    expect(report).toContain('start and end at neutral at rest');
  });

  it('report.html lists the touch-up the run was made with', async () => {
    const touchup = {
      offset_s: 1.5,
      trimIn_s: 2,
      gain: { fz: 0.5 },
      smoothing_hz: { wx: 4 },
      fadeIn_s: 1,
      fadeOut_s: 2,
    };
    const { entries } = await built({ touchup });
    const report = (entries.get('report.html') as Buffer).toString();
    expect(report).toContain('Touch-up of the take');
    expect(report).toContain('1.5 s');
    expect(report).toContain('fz x 0.5');
    expect(report).toContain('wx 4 Hz');
    const { entries: plain } = await built();
    expect((plain.get('report.html') as Buffer).toString()).not.toContain('Touch-up of the take');
  });
});
