import { spawn, spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { migrate } from '@ratewarden/db';
import { runMain, say } from './lib/log';
import { recreateDatabase, startPostgres } from './lib/postgres';
import { readSettings } from './lib/settings';
import { ensureSystemPackages, testRequirements } from './lib/system-packages';
import { buildWebIfStale } from './lib/web-build';

const root = join(import.meta.dirname, '..');
const TEST_DB = 'ratewarden_test';

/**
 * `npm test`: its own PostgreSQL cluster and an empty database (never the demo data), the web
 * build, then every vitest project (unit, integration, browser). Extra arguments go to vitest.
 * The whole suite (no arguments) starts with the lint and format checks and fails on any problem.
 */
runMain(async () => {
  const settings = readSettings();
  if (process.argv.length <= 2 && process.env.RATEWARDEN_SKIP_LINT !== '1') {
    const lint = checkStyle();
    if (lint !== 0) return lint;
  }
  ensureSystemPackages(testRequirements);
  const db = await startPostgres({
    folder: join(root, '.data', `test-postgres-${settings.TEST_PGPORT}`),
    port: settings.TEST_PGPORT,
    database: 'postgres',
    durable: false,
  });
  const stopDb = () => db.stop();
  process.on('exit', stopDb);
  for (const signal of ['SIGINT', 'SIGTERM'] as const) process.on(signal, () => process.exit(130));

  await recreateDatabase(settings.TEST_PGPORT, TEST_DB);
  const url = `postgres://ratewarden@127.0.0.1:${settings.TEST_PGPORT}/${TEST_DB}`;
  await migrate(url);
  say(`test database ready on 127.0.0.1:${settings.TEST_PGPORT}`);
  // Parallel partial runs (several people or agents in one tree) may skip the shared web build.
  if (process.env.RATEWARDEN_SKIP_WEB_BUILD !== '1') buildWebIfStale(root);

  const code = await new Promise<number>((resolve) => {
    const vitest = spawn(process.execPath, [join(root, 'node_modules', 'vitest', 'vitest.mjs'), 'run', ...process.argv.slice(2)], {
      cwd: root,
      stdio: 'inherit',
      // Workers the tests start run a requested run at once (no quiet interval), unless a test says otherwise.
      env: { RUN_QUIET_SECONDS: '0', ...process.env, DATABASE_URL: url, TEST_DATABASE_URL: url, TEST_PGPORT: String(settings.TEST_PGPORT), NODE_ENV: 'test' },
    });
    vitest.on('exit', (c, signal) => resolve(c ?? (signal ? 1 : 0)));
  });
  return code;
});

/** `npm run lint` (ESLint) and `npm run format:check` (Prettier), as the whole suite's first step; 0 when both pass. */
function checkStyle(): number {
  for (const script of ['lint', 'format:check']) {
    say(`npm run ${script} ...`);
    const r = spawnSync('npm', ['run', '-s', script], { cwd: root, stdio: 'inherit' });
    if (r.status !== 0) {
      say(`npm run ${script} found problems (see above); fix them, or run \`npm run format\` for the formatting`);
      return r.status ?? 1;
    }
  }
  return 0;
}
