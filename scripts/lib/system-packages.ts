import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { say, SetupError } from './log';

interface Requirement {
  /** Debian package that provides it. */
  pkg: string;
  present: () => boolean;
  why: string;
}

export const CHROMIUM = '/usr/bin/chromium';
/** Debian's interpreter: another python3 earlier on PATH may lack scipy. */
export const DEBIAN_PYTHON = '/usr/bin/python3';

export const testRequirements: Requirement[] = [
  { pkg: 'chromium', present: () => existsSync(CHROMIUM), why: 'browser tests' },
  {
    pkg: 'python3-scipy',
    present: () => spawnSync(DEBIAN_PYTHON, ['-c', 'import scipy.stats'], { stdio: 'ignore' }).status === 0,
    why: 'the scipy reference oracle of the statistics tests',
  },
];

/** Installs missing Debian packages when root; otherwise says exactly what to install. */
export function ensureSystemPackages(requirements: Requirement[]): void {
  const missing = requirements.filter((r) => !r.present());
  if (!missing.length) return;
  const names = missing.map((m) => m.pkg);
  if (process.getuid?.() !== 0) {
    throw new SetupError(`missing Debian packages for ${missing.map((m) => m.why).join(' and ')}: run \`sudo apt-get install -y ${names.join(' ')}\``);
  }
  say(`installing ${names.join(', ')} from Debian packages ...`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  spawnSync('apt-get', ['update', '-q'], { stdio: 'inherit', env });
  const r = spawnSync('apt-get', ['install', '-y', '-q', '--no-install-recommends', ...names], { stdio: 'inherit', env });
  const still = missing.filter((m) => !m.present());
  if (r.status !== 0 || still.length) throw new SetupError(`installing ${still.map((m) => m.pkg).join(' ')} failed; see the messages above`);
}
