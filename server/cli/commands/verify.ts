// `legwork verify`: checks a release package (the zip a venue downloads) against its manifest.json
// before it is loaded: every listed file's SHA-256 and size recomputed from the zip, every listed file
// present, nothing in the zip that the manifest does not list. Entries are hashed as they stream out of
// the zip, one at a time, so a package of any size is checked in little memory.

import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import type { Readable } from 'node:stream';
import { parseArgs } from 'node:util';
import yauzl from 'yauzl';
import { formatJsonPath } from '../../../shared/schemas/json-input';
import {
  MANIFEST_NAME,
  packageManifestSchema,
  type PackageManifest,
} from '../../../shared/schemas/package-manifest';
import type { CliIo } from '../io';
import { CAUTION, CliInputError, EXIT } from '../io';

export const summary = 'check a release package zip against its manifest.json: exit 0 or 5';

export const help = `Usage: legwork verify PACKAGE.zip [--sha256 HEX]

Checks a release package before it is loaded: opens the zip, reads ${MANIFEST_NAME}, recomputes the
SHA-256 and the size of every file the manifest lists and reports each file that is missing from the
zip, differs from the manifest (which of size and SHA-256, with both values), cannot be read from the
zip, or is in the zip without being listed. Prints the package's own SHA-256; with --sha256 it must
also equal HEX (the package SHA-256 shown on the release page).

Options:
  --sha256 HEX    the SHA-256 the whole zip must have (64 hexadecimal digits)
  -h, --help      this text

Exit codes: 0 every file matches, 2 bad input or usage (no such file, not a zip, no or bad
${MANIFEST_NAME}: the message names the file), 5 a file does not match (each one is named with what
differs).

A package that verifies is the package that was released, unchanged; whether its motion suits the
ride is the reviewer's and the ride engineer's judgement, not this command's.
${CAUTION}
`;

/** The manifest itself is read into memory; anything larger than this is not one of ours. */
const MANIFEST_MAX_BYTES = 16 * 1024 * 1024;

/** What the zip holds under one name: its size and SHA-256 as read, or why it could not be read. */
type EntryReading =
  | { ok: true; size_bytes: number; sha256: string; count: number }
  | { ok: false; reason: string; count: number };

/** One problem with one file of the package. */
export interface VerifyProblem {
  name: string;
  problem: string;
}

export interface VerifyReport {
  manifest: PackageManifest;
  /** Files listed in the manifest. */
  listed: number;
  problems: VerifyProblem[];
  /** The whole zip's SHA-256 and size. */
  sha256: string;
  size_bytes: number;
}

function openZip(path: string): Promise<yauzl.ZipFile> {
  return new Promise((resolve, reject) => {
    yauzl.open(
      path,
      {
        lazyEntries: true,
        autoClose: true,
        decodeStrings: true,
        validateEntrySizes: true,
        strictFileNames: true,
      },
      (err, zip) => (err || !zip ? reject(err ?? new Error('no zip')) : resolve(zip)),
    );
  });
}

function openEntry(zip: yauzl.ZipFile, entry: yauzl.Entry): Promise<Readable> {
  return new Promise((resolve, reject) => {
    zip.openReadStream(entry, (err, stream) =>
      err || !stream ? reject(err ?? new Error('no stream')) : resolve(stream),
    );
  });
}

/** Streams an entry through SHA-256; keeps the bytes too when `keep` (the manifest). */
async function readEntry(
  zip: yauzl.ZipFile,
  entry: yauzl.Entry,
  keep: boolean,
): Promise<{ size_bytes: number; sha256: string; bytes: Buffer | null }> {
  const stream = await openEntry(zip, entry);
  const hash = createHash('sha256');
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of stream as AsyncIterable<Buffer>) {
    hash.update(chunk);
    size += chunk.length;
    if (keep) {
      if (size > MANIFEST_MAX_BYTES) {
        stream.destroy();
        throw new Error(`larger than ${MANIFEST_MAX_BYTES} bytes`);
      }
      chunks.push(chunk);
    }
  }
  return { size_bytes: size, sha256: hash.digest('hex'), bytes: keep ? Buffer.concat(chunks) : null };
}

