import { join } from 'node:path';
import { createDataSource, migrate, seedNewDatabase } from '@ratewarden/db';
import { demoIntegrationClient, demoPeople } from '@ratewarden/db/seed/demo-access';
import { DEMO_PASSWORD } from '@ratewarden/api/stand-ins/identity-provider/demo-accounts';
import { say, runMain, SetupError } from './lib/log';
import { assertPortFree } from './lib/ports';
import { startPostgres } from './lib/postgres';
import { readSettings } from './lib/settings';
import { Supervisor, waitForHttp } from './lib/supervisor';
import { buildWebIfStale } from './lib/web-build';

const root = join(import.meta.dirname, '..');

/**
 * `npm start`: database, migrations, demo data on first run, web build, identity provider, SMTP
 * fake, API and worker. `npm run dev` (scripts/dev.ts) passes `--dev` to add Vite's dev server.
 * `npm start -- --empty` (or RATEWARDEN_EMPTY=true) starts a new database without the demo data:
 * only the first administrator (FIRST_ADMIN_EMAIL), whom the first-run page guides.
 */
const dev = process.argv.includes('--dev');
const emptyFlag = process.argv.includes('--empty');

runMain(async () => {
  const settings = readSettings();
  if (settings.NODE_ENV === 'production' && !process.env.OIDC_ISSUER) {
    throw new SetupError(
      'NODE_ENV=production needs a real identity provider: set OIDC_ISSUER, OIDC_CLIENT_ID, OIDC_CLIENT_SECRET and SESSION_SECRET (the demo ones are refused)',
    );
  }
  await assertPortFree(settings.PORT, 'web app and API', 'PORT');
  const supervisor = new Supervisor(root);

  const db = await startPostgres({ folder: join(root, '.data', 'postgres'), port: settings.PGPORT, database: 'ratewarden', durable: true });
  supervisor.onStop(() => db.stop());
  say(`PostgreSQL listening on 127.0.0.1:${settings.PGPORT}`);

  const ran = await migrate(db.url);
  if (ran.length) say(`migrations applied: ${ran.join(', ')}`);
  const ds = createDataSource(db.url, 1);
  await ds.initialize();
  const empty = emptyFlag || settings.RATEWARDEN_EMPTY;
  const seeded = await seedNewDatabase(ds, { empty, firstAdminEmail: settings.FIRST_ADMIN_EMAIL });
  if (seeded === 'demo') say('demo scenario loaded (first run)');
  if (seeded === 'first administrator') say(`empty start: no demo data; first administrator ${settings.FIRST_ADMIN_EMAIL}`);
  await ds.destroy();

  buildWebIfStale(root);

  const appUrl = `http://127.0.0.1:${settings.PORT}/`;
  const env = {
    DATABASE_URL: db.url,
    PORT: String(settings.PORT),
    NODE_ENV: settings.NODE_ENV,
    IDP_PORT: String(settings.IDP_PORT),
    SMTP_PORT: String(settings.SMTP_PORT),
    APP_BASE_URL: process.env.APP_BASE_URL ?? appUrl,
    OIDC_REDIRECT_URI: process.env.OIDC_REDIRECT_URI ?? `${appUrl}auth/callback`,
  };
  if (!process.env.OIDC_ISSUER) {
    // No hosted identity service configured: start the local stand-in.
    await assertPortFree(settings.IDP_PORT, 'identity provider', 'IDP_PORT');
    supervisor.start('idp', 'api/src/stand-ins/identity-provider/main.ts', env);
    await waitForHttp(`http://127.0.0.1:${settings.IDP_PORT}/.well-known/openid-configuration`);
  }
  supervisor.start('api', 'api/src/server.ts', { ...env, OIDC_ISSUER: process.env.OIDC_ISSUER ?? `http://127.0.0.1:${settings.IDP_PORT}` });
  if (settings.NODE_ENV !== 'production') {
    // The local SMTP fake receives the threshold notices; the mailbox page shows them.
    await assertPortFree(settings.SMTP_PORT, 'development SMTP fake', 'SMTP_PORT');
    supervisor.start('smtp', 'worker/src/smtp-fake/main.ts', env);
  }
  supervisor.start('worker', 'worker/src/main.ts', env);
  await waitForHttp(`http://127.0.0.1:${settings.PORT}/api/health`);
  if (dev) {
    supervisor.startNode(
      'vite',
      [join(root, 'node_modules', 'vite', 'bin', 'vite.js'), '--config', join(root, 'web', 'vite.config.ts'), join(root, 'web')],
      env,
    );
    say('hot reload at http://127.0.0.1:5173/ (Vite, in front of the API)');
  }
  say(`Ratewarden is running at http://127.0.0.1:${settings.PORT}/  (Ctrl-C stops everything)`);
  if (empty) say(`first steps for the administrator: http://127.0.0.1:${settings.PORT}/first-run`);
  if (!process.env.OIDC_ISSUER) {
    say(`demo accounts (password ${DEMO_PASSWORD}): ${demoPeople.map((p) => `${p.email} (${p.role})`).join(', ')}`);
    say(`demo integration client: ${demoIntegrationClient.clientId} / demo-secret, tokens from http://127.0.0.1:${settings.IDP_PORT}/token`);
  }
  await new Promise<never>(() => {});
});
