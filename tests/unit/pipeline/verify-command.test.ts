// `legwork verify PACKAGE.zip`: a package built by buildReleasePackage verifies; one tampered with
// (a byte flipped in one file, a file dropped, a file added, the stored bytes damaged behind the zip's
// back) exits 5 naming each file and what differs; a file that is not a package exits 2 naming it.
// Tampered packages are rewritten with yauzl and yazl (general-purpose zip libraries) and the expected
// SHA-256 values come from node:crypto, not from the command.
import { createHash } from 'node:crypto';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { zipEntries as unzip } from '../../factories/zip';
import yazl from 'yazl';
import { cliSandbox } from '../../factories/cli';
import { legsCsv, releasePackageInput } from '../../factories/release-package';
import { buildReleasePackage, type ReleasePackageInput } from '../../../server/pipeline/release-package';

const { dir, file, run } = cliSandbox('legwork-verify-');

const input = (): ReleasePackageInput =>
  releasePackageInput({
    release: {
      id: '5c1d2e3f-1111-4222-8333-444455556666',
      releasedBy: { id: 'u1', name: 'Noor Producer', email: 'noor@example.test' },
      releasedAt: '2026-11-30T09:00:00Z',
    },
    track: { id: 't1', title: 'Lantern Falls' },
    take: { id: 'k1', number: 3, sha256: 'b'.repeat(64), filename: 'lantern-falls-take3.csv' },
    venue: { id: 'v1', name: 'Harbour Lights Dome', timeZone: 'Europe/Lisbon' },
  });

/** yazl: a zip of the given entries, deflated unless named in `stored`. */
function zipOf(entries: { name: string; data: Buffer }[], stored: string[] = []): Promise<Buffer> {
  const z = new yazl.ZipFile();
  for (const e of entries) z.addBuffer(e.data, e.name, { compress: !stored.includes(e.name) });
  z.end();
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    z.outputStream.on('data', (c: Buffer) => chunks.push(c));
    z.outputStream.on('end', () => resolve(Buffer.concat(chunks)));
    z.outputStream.on('error', reject);
  });
}

const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');

let zip: Buffer;
let entries: { name: string; data: Buffer }[];
let good: string;
const BIN = 'controller/positions_f32le.bin';

beforeAll(async () => {
  zip = (await buildReleasePackage(input())).zip;
  entries = await unzip(zip);
  good = join(dir, 'good.zip');
  writeFileSync(good, zip);
});

async function writeZip(name: string, list: { name: string; data: Buffer }[], stored: string[] = []) {
  const p = join(dir, name);
  writeFileSync(p, await zipOf(list, stored));
  return p;
}

/** The problem lines of a failed verify: "  name: problem". */
function problemLines(err: string): string[] {
  return err
    .split('\n')
    .filter((l) => /^ {2}\S/.test(l) && !/^ {2}(release|package SHA-256) /.test(l) && !l.includes(', take '));
}