async function fileSha256(path: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(path) as AsyncIterable<Buffer>) hash.update(chunk);
  return hash.digest('hex');
}

/** Reads every entry of the zip: name -> reading, and the manifest's bytes. Throws CliInputError for a zip it cannot walk. */
async function readPackage(
  path: string,
): Promise<{ entries: Map<string, EntryReading>; manifest: Buffer | null }> {
  let zip: yauzl.ZipFile;
  try {
    zip = await openZip(path);
  } catch (e) {
    throw new CliInputError(`${path}: not a zip file (${(e as Error).message})`);
  }
  const entries = new Map<string, EntryReading>();
  let manifest: Buffer | null = null;
  let manifestError: string | null = null;
  await new Promise<void>((resolve, reject) => {
    zip.on('error', (e: Error) => reject(new CliInputError(`${path}: not a readable zip: ${e.message}`)));
    zip.on('end', () => resolve());
    zip.on('entry', (entry: yauzl.Entry) => {
      const name = entry.fileName;
      // Folders carry no bytes; a package lists files only.
      if (name.endsWith('/') && entry.uncompressedSize === 0) {
        zip.readEntry();
        return;
      }
      const earlier = entries.get(name);
      if (earlier) {
        earlier.count += 1;
        zip.readEntry();
        return;
      }
      const isManifest = name === MANIFEST_NAME;
      readEntry(zip, entry, isManifest).then(
        (r) => {
          entries.set(name, { ok: true, size_bytes: r.size_bytes, sha256: r.sha256, count: 1 });
          if (isManifest) manifest = r.bytes;
          zip.readEntry();
        },
        (e: unknown) => {
          const reason = (e as Error).message;
          entries.set(name, { ok: false, reason, count: 1 });
          if (isManifest) manifestError = reason;
          zip.readEntry();
        },
      );
    });
    zip.readEntry();
  });
  if (manifestError !== null) {
    throw new CliInputError(`${path}: ${MANIFEST_NAME} cannot be read from the zip: ${manifestError}`);
  }
  return { entries, manifest };
}

/** Parses manifest.json; every problem names the package, the manifest and the field. */
function parseManifest(path: string, bytes: Buffer): PackageManifest {
  let json: unknown;
  try {
    json = JSON.parse(bytes.toString('utf8'));
  } catch (e) {
    throw new CliInputError(`${path}: ${MANIFEST_NAME} is not valid JSON: ${(e as Error).message}`);
  }
  const r = packageManifestSchema.safeParse(json);
  if (!r.success) {
    const lines = r.error.issues.map((i) => `  ${formatJsonPath(i.path) || '(root)'}: ${i.message}`);
    throw new CliInputError(`${path}: ${MANIFEST_NAME} is not a package manifest:\n${lines.join('\n')}`);
  }
  const seen = new Set<string>();
  for (const [i, f] of r.data.files.entries()) {
    if (f.name === MANIFEST_NAME) {
      throw new CliInputError(`${path}: ${MANIFEST_NAME} files[${i}]: lists ${MANIFEST_NAME} itself`);
    }
    if (seen.has(f.name)) {
      throw new CliInputError(`${path}: ${MANIFEST_NAME} files[${i}]: "${f.name}" is listed twice`);
    }
    seen.add(f.name);
  }
  return r.data;
}

