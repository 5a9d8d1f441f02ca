import { readFileSync } from 'node:fs';

/** The version field of the project's package.json, written into every package's manifest. */
export function softwareVersion(): string {
  const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as {
    version?: string;
  };
  return pkg.version ?? 'unknown';
}
