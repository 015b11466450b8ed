import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { say, SetupError } from './log';

function newestMtime(path: string): number {
  if (!existsSync(path)) return 0;
  const st = statSync(path);
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = st.mtimeMs;
  for (const entry of readdirSync(path)) {
    if (entry === 'node_modules' || entry === 'dist') continue;
    newest = Math.max(newest, newestMtime(join(path, entry)));
  }
  return newest;
}

/** Builds the web app with Vite unless web/dist is newer than every source it is built from. */
export function buildWebIfStale(root: string): void {
  const built = join(root, 'web', 'dist', 'index.html');
  const sources = [join(root, 'web'), join(root, 'shared', 'src'), join(root, 'package-lock.json')];
  if (existsSync(built) && statSync(built).mtimeMs > Math.max(...sources.map(newestMtime))) return;
  say('building the web app (vite build) ...');
  const r = spawnSync('npm', ['run', '-s', 'build', '-w', 'web'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) throw new SetupError('building the web app failed; see the messages above');
}