describe('legwork verify', () => {
  it('passes the package as built: exit 0, every listed file counted, the zip SHA-256 printed', async () => {
    const r = await run('verify', good);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    // Every entry but manifest.json is listed (the package's contract; counted by yauzl here).
    const listed = entries.filter((e) => e.name !== 'manifest.json').length;
    expect(listed).toBeGreaterThan(5);
    expect(r.out).toContain(`all ${listed} files match manifest.json`);
    expect(r.out).toContain(`package SHA-256 ${sha256(zip)}, ${zip.length} bytes`);
    expect(r.out).toContain('Lantern Falls, take 3, for Harbour Lights Dome');
  });

  it('checks the whole zip against --sha256: the right one passes, another exits 5 naming the package', async () => {
    expect((await run('verify', good, '--sha256', sha256(zip).toUpperCase())).code).toBe(0);
    const wrong = sha256(Buffer.from('another package'));
    const r = await run('verify', good, '--sha256', wrong);
    expect(r.code).toBe(5);
    expect(r.err).toContain(`${good}: the package's SHA-256 is ${sha256(zip)}, --sha256 says ${wrong}`);
  });

  it('a byte flipped in one file, the zip rewritten with it: exit 5 naming that file and both SHA-256 values', async () => {
    const original = entries.find((e) => e.name === BIN)!.data;
    const flipped = Buffer.from(original);
    flipped[17] = (flipped[17] as number) ^ 0x01;
    const p = await writeZip(
      'flipped.zip',
      entries.map((e) => (e.name === BIN ? { name: e.name, data: flipped } : e)),
    );
    const r = await run('verify', p);
    expect(r.code).toBe(5);
    expect(r.out).toBe('');
    expect(problemLines(r.err)).toEqual([
      `  ${BIN}: differs: SHA-256 is ${sha256(flipped)}, manifest.json says ${sha256(original)}`,
    ]);
    expect(r.err).toContain('1 problem against manifest.json');
  });

  it('a file that grew: exit 5 naming the size in the zip and in the manifest', async () => {
    const report = entries.find((e) => e.name === 'report.html')!.data;
    const longer = Buffer.concat([report, Buffer.from(' ')]);
    const p = await writeZip(
      'longer.zip',
      entries.map((e) => (e.name === 'report.html' ? { name: e.name, data: longer } : e)),
    );
    const r = await run('verify', p);
    expect(r.code).toBe(5);
    expect(r.err).toContain(
      `  report.html: differs: size is ${report.length + 1} bytes, manifest.json says ${report.length}; SHA-256 is ${sha256(longer)}`,
    );
  });

  it('a listed file dropped from the zip: exit 5, "missing from the zip"', async () => {
    const p = await writeZip(
      'dropped.zip',
      entries.filter((e) => e.name !== 'series/leg_accel.csv'),
    );
    const r = await run('verify', p);
    expect(r.code).toBe(5);
    expect(problemLines(r.err)).toEqual(['  series/leg_accel.csv: missing from the zip']);
  });

  it('a file added that the manifest does not list: exit 5, named', async () => {
    const p = await writeZip('added.zip', [
      ...entries,
      { name: 'controller/extra.csv', data: Buffer.from('x\n') },
    ]);
    const r = await run('verify', p);
    expect(r.code).toBe(5);
    expect(problemLines(r.err)).toEqual([
      '  controller/extra.csv: in the zip but not listed in manifest.json',
    ]);
  });

  it('names every problem at once: a dropped, an added and a changed file', async () => {
    const p = await writeZip('three.zip', [
      ...entries
        .filter((e) => e.name !== 'pose.csv')
        .map((e) => (e.name === 'legs.csv' ? { name: e.name, data: Buffer.from('time_s,leg1_m\n') } : e)),
      { name: 'notes.txt', data: Buffer.from('hello\n') },
    ]);
    const r = await run('verify', p);
    expect(r.code).toBe(5);
    const lines = problemLines(r.err);
    expect(lines).toHaveLength(3);
    expect(lines.some((l) => l.startsWith('  legs.csv: differs: size is 14 bytes'))).toBe(true);
    expect(lines).toContain('  pose.csv: missing from the zip');
    expect(lines).toContain('  notes.txt: in the zip but not listed in manifest.json');
  });

  it('bytes damaged inside the zip with its sizes and CRC left as they were: exit 5 naming the file', async () => {
    // Stored (not deflated), so the file's bytes sit in the zip as they are and one can be flipped in place.
    const bytes = Buffer.from(await zipOf(entries, [BIN]));
    const data = entries.find((e) => e.name === BIN)!.data;
    const at = bytes.indexOf(data);
    expect(at).toBeGreaterThan(0);
    bytes[at + 40] = (bytes[at + 40] as number) ^ 0x80;
    const p = join(dir, 'damaged.zip');
    writeFileSync(p, bytes);
    const r = await run('verify', p);
    expect(r.code).toBe(5);
    const changed = Buffer.from(data);
    changed[40] = (changed[40] as number) ^ 0x80;
    expect(problemLines(r.err)).toEqual([
      `  ${BIN}: differs: SHA-256 is ${sha256(changed)}, manifest.json says ${sha256(data)}`,
    ]);
  });

  it('a file that is not a zip, a cut-off zip and a missing file: exit 2 naming the file', async () => {
    const text = file('legs.zip', legsCsv.toString('utf8'));
    let r = await run('verify', text);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`legwork verify: ${text}: not a zip file`);

    const cut = join(dir, 'cut.zip');
    writeFileSync(cut, zip.subarray(0, Math.floor(zip.length / 2)));
    r = await run('verify', cut);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`${cut}: not a zip file`);

    r = await run('verify', join(dir, 'nowhere.zip'));
    expect(r.code).toBe(2);
    expect(r.err).toContain('nowhere.zip: no such file');

    r = await run('verify', dir);
    expect(r.code).toBe(2);
    expect(r.err).toContain('is a directory');
  });

  it('no manifest, a manifest that is not JSON and one that is not a package manifest: exit 2 naming it', async () => {
    let p = await writeZip(
      'no-manifest.zip',
      entries.filter((e) => e.name !== 'manifest.json'),
    );
    let r = await run('verify', p);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`${p}: no manifest.json in the zip`);

    const others = entries.filter((e) => e.name !== 'manifest.json');
    p = await writeZip('bad-json.zip', [
      ...others,
      { name: 'manifest.json', data: Buffer.from('{"files": [') },
    ]);
    r = await run('verify', p);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`${p}: manifest.json is not valid JSON`);

    const manifest = JSON.parse(entries.find((e) => e.name === 'manifest.json')!.data.toString('utf8'));
    manifest.files[1].sha256 = 'not-a-hash';
    p = await writeZip('bad-field.zip', [
      ...others,
      { name: 'manifest.json', data: Buffer.from(JSON.stringify(manifest)) },
    ]);
    r = await run('verify', p);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`${p}: manifest.json is not a package manifest:\n  files[1].sha256:`);

    manifest.files[1] = { ...manifest.files[0] };
    p = await writeZip('twice.zip', [
      ...others,
      { name: 'manifest.json', data: Buffer.from(JSON.stringify(manifest)) },
    ]);
    r = await run('verify', p);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`manifest.json files[1]: "${manifest.files[0].name}" is listed twice`);
  });

  it('usage: no package or two, a bad --sha256 exit 2; --help documents exit 5; the command list has verify', async () => {
    let r = await run('verify');
    expect(r.code).toBe(2);
    expect(r.err).toContain('legwork verify: missing PACKAGE.zip');
    expect(r.err).toContain('Usage: legwork verify PACKAGE.zip');
    r = await run('verify', good, good);
    expect(r.code).toBe(2);
    r = await run('verify', good, '--sha256', 'abc');
    expect(r.code).toBe(2);
    expect(r.err).toContain('--sha256: "abc" is not a SHA-256');
    r = await run('verify', '--help');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/5 a file does not match/);
    expect(r.out).toMatch(/Caution: motion systems can injure/);
    r = await run('--help');
    expect(r.out).toMatch(/^ {2}verify +check a release package/m);
    expect(r.out).toMatch(/5 a package file does not match its manifest/);
  });
});
