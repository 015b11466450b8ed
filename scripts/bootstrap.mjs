#!/usr/bin/env node
// Plain JavaScript because it runs before `npm ci` has brought TypeScript tooling: it installs
// dependencies when node_modules is missing or older than package-lock.json, then hands over to
// the TypeScript script named by its argument (start, test, dev, bench, run-now, screenshots).
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const command = process.argv[2] ?? 'start';
const installed = join(root, 'node_modules', '.package-lock.json');
const lock = join(root, 'package-lock.json');

const stale = !existsSync(installed) || statSync(installed).mtimeMs < statSync(lock).mtimeMs;
if (stale) {
  console.log('[ratewarden] installing dependencies (npm ci) ...');
  const r = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) {
    console.error('[ratewarden] npm ci failed; see the messages above.');
    process.exit(r.status ?? 1);
  }
}

const script = join(root, 'scripts', `${command}.ts`);
if (!existsSync(script)) {
  console.error(`[ratewarden] unknown command "${command}"`);
  process.exit(2);
}
const child = spawn(process.execPath, ['--import', 'tsx', script, ...process.argv.slice(3)], {
  cwd: root,
  stdio: 'inherit',
});
// The child handles SIGINT itself (it is in our process group); SIGTERM sent to us alone is passed on.
process.on('SIGINT', () => {});
process.on('SIGTERM', () => child.kill('SIGTERM'));
child.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
