#!/usr/bin/env node
// The installed `legwork` command (node_modules/.bin/legwork after `npm ci`): runs the compiled bundle
// ../dist/legwork.mjs, compiling it first with esbuild when it is missing or older than any source it
// was built from, so a fresh checkout needs no separate build step.
import { readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';

const distDir = new URL('../dist/', import.meta.url);
const bundle = new URL('legwork.mjs', distDir);
const root = new URL('../../../', import.meta.url);

function stale() {
  let built;
  try {
    built = statSync(bundle).mtimeMs;
  } catch {
    return true;
  }
  let inputs;
  try {
    inputs = JSON.parse(readFileSync(new URL('inputs.json', distDir), 'utf8'));
  } catch {
    return true;
  }
  const base = root.pathname;
  for (const rel of inputs) {
    try {
      if (statSync(join(decodeURIComponent(base), rel)).mtimeMs > built) return true;
    } catch {
      return true; // an input that moved or went away: rebuild to find out.
    }
  }
  return false;
}

if (stale()) {
  const { build } = await import(new URL('../build.mjs', import.meta.url).href);
  await build();
}
const { main } = await import(pathToFileURL(decodeURIComponent(bundle.pathname)).href);
process.exitCode = await main(process.argv.slice(2));
