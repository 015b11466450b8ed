import { type ChildProcess, spawn } from 'node:child_process';
import { createInterface } from 'node:readline';
import { say } from './log';

interface Service {
  name: string;
  child: ChildProcess;
}

/**
 * Starts the project's processes, prefixes their output, and stops all of them (and then the
 * database) on Ctrl-C, SIGTERM or when any one of them dies. Each child gets its own process
 * group so that a stop reaches everything it spawned.
 */
export class Supervisor {
  private services: Service[] = [];
  private stopping = false;
  private readonly cleanups: Array<() => void | Promise<void>> = [];

  constructor(private readonly root: string) {
    for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
      process.on(signal, () => void this.stop(signal === 'SIGINT' ? 0 : 143, `received ${signal}`));
    }
  }

  /** Registers something to undo at stop, after the services have exited (e.g. the database). */
  onStop(fn: () => void | Promise<void>): void {
    this.cleanups.unshift(fn);
  }

  /** Starts a TypeScript entry point under tsx as a supervised service. */
  start(name: string, entry: string, env: NodeJS.ProcessEnv): ChildProcess {
    return this.startNode(name, ['--import', 'tsx', entry], env);
  }

  /** Starts `node <args>` as a supervised service (e.g. Vite's dev server). */
  startNode(name: string, args: string[], env: NodeJS.ProcessEnv): ChildProcess {
    const child = spawn(process.execPath, args, {
      cwd: this.root,
      env: { ...process.env, ...env, RATEWARDEN_SUPERVISED: '1' },
      detached: true,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    for (const stream of [child.stdout, child.stderr]) {
      if (stream) createInterface({ input: stream }).on('line', (line) => console.log(`[${name}] ${line}`));
    }
    child.on('exit', (code, signal) => {
      if (this.stopping) return;
      say(`${name} stopped unexpectedly (${signal ?? `exit code ${code}`}); stopping everything`);
      void this.stop(1, `${name} exited`);
    });
    this.services.push({ name, child });
    return child;
  }

  /** Stops every service, then runs the cleanups, then exits. Safe to call more than once. */
  async stop(exitCode: number, reason: string): Promise<never> {
    if (this.stopping) return new Promise<never>(() => {});
    this.stopping = true;
    say(`stopping (${reason}) ...`);
    await Promise.all(this.services.map((s) => terminate(s.child)));
    for (const fn of this.cleanups) {
      try {
        await fn();
      } catch (err) {
        console.error(err);
      }
    }
    say('stopped');
    process.exit(exitCode);
  }
}

/** SIGTERM to the child's process group, SIGKILL after a grace period. */
function terminate(child: ChildProcess, graceMs = 8_000): Promise<void> {
  return new Promise((resolve) => {
    if (child.exitCode !== null || child.signalCode !== null || child.pid === undefined) return resolve();
    const pid = child.pid;
    const kill = (signal: NodeJS.Signals) => {
      try {
        process.kill(-pid, signal);
      } catch {
        /* already gone */
      }
    };
    const timer = setTimeout(() => kill('SIGKILL'), graceMs);
    child.once('exit', () => {
      clearTimeout(timer);
      kill('SIGKILL'); // anything the service left in its group
      resolve();
    });
    kill('SIGTERM');
  });
}

/** Polls an HTTP URL until it answers (any status), or fails after the timeout. */
export async function waitForHttp(url: string, timeoutMs = 30_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    try {
      await fetch(url, { signal: AbortSignal.timeout(2_000) });
      return;
    } catch {
      if (Date.now() > deadline) throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`);
      await new Promise((r) => setTimeout(r, 200));
    }
  }
}
