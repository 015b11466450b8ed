import { spawn, type ChildProcess } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { createApp } from '@ratewarden/api/app';
import { readApiConfig } from '@ratewarden/api/config';
import { createDataSource, migrate, seedDemo } from '@ratewarden/db';
import { DEMO_PASSWORD } from '@ratewarden/api/stand-ins/identity-provider/demo-accounts';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { launchBrowser } from '../tests/support/browser';
import { freePort } from '../tests/support/free-port';
import { say, runMain } from './lib/log';
import { startPostgres } from './lib/postgres';
import { buildWebIfStale } from './lib/web-build';

const root = join(import.meta.dirname, '..');
const outDir = join(root, '.screenshots');

/**
 * `npm run screenshots`: every page of the web app at 1366×768 and at phone size (390×844, files
 * ending `-phone`) into .screenshots/ (git-ignored),
 * against a throwaway database with the demo scenario, so anyone can look at every screen.
 * SCREENSHOTS_PGPORT picks the database port (default 54390). The public pages come first; then
 * the stand-in identity provider is started, one run computes the demo figures (with one watch
 * rule per outcome so that flags exist), and each demo account signs in through the provider's
 * page and every page its role uses is photographed, named `<role>-<page>.png`.
 */
interface Shot {
  name: string;
  path: string;
  /** Bring the page into the state worth showing. */
  prepare?: (page: Page) => Promise<void>;
}

/** Every page at both sizes: a laptop screen and a phone (the navigation collapses behind "Menu"). */
const sizes = [
  { suffix: '', width: 1366, height: 768 },
  { suffix: '-phone', width: 390, height: 844 },
];

/** Opens the collapsed navigation where there is one (phone size); a no-op on wide screens. */
async function openMenu(page: Page): Promise<void> {
  const menu = page.getByRole('button', { name: 'Menu' });
  if (await menu.isVisible()) await menu.click();
}

const shots: Shot[] = [
  { name: 'home', path: '/' },
  { name: 'ad-hoc-empty', path: '/ad-hoc' },
  {
    name: 'ad-hoc-rates',
    path: '/ad-hoc',
    prepare: async (page) => {
      // Feychting et al., Epidemiology 1998 (136/22,050 vs 1,709/127,650 person-years).
      await page.getByLabel('Exposed: cases with the outcome', { exact: true }).fill('136');
      await page.getByLabel('Exposed: person-years followed', { exact: true }).fill('22050');
      await page.getByLabel('Not exposed: cases with the outcome', { exact: true }).fill('1709');
      await page.getByLabel('Not exposed: person-years followed', { exact: true }).fill('127650');
      await page.getByRole('button', { name: 'Compare the rates' }).click();
      await page.getByRole('region', { name: 'What the numbers say' }).waitFor();
    },
  },
  {
    name: 'ad-hoc-rates-methods',
    path: '/ad-hoc',
    prepare: async (page) => {
      // 3 versus 2 cases in equal person-time, where the methods part; the fold of other methods opened.
      await page.getByLabel('Exposed: cases with the outcome', { exact: true }).fill('3');
      await page.getByLabel('Exposed: person-years followed', { exact: true }).fill('100');
      await page.getByLabel('Not exposed: cases with the outcome', { exact: true }).fill('2');
      await page.getByLabel('Not exposed: person-years followed', { exact: true }).fill('100');
      await page.getByRole('button', { name: 'Compare the rates' }).click();
      await page.getByText('Other interval methods, compared').click();
      await page.getByRole('region', { name: 'When the methods differ' }).scrollIntoViewIfNeeded();
    },
  },
  {
    name: 'ad-hoc-table',
    path: '/ad-hoc',
    prepare: async (page) => {
      await page.getByLabel(/2×2 table/).check();
      for (const [label, v] of [
        ['Exposed, with the outcome', '56'],
        ['Exposed, without the outcome', '14'],
        ['Not exposed, with the outcome', '48'],
        ['Not exposed, without the outcome', '32'],
      ] as const) {
        await page.getByLabel(label, { exact: true }).fill(v);
      }
      await page.getByRole('button', { name: 'Compare the risks' }).click();
      await page.getByRole('region', { name: 'What the numbers say' }).waitFor();
    },
  },
  {
    name: 'ad-hoc-bad-input',
    path: '/ad-hoc',
    prepare: async (page) => {
      await page.getByLabel('Exposed: cases with the outcome', { exact: true }).fill('2.5');
      await page.getByRole('button', { name: 'Compare the rates' }).click();
    },
  },
  { name: 'no-role', path: '/no-role' },
  { name: 'not-found', path: '/no-such-page' },
];

