import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { inject } from 'vitest';
import { createApp } from '@ratewarden/api/app';
import type { DataSource } from 'typeorm';
import { testApiConfig } from './test-config';

/**
 * Starts the real app on 127.0.0.1 at the port the test identity provider redirects to (browser
 * tests sign in through it); returns its base URL and a closer.
 */
export async function listenTestApp(dataSource: DataSource): Promise<{ baseUrl: string; close: () => Promise<void> }> {
  const app = createApp({ dataSource, config: testApiConfig() });
  const { appPort } = inject('auth');
  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(appPort, '127.0.0.1', () => resolve(s));
    s.once('error', reject);
  });
  const { port } = server.address() as AddressInfo;
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
