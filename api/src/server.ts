import { createDataSource } from '@ratewarden/db';
import { exitWithParent } from '@ratewarden/shared/runtime/exit-with-parent';
import { createApp } from './app';
import { readApiConfig } from './config';

const config = readApiConfig();
const dataSource = createDataSource();
await dataSource.initialize();
const app = createApp({ dataSource, config });

const server = app.listen(config.PORT, config.HOST, () => {
  console.log(`listening on http://${config.HOST}:${config.PORT}`);
});
server.on('error', (err: NodeJS.ErrnoException) => {
  console.error(err.code === 'EADDRINUSE' ? `port ${config.PORT} is already in use; set PORT to a free port` : err.message);
  process.exit(1);
});

let closing = false;
async function shutdown(): Promise<void> {
  if (closing) return;
  closing = true;
  server.close();
  server.closeAllConnections();
  await dataSource.destroy().catch(() => {});
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown());
process.on('SIGINT', () => void shutdown());
exitWithParent(() => void shutdown());
