import { execFileSync, spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdirSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import pg from 'pg';
import { say, SetupError } from './log';
import { assertPortFree } from './ports';

export interface PostgresOptions {
  /** Folder owned by this cluster: data, log and socket live beneath it. */
  folder: string;
  port: number;
  database: string;
  /** Test clusters trade durability for speed. */
  durable: boolean;
}

export interface RunningPostgres {
  url: string;
  stop(): void;
}

const isRoot = process.getuid?.() === 0;
const SERVICE_USER = 'postgres';

/** Finds the newest Debian PostgreSQL server; installs it when root, else explains what to install. */
function findBinDir(): string {
  const find = (): string | undefined => {
    const base = '/usr/lib/postgresql';
    if (!existsSync(base)) return undefined;
    return readdirSync(base)
      .filter((v) => existsSync(join(base, v, 'bin', 'postgres')) && existsSync(join(base, v, 'bin', 'initdb')))
      .sort((a, b) => Number(b) - Number(a))
      .map((v) => join(base, v, 'bin'))[0];
  };
  const found = find();
  if (found) return found;
  if (!isRoot) {
    throw new SetupError('PostgreSQL server is not installed: run `sudo apt-get install -y postgresql` and try again');
  }
  say('PostgreSQL server not found; installing it from Debian packages (apt-get install -y postgresql) ...');
  spawnSync('apt-get', ['update', '-q'], { stdio: 'inherit' });
  const r = spawnSync('apt-get', ['install', '-y', '-q', '--no-install-recommends', 'postgresql'], {
    stdio: 'inherit',
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
  const after = find();
  if (r.status !== 0 || !after) throw new SetupError('installing PostgreSQL with apt-get failed; see the messages above');
  return after;
}

/** Runs a server binary, as the `postgres` user when we are root (PostgreSQL refuses to run as root). */
function pgCommand(bin: string, args: string[]): [string, string[]] {
  return isRoot ? ['runuser', ['-u', SERVICE_USER, '--', bin, ...args]] : [bin, args];
}

function run(bin: string, args: string[], what: string): string {
  const [cmd, argv] = pgCommand(bin, args);
  const r = spawnSync(cmd, argv, { encoding: 'utf8', timeout: 60_000 });
  if (r.status !== 0) {
    throw new SetupError(`${what} failed: ${(r.stderr || r.stdout || String(r.error ?? '')).trim().split('\n').slice(-3).join(' ')}`);
  }
  return r.stdout;
}

/** As root, the service user must be able to reach and own the cluster folder. */
function prepareFolder(folder: string): void {
  mkdirSync(folder, { recursive: true });
  if (!isRoot) return;
  execFileSync('chown', ['-R', `${SERVICE_USER}:${SERVICE_USER}`, folder]);
  chmodSync(folder, 0o700);
  // Every ancestor needs the search bit for the service user; add only that bit where missing.
  for (let dir = dirname(folder); dir !== dirname(dir); dir = dirname(dir)) {
    const mode = statSync(dir).mode;
    if ((mode & 0o001) === 0) {
      say(`allowing the ${SERVICE_USER} user to traverse ${dir} (chmod o+x)`);
      chmodSync(dir, mode | 0o001);
    }
  }
}

function socketDir(folder: string): string {
  const dir = join(folder, 'sock');
  // A unix socket path must stay under about 100 bytes; fall back to a short folder in /tmp.
  if (Buffer.byteLength(join(dir, '.s.PGSQL.00000')) < 100) return dir;
  return join('/tmp', `ratewarden-pg-${Buffer.from(folder).toString('base64url').slice(-16)}`);
}

function serverRunning(bin: string, dataDir: string): boolean {
  const [cmd, argv] = pgCommand(join(bin, 'pg_ctl'), ['-D', dataDir, 'status']);
  return spawnSync(cmd, argv, { encoding: 'utf8' }).status === 0;
}

/**
 * Creates (first time) and starts a PostgreSQL cluster on 127.0.0.1 in a folder of the repository,
 * creates the database, and returns its URL with a stop function.
 * @throws SetupError with one clear line for a missing server, a taken port or a failed start.
 */
export async function startPostgres(opts: PostgresOptions): Promise<RunningPostgres> {
  const bin = findBinDir();
  const dataDir = join(opts.folder, 'pgdata');
  const logFile = join(opts.folder, 'postgres.log');
  const sock = socketDir(opts.folder);
  prepareFolder(opts.folder);
  mkdirSync(sock, { recursive: true });
  if (isRoot) execFileSync('chown', [`${SERVICE_USER}:${SERVICE_USER}`, sock]);

  if (!existsSync(join(dataDir, 'PG_VERSION'))) {
    if (existsSync(dataDir)) rmSync(dataDir, { recursive: true, force: true }); // a half-made cluster from an interrupted first run
    say(`creating a PostgreSQL cluster in ${dataDir}`);
    run(join(bin, 'initdb'), ['-D', dataDir, '-U', 'ratewarden', '-A', 'trust', '-E', 'UTF8', '--locale=C.UTF-8'], 'initdb');
  }

  const pidFile = join(dataDir, 'postmaster.pid');
  if (existsSync(pidFile)) {
    if (serverRunning(bin, dataDir)) {
      const pid = readFileSync(pidFile, 'utf8').split('\n')[0];
      if (opts.durable) {
        throw new SetupError(`a database server is still running on ${dataDir} (pid ${pid}), probably from another npm start; stop that one first`);
      }
      say(`stopping a test database server left running (pid ${pid})`);
      run(join(bin, 'pg_ctl'), ['-D', dataDir, '-m', 'immediate', '-w', 'stop'], 'pg_ctl stop');
    } else {
      say('removing a stale postmaster.pid left by a crash');
      rmSync(pidFile, { force: true });
    }
  }

  await assertPortFree(opts.port, 'PostgreSQL', 'PGPORT');
  const settings = [
    '-c listen_addresses=127.0.0.1',
    `-p ${opts.port}`,
    `-k ${sock}`,
    ...(opts.durable ? [] : ['-c fsync=off', '-c full_page_writes=off', '-c synchronous_commit=off']),
  ].join(' ');
  try {
    run(join(bin, 'pg_ctl'), ['-D', dataDir, '-l', logFile, '-w', '-t', '60', '-o', settings, 'start'], 'starting PostgreSQL');
  } catch (err) {
    const tail = existsSync(logFile) ? readFileSync(logFile, 'utf8').trim().split('\n').slice(-2).join(' ') : '';
    throw new SetupError(`${(err as Error).message}${tail ? ` (log: ${tail})` : ''}`);
  }

  const stop = (): void => {
    if (!existsSync(join(dataDir, 'postmaster.pid'))) return;
    const [cmd, argv] = pgCommand(join(bin, 'pg_ctl'), ['-D', dataDir, '-m', 'fast', '-w', '-t', '30', 'stop']);
    spawnSync(cmd, argv, { stdio: 'ignore' });
  };

  try {
    await ensureDatabase(opts.port, opts.database);
  } catch (err) {
    stop();
    throw err;
  }
  return { url: `postgres://ratewarden@127.0.0.1:${opts.port}/${opts.database}`, stop };
}

async function ensureDatabase(port: number, database: string): Promise<void> {
  const client = new pg.Client({ host: '127.0.0.1', port, user: 'ratewarden', database: 'postgres' });
  await client.connect();
  try {
    const { rowCount } = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [database]);
    if (!rowCount) await client.query(`CREATE DATABASE "${database.replace(/"/g, '')}"`);
  } finally {
    await client.end();
  }
}

/** Drops and recreates a database, for tests that must start from nothing. */
export async function recreateDatabase(port: number, database: string): Promise<void> {
  const client = new pg.Client({ host: '127.0.0.1', port, user: 'ratewarden', database: 'postgres' });
  await client.connect();
  try {
    await client.query(`DROP DATABASE IF EXISTS "${database}" WITH (FORCE)`);
    await client.query(`CREATE DATABASE "${database}"`);
  } finally {
    await client.end();
  }
}
