// A scratch folder for `legwork` command tests, and the command run in-process with its output kept.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll } from 'vitest';
import { main } from '../../server/cli/legwork';

/** A folder removed after the file's tests, a writer of files in it, and `run(...argv)`. */
export function cliSandbox(prefix: string) {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const file = (name: string, text: string): string => {
    const p = join(dir, name);
    writeFileSync(p, text);
    return p;
  };
  const run = async (...argv: string[]): Promise<{ code: number; out: string; err: string }> => {
    let out = '';
    let err = '';
    const code = await main(argv, { stdout: (t) => void (out += t), stderr: (t) => void (err += t) });
    return { code, out, err };
  };
  return { dir, file, run };
}