/** Pages photographed signed in, per demo account; `:flag` is replaced by the first flag's id. */
const roleShots: Array<{ role: string; email: string; shots: Shot[] }> = [
  {
    role: 'hygienist',
    email: 'hygienist@demo.ratewarden.test',
    shots: [
      { name: 'overview', path: '/overview' },
      { name: 'overview-menu', path: '/overview', prepare: openMenu },
      { name: 'trends', path: '/trends' },
      {
        name: 'trends-log',
        path: '/trends',
        prepare: async (page) => {
          await page.getByLabel('Log scale').first().check();
        },
      },
      {
        name: 'trends-table',
        path: '/trends',
        prepare: async (page) => {
          await page.getByRole('button', { name: 'Show as a table' }).first().click();
        },
      },
      { name: 'comparison', path: '/comparison' },
      { name: 'adjusted', path: '/adjusted' },
      { name: 'adjusted-site', path: '/adjusted?stratify=site' },
      { name: 'intakes', path: '/intakes' },
      { name: 'runs', path: '/runs' },
      { name: 'groups', path: '/groups' },
      { name: 'outcomes', path: '/outcomes' },
      { name: 'rules', path: '/rules' },
      { name: 'rule-new', path: '/rules/new' },
      { name: 'flags', path: '/flags' },
      { name: 'flag', path: '/flags/:flag' },
      { name: 'periods', path: '/periods' },
    ],
  },
  {
    role: 'safety-manager',
    email: 'safety@demo.ratewarden.test',
    shots: [
      { name: 'flags', path: '/flags' },
      { name: 'flag', path: '/flags/:flag' },
      { name: 'overview', path: '/overview' },
      { name: 'comparison', path: '/comparison' },
    ],
  },
  {
    role: 'physician',
    email: 'physician@demo.ratewarden.test',
    shots: [
      { name: 'flag-cases', path: '/flags/:flag' },
      { name: 'trends', path: '/trends?window=month' },
      { name: 'unattributed', path: '/runs/unattributed' },
      { name: 'intakes', path: '/intakes' },
    ],
  },
  {
    role: 'administrator',
    email: 'admin@demo.ratewarden.test',
    shots: [
      { name: 'people', path: '/admin' },
      { name: 'clients', path: '/admin/clients' },
      { name: 'audit', path: '/admin/audit' },
      { name: 'mailbox', path: '/mailbox' },
    ],
  },
];

/** The stand-in identity provider as its own process, registered for the app on `appPort`. */
async function startIdentityProvider(appPort: number): Promise<{ issuer: string; child: ChildProcess }> {
  const idpPort = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'api', 'src', 'stand-ins', 'identity-provider', 'main.ts')], {
    env: {
      ...process.env,
      IDP_PORT: String(idpPort),
      OIDC_REDIRECT_URI: `http://127.0.0.1:${appPort}/auth/callback`,
      APP_BASE_URL: `http://127.0.0.1:${appPort}/`,
    },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error('the identity provider did not start within 20 s')), 20_000);
    child.stdout!.on('data', (chunk: Buffer) => {
      if (chunk.toString().includes('identity provider')) {
        clearTimeout(timer);
        resolve();
      }
    });
    child.once('exit', (code) => reject(new Error(`the identity provider exited (${code})`)));
  });
  return { issuer: `http://127.0.0.1:${idpPort}`, child };
}

/** One page at every size; a page that fails is reported and the others still come. */
async function photograph(page: Page, base: string, name: string, shot: Shot): Promise<number> {
  let failed = 0;
  for (const size of sizes) {
    try {
      await page.setViewportSize({ width: size.width, height: size.height });
      await page.goto(base + shot.path, { waitUntil: 'networkidle' });
      await shot.prepare?.(page);
      await page.evaluate(() => document.fonts.ready);
      await page.screenshot({ path: join(outDir, `${name}${size.suffix}.png`), fullPage: false });
      await page.screenshot({ path: join(outDir, `${name}${size.suffix}-full.png`), fullPage: true });
      say(`screenshot ${name}${size.suffix}.png`);
    } catch (e) {
      failed++;
      say(`screenshot ${name}${size.suffix}.png failed: ${(e as Error).message.split('\n')[0]}`);
    }
  }
  return failed;
}

