// Writing a run's outputs (shared/motion/run-outputs.ts builds them) through a small sink: object
// storage for the worker, a folder for `legwork process`. Each file is hashed as it is written; the
// manifest, listing every package file's SHA-256 and size, is written last, so a reader that finds
// the manifest finds every file it lists.
import { createHash } from 'node:crypto';
import { mkdir, rename, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { RunOutputs } from '../../shared/motion/run-outputs';
import type { ManifestFile } from '../../shared/schemas/run-outputs';
import { PACKAGE_FILES, SERIES_FILE } from '../../shared/schemas/run-outputs';
import type { Storage } from '../storage';

/** Where a run's files go. `put` stores one file under its name, replacing a file of that name. */
export interface OutputSink {
  /** `bytes`: the whole file, or its pieces in order. */
  put(name: string, bytes: Uint8Array | readonly Uint8Array[], contentType: string): Promise<void>;
}

/** SHA-256 (hex) of bytes or UTF-8 text. */
export function sha256Hex(content: string | Uint8Array): string {
  return createHash('sha256').update(content).digest('hex');
}

const FILE_NAME_RE = /^[A-Za-z0-9][A-Za-z0-9._-]*$/;

/** A folder (created if missing); each file goes to a temporary name and is renamed into place. */
export function folderSink(dir: string): OutputSink {
  let made = false;
  return {
    async put(name, bytes) {
      if (!FILE_NAME_RE.test(name)) throw new Error(`output file name not allowed: ${name}`);
      if (!made) {
        await mkdir(dir, { recursive: true });
        made = true;
      }
      const path = join(dir, name);
      await writeFile(`${path}.partial`, bytes);
      await rename(`${path}.partial`, path);
    },
  };
}

/** Object storage under `prefix` (a key prefix ending in '/'). */
export function storageSink(storage: Storage, prefix: string): OutputSink {
  return {
    async put(name, bytes, contentType) {
      if (!FILE_NAME_RE.test(name)) throw new Error(`output file name not allowed: ${name}`);
      // Loaded here, not at the top: the `legwork` command imports this module and never writes storage.
      const { PutObjectCommand } = await import('@aws-sdk/client-s3');
      const body = bytes instanceof Uint8Array ? bytes : Buffer.concat(bytes);
      await storage.client.send(
        new PutObjectCommand({
          Bucket: storage.bucket,
          Key: `${prefix}${name}`,
          Body: body,
          ContentLength: body.byteLength,
          ContentType: contentType,
        }),
      );
    },
  };
}

/**
 * Writes the package files, then (with `series`) the chart series, then manifest.json listing every
 * package file's SHA-256 and size. Returns the entries of every file written, the manifest included.
 */
export async function writeRunOutputs(
  outputs: RunOutputs,
  sink: OutputSink,
  opts: { series?: boolean } = {},
): Promise<ManifestFile[]> {
  const written: ManifestFile[] = [];
  const put = async (name: string, content: string | readonly Uint8Array[], contentType: string) => {
    const bytes = typeof content === 'string' ? Buffer.from(content, 'utf8') : content;
    await sink.put(name, bytes, contentType);
    const hash = createHash('sha256');
    let size = 0;
    for (const b of bytes instanceof Uint8Array ? [bytes] : bytes) {
      hash.update(b);
      size += b.byteLength;
    }
    const entry = { name, sha256: hash.digest('hex'), size_bytes: size };
    written.push(entry);
    return entry;
  };
  const listed: ManifestFile[] = [];
  for (const f of outputs.files) listed.push(await put(f.name, f.content, f.contentType));
  if (opts.series) await put(SERIES_FILE.name, JSON.stringify(outputs.series), SERIES_FILE.contentType);
  const manifest = PACKAGE_FILES[PACKAGE_FILES.length - 1]!;
  await put(
    manifest.name,
    `${JSON.stringify({ ...outputs.manifest, files: listed }, null, 2)}\n`,
    manifest.contentType,
  );
  return written;
}
