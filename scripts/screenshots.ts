import { mkdirSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { createApp } from '@ratewarden/api/app';
import { readApiConfig } from '@ratewarden/api/config';
import { createDataSource, migrate, seedDemo } from '@ratewarden/db';
import { launchBrowser } from '../tests/support/browser';
import { say, runMain } from './lib/log';
import { startPostgres } from './lib/postgres';
import { buildWebIfStale } from './lib/web-build';

const root = join(import.meta.dirname, '..');
const outDir = join(root, '.screenshots');

/**
 * `npm run screenshots`: every page of the web app at 1366×768 into .screenshots/ (git-ignored),
 * against a throwaway database with the demo scenario, so anyone can look at every screen.
 * SCREENSHOTS_PGPORT picks the database port (default 54390).
 */
interface Shot {
  name: string;
  path: string;
  /** Bring the page into the state worth showing. */
  prepare?: (page: Page) => Promise<void>;
}

const shots: Shot[] = [
  { name: 'home', path: '/' },
  { name: 'ad-hoc-empty', path: '/ad-hoc' },
  {
    name: 'ad-hoc-rates',
    path: '/ad-hoc',
    prepare: async (page) => {
      // Feychting et al., Epidemiology 1998 (136/22,050 vs 1,709/127,650 person-years).
      await page.getByLabel('Exposed group: cases').fill('136');
      await page.getByLabel('Exposed group: person-years').fill('22050');
      await page.getByLabel('Reference group: cases').fill('1709');
      await page.getByLabel('Reference group: person-years').fill('127650');
      await page.getByRole('button', { name: 'Compare the rates' }).click();
      await page.getByRole('region', { name: 'What the numbers say' }).waitFor();
    },
  },
  {
    name: 'ad-hoc-table',
    path: '/ad-hoc',
    prepare: async (page) => {
      await page.getByLabel(/2×2 table/).check();
      for (const [label, v] of [['a: exposed cases', '56'], ['b: exposed non-cases', '14'], ['c: reference cases', '48'], ['d: reference non-cases', '32']] as const) {
        await page.getByLabel(label).fill(v);
      }
      await page.getByRole('button', { name: 'Compare the risks' }).click();
      await page.getByRole('region', { name: 'What the numbers say' }).waitFor();
    },
  },
  { name: 'ad-hoc-bad-input', path: '/ad-hoc', prepare: async (page) => { await page.getByLabel('Exposed group: cases').fill('2.5'); await page.getByRole('button', { name: 'Compare the rates' }).click(); } },
  { name: 'no-role', path: '/no-role' },
  { name: 'not-found', path: '/no-such-page' },
];

runMain(async () => {
  const port = Number(process.env.SCREENSHOTS_PGPORT ?? 54390);
  const db = await startPostgres({ folder: join(root, '.data', 'screenshots-postgres'), port, database: 'ratewarden_screenshots', durable: false });
  let server: Server | undefined;
  let browser: Awaited<ReturnType<typeof launchBrowser>> | undefined;
  const ds = createDataSource(db.url, 2);
  try {
    await migrate(db.url);
    await ds.initialize();
    await seedDemo(ds);
    buildWebIfStale(root);
    const app = createApp({ dataSource: ds, config: readApiConfig({ NODE_ENV: 'test' }) });
    server = await new Promise<Server>((resolve) => {
      const s = app.listen(0, '127.0.0.1', () => resolve(s));
    });
    const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    mkdirSync(outDir, { recursive: true });
    browser = await launchBrowser();
    for (const shot of shots) {
      const page = await browser.context.newPage();
      await page.goto(base + shot.path, { waitUntil: 'networkidle' });
      page.on('pageerror', (e) => say(`page error on ${shot.name}: ${e.message}`));
      await shot.prepare?.(page);
      await page.evaluate(() => document.fonts.ready);
      await page.screenshot({ path: join(outDir, `${shot.name}.png`), fullPage: false });
      await page.screenshot({ path: join(outDir, `${shot.name}-full.png`), fullPage: true });
      await page.close();
      say(`screenshot ${shot.name}.png`);
    }
    say(`${shots.length} pages photographed into ${outDir}`);
  } finally {
    await browser?.close();
    server?.closeAllConnections();
    await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
    if (ds.isInitialized) await ds.destroy();
    db.stop();
  }
});
