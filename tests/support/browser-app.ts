import type { DataSource } from 'typeorm';
import { afterAll, beforeAll } from 'vitest';
import { launchBrowser } from './browser';
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