runMain(async () => {
  const port = Number(process.env.SCREENSHOTS_PGPORT ?? 54390);
  const db = await startPostgres({ folder: join(root, '.data', 'screenshots-postgres'), port, database: 'ratewarden_screenshots', durable: false });
  let server: Server | undefined;
  let idp: ChildProcess | undefined;
  let browser: Awaited<ReturnType<typeof launchBrowser>> | undefined;
  const ds = createDataSource(db.url, 2);
  try {
    await ds.initialize();
    // A throwaway database: the cluster folder is reused between runs, its contents never are.
    await ds.query(`DROP SCHEMA IF EXISTS intake_staging CASCADE; DROP SCHEMA public CASCADE; CREATE SCHEMA public`);
    await migrate(db.url);
    await seedDemo(ds);
    buildWebIfStale(root);
    const appPort = await freePort();
    const provider = await startIdentityProvider(appPort);
    idp = provider.child;
    const appBase = `http://127.0.0.1:${appPort}/`;
    const app = createApp({
      dataSource: ds,
      config: readApiConfig({
        NODE_ENV: 'test',
        OIDC_ISSUER: provider.issuer,
        OIDC_REDIRECT_URI: `${appBase}auth/callback`,
        APP_BASE_URL: appBase,
        AUTH_RATE_LIMIT: '10000',
      }),
    });
    server = await new Promise<Server>((resolve) => {
      const s = app.listen(appPort, '127.0.0.1', () => resolve(s));
    });
    const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    mkdirSync(outDir, { recursive: true });
    browser = await launchBrowser();
    let failed = 0;
    for (const shot of shots) {
      const page = await browser.context.newPage();
      page.on('pageerror', (e) => say(`page error on ${shot.name}: ${e.message}`));
      failed += await photograph(page, base, shot.name, shot);
      await page.close();
    }

    // One run over the demo data (its seed brings a watch rule per outcome), so every page has figures and flags.
    const run = await performRun(ds, {
      trigger: 'cli',
      reason: 'npm run screenshots',
      settings: { personTimeBasis: 'person_years', per: 1000, confidence: 0.95, countedStatuses: ['confirmed'] },
      appUrl: appBase,
      waitForLockMs: 60_000,
    });
    say(`run: ${run.status}${run.status === 'failed' ? ` (${run.error})` : ''}`);
    const [flag] = (await ds.query(`SELECT id FROM flags ORDER BY raised_at, id LIMIT 1`)) as Array<{ id: string }>;
    let count = shots.length;
    for (const account of roleShots) {
      const page = await browser.context.newPage();
      page.on('pageerror', (e) => say(`page error (${account.role}): ${e.message}`));
      await page.goto(base, { waitUntil: 'networkidle' });
      await page.getByRole('link', { name: 'Sign in', exact: true }).click();
      await page.getByLabel('Work e-mail').fill(account.email);
      await page.getByLabel('Password').fill(DEMO_PASSWORD);
      await page.getByRole('button', { name: /sign in/i }).click();
      await page.waitForURL(`${base}/**`);
      await page.waitForLoadState('networkidle');
      for (const shot of account.shots) {
        if (shot.path.includes(':flag') && !flag) continue;
        failed += await photograph(page, base, `${account.role}-${shot.name}`, { ...shot, path: shot.path.replace(':flag', flag?.id ?? '') });
        count++;
      }
      await page.setViewportSize({ width: sizes[0]!.width, height: sizes[0]!.height });
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.waitForURL(`${base}/`);
      await page.close();
    }
    say(`${count} pages photographed at ${sizes.length} sizes into ${outDir}${failed ? `; ${failed} screenshots failed (above)` : ''}`);
  } finally {
    await browser?.close();
    if (idp && idp.exitCode === null) idp.kill('SIGTERM');
    server?.closeAllConnections();
    await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
    if (ds.isInitialized) await ds.destroy();
    db.stop();
  }
});
