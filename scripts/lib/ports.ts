import net from 'node:net';
import { SetupError } from './log';

/** Fails with one clear line when a port this project needs is already taken. */
export async function assertPortFree(port: number, what: string, envName: string): Promise<void> {
  const free = await new Promise<boolean>((resolve) => {
    const server = net.createServer();
    server.once('error', () => resolve(false));
    server.listen(port, '127.0.0.1', () => server.close(() => resolve(true)));
  });
  if (!free) {
    throw new SetupError(`port ${port} (${what}) is already in use by another program; stop it or set ${envName} to a free port`);
  }
}
