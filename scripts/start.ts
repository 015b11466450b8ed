import { join } from 'node:path';
import { createDataSource, migrate, seedDemo } from '@ratewarden/db';
import { say, runMain } from './lib/log';
import { assertPortFree } from './lib/ports';
import { startPostgres } from './lib/postgres';
import { readSettings } from './lib/settings';
import { Supervisor, waitForHttp } from './lib/supervisor';
import { buildWebIfStale } from './lib/web-build';

const root = join(import.meta.dirname, '..');

/** `npm start`: database, migrations, demo data on first run, web build, API and worker. */
runMain(async () => {
  const settings = readSettings();
  await assertPortFree(settings.PORT, 'web app and API', 'PORT');
  const supervisor = new Supervisor(root);

  const db = await startPostgres({ folder: join(root, '.data', 'postgres'), port: settings.PGPORT, database: 'ratewarden', durable: true });
  supervisor.onStop(() => db.stop());
  say(`PostgreSQL listening on 127.0.0.1:${settings.PGPORT}`);

  const ran = await migrate(db.url);
  if (ran.length) say(`migrations applied: ${ran.join(', ')}`);
  const ds = createDataSource(db.url, 1);
  await ds.initialize();
  if (await seedDemo(ds)) say('demo scenario loaded (first run)');
  await ds.destroy();

  buildWebIfStale(root);

  const env = { DATABASE_URL: db.url, PORT: String(settings.PORT), NODE_ENV: settings.NODE_ENV };
  supervisor.start('api', 'api/src/server.ts', env);
  supervisor.start('worker', 'worker/src/main.ts', env);
  await waitForHttp(`http://127.0.0.1:${settings.PORT}/api/health`);
  say(`Ratewarden is running at http://127.0.0.1:${settings.PORT}/  (Ctrl-C stops everything)`);
  await new Promise<never>(() => {});
});
