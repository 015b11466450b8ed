import type { Page } from 'playwright-core';
import type { DataSource } from 'typeorm';
import { afterAll, beforeAll } from 'vitest';
import { launchBrowser } from './browser';
import { DEMO_PASSWORD } from './sign-in';
import { listenTestApp } from './test-app';
import { openTestDataSource } from './test-db';

export interface BrowserApp {
  ds: DataSource;
  app: Awaited<ReturnType<typeof listenTestApp>>;
  browser: Awaited<ReturnType<typeof launchBrowser>>;
}

/**
 * For a browser test file: the test database, the real app on the port the identity provider
 * knows, and Chromium, opened before the tests and closed after. `prepare` makes the file's data
 * before the app starts. Fields are filled in by the time the tests run.
 */
export function useBrowserApp(prepare?: (ds: DataSource) => Promise<void>): BrowserApp {
  const h = {} as BrowserApp;
  beforeAll(async () => {
    h.ds = await openTestDataSource();
    await prepare?.(h.ds);
    h.app = await listenTestApp(h.ds);
    h.browser = await launchBrowser();
  });
  afterAll(async () => {
    await h.browser?.close();
    await h.app?.close();
    await h.ds?.destroy();
  });
  return h;
}

/** Signs in through the identity provider's own page, as a person would. */
export async function signInThroughPage(page: Page, baseUrl: string, email: string): Promise<void> {
  await page.goto(baseUrl, { waitUntil: 'networkidle' });
  await page.getByRole('link', { name: 'Sign in', exact: true }).click();
  await page.getByLabel('Work e-mail').fill(email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: /sign in/i }).click();
  await page.waitForURL(`${baseUrl}/**`);
}

/** A new page signed in as `email`, after signing out whoever the shared browser profile held. */
export async function pageSignedInAs(h: BrowserApp, email: string): Promise<Page> {
  await h.browser.context.clearCookies();
  const page = await h.browser.context.newPage();
  await signInThroughPage(page, h.app.baseUrl, email);
  return page;
}
