// Compiles the `legwork` command (server/cli/legwork.ts and everything it imports) into one ES module,
// dist/legwork.mjs, with esbuild. The bin shim calls build() when the bundle is missing or older than
// any of its inputs; `npm run build` calls it too. The bundle's inputs are listed beside it
// (dist/inputs.json) so the shim can tell when it is stale without asking esbuild.
import { mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
/** The repository root (packages/cli/..). */
export const root = resolve(here, '..', '..');
export const distDir = join(here, 'dist');
export const bundlePath = join(distDir, 'legwork.mjs');
export const inputsPath = join(distDir, 'inputs.json');

/** Builds dist/legwork.mjs; resolves to the bundle's path. Writes through temporary files, then renames. */
export async function build() {
  const { build: esbuild } = await import('esbuild');
  const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8'));
  mkdirSync(distDir, { recursive: true });
  const tmp = `${bundlePath}.${process.pid}.partial`;
  const result = await esbuild({
    entryPoints: [join(root, 'server/cli/legwork.ts')],
    outfile: tmp,
    bundle: true,
    platform: 'node',
    target: 'node20',
    format: 'esm',
    minify: false,
    sourcemap: false,
    metafile: true,
    logLevel: 'warning',
    legalComments: 'none',
    // Object storage is only reached by the server and the worker (through a dynamic import), never
    // by the command: left out of the bundle so it is neither compiled nor loaded at start-up.
    external: ['@aws-sdk/*'],
    // CommonJS dependencies inside an ES bundle may require() Node's modules.
    banner: {
      js: "import { createRequire as __legworkRequire } from 'node:module'; const require = __legworkRequire(import.meta.url);",
    },
    define: { LEGWORK_BUILD_VERSION: JSON.stringify(String(pkg.version ?? 'unknown')) },
  });
  const inputs = Object.keys(result.metafile.inputs).map((p) => relative(root, resolve(root, p)));
  inputs.push('package.json', relative(root, fileURLToPath(import.meta.url)));
  const inputsTmp = `${inputsPath}.${process.pid}.partial`;
  writeFileSync(inputsTmp, `${JSON.stringify(inputs, null, 1)}\n`);
  // The list first: a bundle newer than its list is never taken for a stale one's.
  renameSync(inputsTmp, inputsPath);
  renameSync(tmp, bundlePath);
  return bundlePath;
}

if (process.argv[1] && pathToFileURL(resolve(process.argv[1])).href === import.meta.url) {
  const out = await build();
  process.stdout.write(`legwork command compiled to ${relative(root, out)}\n`);
}
