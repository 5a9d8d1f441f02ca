// Writes a package folder: each file, then manifest.json listing every file's SHA-256 and size next to
// the parameters of the run. The manifest cannot hash itself, so it is written last and lists the others.
import { createHash } from 'node:crypto';
import { mkdir, rename, writeFile } from 'node:fs/promises';
import { join } from 'node:path';

/** One file of a package: its name inside the folder and its content (text is written as UTF-8). */
export interface PackageFile {
  name: string;
  content: string | Uint8Array;
}

/** A file's entry in the manifest. */
export interface ManifestFile {
  name: string;
  sha256: string;
  size_bytes: number;
}

/** SHA-256 (hex) of bytes or UTF-8 text. */
export function sha256Hex(content: string | Uint8Array): string {
  return createHash('sha256').update(content).digest('hex');
}

/**
 * Writes `files` into `dir` (created if missing), then manifest.json = { ...manifest, files: [...] };
 * returns the file entries. Each file goes to a temporary name first and is renamed into place, so a
 * reader never sees half a file.
 */
export async function writePackage(
  dir: string,
  files: readonly PackageFile[],
  manifest: Record<string, unknown>,
): Promise<ManifestFile[]> {
  await mkdir(dir, { recursive: true });
  const entries: ManifestFile[] = [];
  for (const f of files) {
    if (f.name === 'manifest.json' || f.name.includes('/') || f.name.includes('\\')) {
      throw new Error(`package file name not allowed: ${f.name}`);
    }
    const bytes = typeof f.content === 'string' ? Buffer.from(f.content, 'utf8') : f.content;
    await writeAtomic(join(dir, f.name), bytes);
    entries.push({ name: f.name, sha256: sha256Hex(bytes), size_bytes: bytes.byteLength });
  }
  const text = `${JSON.stringify({ ...manifest, files: entries }, null, 2)}\n`;
  await writeAtomic(join(dir, 'manifest.json'), Buffer.from(text, 'utf8'));
  return entries;
}

async function writeAtomic(path: string, bytes: Uint8Array): Promise<void> {
  const tmp = `${path}.partial`;
  await writeFile(tmp, bytes);
  await rename(tmp, path);
}
