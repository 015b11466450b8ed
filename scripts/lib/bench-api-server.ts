import { type ChildProcess, spawn } from 'node:child_process';
import net from 'node:net';
import { createInterface } from 'node:readline';
import { waitForHttp } from './supervisor';

export interface BenchServers {
  /** The API's address, e.g. http://127.0.0.1:41234/ */
  apiUrl: string;
  apiPort: number;
  stop(): Promise<void>;
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      server.close(() => resolve(typeof address === 'object' && address ? address.port : 0));
    });
  });
}

/**
 * A service's output under load can repeat one error thousands of times: each distinct line is
 * passed on once (stack frames not at all), and the repeats are counted for `summary()`.
 */
function quietLog(log: (line: string) => void) {
  const seen = new Map<string, number>();
  let stopping = false;
  return {
    line(line: string): void {
      // Requests cut off by the shutdown report their closed pool; that is not the benchmark's news.
      if (stopping || /^\[\w+\]\s+at /.test(line)) return;
      const n = (seen.get(line) ?? 0) + 1;
      seen.set(line, n);
      if (n === 1) log(line);
    },
    stopping(): void {
      stopping = true;
    },
    summary(): void {
      for (const [line, n] of seen) if (n > 1) log(`${line} (${n} times in all)`);
    },
  };
}

function startService(root: string, name: string, entry: string, env: NodeJS.ProcessEnv, log: (line: string) => void, nodeArgs: string[] = []): ChildProcess {
  const child = spawn(process.execPath, [...nodeArgs, '--import', 'tsx', entry], {
    cwd: root,
    // Supervised: the service stops by itself if this process dies (exit-with-parent.ts).
    env: { ...process.env, ...env, RATEWARDEN_SUPERVISED: '1' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  for (const stream of [child.stdout, child.stderr]) createInterface({ input: stream! }).on('line', (line) => log(`[${name}] ${line}`));
  return child;
}

function stopService(child: ChildProcess): Promise<void> {
  return new Promise((resolve) => {
    if (child.exitCode !== null || child.signalCode !== null) return resolve();
    const timer = setTimeout(() => child.kill('SIGKILL'), 8_000);
    child.once('exit', () => {
      clearTimeout(timer);
      resolve();
    });
    child.kill('SIGTERM');
  });
}

/**
 * The real API server (api/src/server.ts) on the given database, with the identity-provider
 * stand-in for sign-in, both on free loopback ports: the processes `npm start` runs, without the
 * worker (the benchmark makes its runs itself). Other settings (DB_POOL_MAX, ...) come from the
 * environment of `npm run bench`, as they would for `npm start`.
 */
export async function startApiWithIdentityProvider(root: string, databaseUrl: string, log: (line: string) => void): Promise<BenchServers> {
  const [apiPort, idpPort] = [await freePort(), await freePort()];
  const apiUrl = `http://127.0.0.1:${apiPort}/`;
  const env = {
    DATABASE_URL: databaseUrl,
    PORT: String(apiPort),
    IDP_PORT: String(idpPort),
    APP_BASE_URL: apiUrl,
    OIDC_ISSUER: `http://127.0.0.1:${idpPort}`,
    OIDC_REDIRECT_URI: `${apiUrl}auth/callback`,
  };
  const output = quietLog(log);
  const idp = startService(root, 'idp', 'api/src/stand-ins/identity-provider/main.ts', env, output.line);
  // BENCH_API_NODE_ARGS, e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof" (which Node refuses in NODE_OPTIONS): where the API spends its time under load.
  const nodeArgs = process.env.BENCH_API_NODE_ARGS?.split(' ').filter(Boolean) ?? [];
  const api = startService(root, 'api', 'api/src/server.ts', env, output.line, nodeArgs);
  const stop = async () => {
    output.stopping();
    await Promise.all([stopService(api), stopService(idp)]);
    output.summary();
  };
  try {
    await waitForHttp(`http://127.0.0.1:${idpPort}/.well-known/openid-configuration`);
    await waitForHttp(`${apiUrl}api/health`);
  } catch (err) {
    await stop();
    throw err;
  }
  return { apiUrl, apiPort, stop };
}
