import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { createApp } from '@ratewarden/api/app';
import { readApiConfig } from '@ratewarden/api/config';
import type { DataSource } from 'typeorm';

/** Starts the real app on an ephemeral loopback port; returns its base URL and a closer. */
export async function listenTestApp(dataSource: DataSource): Promise<{ baseUrl: string; close: () => Promise<void> }> {
  const app = createApp({ dataSource, config: readApiConfig({ NODE_ENV: 'test' }) });
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const { port } = server.address() as AddressInfo;
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    close: () => new Promise<void>((resolve) => { server.closeAllConnections(); server.close(() => resolve()); }),
  };
}
