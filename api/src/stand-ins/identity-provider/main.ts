import { createServer } from 'node:http';
import { exitWithParent } from '@ratewarden/shared/runtime/exit-with-parent';
import { createIdentityProviderApp } from './app';
import { readIdpConfig } from './config';
import { createProvider } from './provider';

const config = readIdpConfig();
const provider = await createProvider(config);
const app = createIdentityProviderApp(config, provider);

const server = createServer(app);
server.on('error', (err: NodeJS.ErrnoException) => {
  console.error(err.code === 'EADDRINUSE' ? `port ${config.IDP_PORT} is already in use; set IDP_PORT to a free port` : err.message);
  process.exit(1);
});
server.listen(config.IDP_PORT, '127.0.0.1', () => console.log(`identity provider (local stand-in) at ${config.issuer}`));

const shutdown = () => server.close(() => process.exit(0));
process.on('SIGTERM', shutdown);
process.on('SIGINT', shutdown);
exitWithParent(shutdown);