/** Checks the package at `path`; bad input (not a zip, no or bad manifest) throws CliInputError. */
export async function verifyPackage(path: string): Promise<VerifyReport> {
  try {
    const s = await stat(path);
    if (s.isDirectory()) throw new CliInputError(`${path}: is a directory, expected a zip file`);
  } catch (e) {
    if (e instanceof CliInputError) throw e;
    const code = (e as { code?: string }).code;
    throw new CliInputError(
      code === 'ENOENT' ? `${path}: no such file` : `${path}: cannot read: ${(e as Error).message}`,
    );
  }
  const { entries, manifest: manifestBytes } = await readPackage(path);
  if (!manifestBytes) throw new CliInputError(`${path}: no ${MANIFEST_NAME} in the zip`);
  const manifest = parseManifest(path, manifestBytes);

  const problems: VerifyProblem[] = [];
  const listed = new Set(manifest.files.map((f) => f.name));
  for (const f of manifest.files) {
    const got = entries.get(f.name);
    if (!got) {
      problems.push({ name: f.name, problem: 'missing from the zip' });
      continue;
    }
    if (got.count > 1) {
      problems.push({
        name: f.name,
        problem: `in the zip ${got.count} times (a package holds each file once)`,
      });
      continue;
    }
    if (!got.ok) {
      problems.push({ name: f.name, problem: `cannot be read from the zip: ${got.reason}` });
      continue;
    }
    const differs: string[] = [];
    if (got.size_bytes !== f.size_bytes) {
      differs.push(`size is ${got.size_bytes} bytes, ${MANIFEST_NAME} says ${f.size_bytes}`);
    }
    if (got.sha256 !== f.sha256) {
      differs.push(`SHA-256 is ${got.sha256}, ${MANIFEST_NAME} says ${f.sha256}`);
    }
    if (differs.length > 0) problems.push({ name: f.name, problem: `differs: ${differs.join('; ')}` });
  }
  for (const [name, got] of entries) {
    if (name === MANIFEST_NAME) {
      if (got.count > 1) {
        problems.push({ name, problem: `in the zip ${got.count} times (a package holds each file once)` });
      }
      continue;
    }
    if (!listed.has(name)) problems.push({ name, problem: `in the zip but not listed in ${MANIFEST_NAME}` });
  }
  const s = await stat(path);
  return {
    manifest,
    listed: manifest.files.length,
    problems,
    sha256: await fileSha256(path),
    size_bytes: s.size,
  };
}

/** Runs `legwork verify`; resolves to 0 (all match) or 5 (a mismatch); bad input throws CliInputError for 2. */
export async function run(argv: string[], io: CliIo): Promise<number> {
  const options = { sha256: { type: 'string' }, help: { type: 'boolean', short: 'h' } } as const;
  let parsed;
  try {
    parsed = parseArgs({ args: argv, options, allowPositionals: true, strict: true });
  } catch (e) {
    throw new CliInputError((e as Error).message);
  }
  if (parsed.values.help) {
    io.stdout(help);
    return EXIT.ok;
  }
  const [path, ...extra] = parsed.positionals;
  if (path === undefined || path === '') {
    throw new CliInputError('missing PACKAGE.zip');
  }
  if (extra.length > 0) {
    throw new CliInputError(`Unexpected argument '${extra[0]}': verify checks one package at a time`);
  }
  const expected = parsed.values.sha256;
  if (expected !== undefined && !/^[0-9a-fA-F]{64}$/.test(expected)) {
    throw new CliInputError(`--sha256: "${expected}" is not a SHA-256 (64 hexadecimal digits)`);
  }

  const report = await verifyPackage(path);
  const problems = [...report.problems];
  if (expected !== undefined && expected.toLowerCase() !== report.sha256) {
    problems.unshift({
      name: path,
      problem: `the package's SHA-256 is ${report.sha256}, --sha256 says ${expected.toLowerCase()}`,
    });
  }
  const m = report.manifest;
  const about =
    `  release ${m.release.id}, released ${m.release.releasedAt} by ${m.release.releasedBy.name}\n` +
    `  ${m.track.title}, take ${m.take.number}, for ${m.venue.name}\n` +
    `  package SHA-256 ${report.sha256}, ${report.size_bytes} bytes\n`;
  if (problems.length === 0) {
    io.stdout(`${path}: all ${report.listed} files match ${MANIFEST_NAME}\n${about}`);
    return EXIT.ok;
  }
  const lines = problems.map((p) => `  ${p.name}: ${p.problem}`);
  io.stderr(
    `legwork verify: ${path}: ${problems.length} ${problems.length === 1 ? 'problem' : 'problems'} ` +
      `against ${MANIFEST_NAME} (${report.listed} files listed); do not load this package:\n` +
      `${lines.join('\n')}\n${about}`,
  );
  return EXIT.mismatch;
}
