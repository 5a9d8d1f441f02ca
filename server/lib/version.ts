import { readFileSync } from 'node:fs';

// Set by the compiled `legwork` bundle (packages/cli/build.mjs), whose own location is not the
// repository's; absent when running from source.
declare const LEGWORK_BUILD_VERSION: string | undefined;

/** The version field of the project's package.json, written into every package's manifest. */
export function softwareVersion(): string {
  if (typeof LEGWORK_BUILD_VERSION === 'string') return LEGWORK_BUILD_VERSION;
  const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as {
    version?: string;
  };
  return pkg.version ?? 'unknown';
}
