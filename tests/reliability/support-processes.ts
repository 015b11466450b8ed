import { type ChildProcess, spawn } from 'node:child_process';
import { join } from 'node:path';

export const repoRoot = join(import.meta.dirname, '..', '..');

/** A TypeScript entry point (relative to the repository) as a child process under tsx, its output collected. */
export interface Child {
  process: ChildProcess;
  output: () => string;
}

export function startChild(entry: string, env: NodeJS.ProcessEnv, args: string[] = []): Child {
  const child = spawn(process.execPath, ['--import', 'tsx', join(repoRoot, entry), ...args], {
    cwd: repoRoot,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout!.on('data', (c: Buffer) => (output += c.toString()));
  child.stderr!.on('data', (c: Buffer) => (output += c.toString()));
  return { process: child, output: () => output };
}

/** Resolves when the child has exited (at once if it has). */
export function exited(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
  return new Promise((resolve) => child.once('exit', () => resolve()));
}

/** kill -9, and wait for the process to be gone. */
export async function killHard(child: ChildProcess): Promise<void> {
  if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
  await exited(child);
}

/** Polls `probe` every 50 ms until it gives a truthy value; fails after `timeoutMs` saying what it waited for. */
export async function until<T>(what: string, probe: () => Promise<T | undefined | null | false>, timeoutMs = 60_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await probe();
    if (v) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}
