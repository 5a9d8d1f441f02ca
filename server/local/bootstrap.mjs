#!/usr/bin/env node
// Entry point of `npm start`, `npm run dev` and `npm test` on a bare machine. Plain JavaScript with
// no dependencies, because it runs before node_modules exists: it installs what is missing, then
// hands over to server/local/run.ts.
import { spawnSync, spawn } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const mode = process.argv[2] ?? 'start';

const [major, minor] = process.versions.node.split('.').map(Number);
if (major < 20 || (major === 20 && minor < 19)) {
  console.error(`Legwork needs Node.js 20.19 or newer; this is ${process.versions.node}.`);
  process.exit(1);
}

const modules = join(root, 'node_modules');
const lock = join(root, 'package-lock.json');
const stamp = join(modules, '.package-lock.json');
const stale =
  !existsSync(stamp) || (existsSync(lock) && statSync(lock).mtimeMs > statSync(stamp).mtimeMs + 1000);
if (!existsSync(modules) || stale) {
  console.log('legwork: installing node modules (npm ci) ...');
  const r = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) {
    console.error('legwork: npm ci failed; see the output above.');
    process.exit(r.status ?? 1);
  }
}

const tsx = join(modules, '.bin', 'tsx');
const child = spawn(tsx, [join(root, 'server', 'local', 'run.ts'), mode, ...process.argv.slice(3)], {
  cwd: root,
  stdio: 'inherit',
  // The AWS SDK warns on every start that releases after early 2027 will need Node 22; the versions
  // in package-lock.json are pinned, so the notice says nothing about this install.
  env: { AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true', ...process.env },
});
// Forward stops to the child (it ignores a repeated signal, so Ctrl-C reaching the whole process
// group as well does no harm) and wait for it to clean up.
for (const sig of ['SIGINT', 'SIGTERM', 'SIGHUP']) process.on(sig, () => child.kill(sig));
child.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
