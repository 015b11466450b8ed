import { type ChildProcess, spawn } from 'node:child_process';
import { join } from 'node:path';
import type { TestProject } from 'vitest/node';

// Runs once for the whole test run (root config), before every project.
import { freePort } from './free-port';

declare module 'vitest' {
  export interface ProvidedContext {
    auth: { issuer: string; appPort: number };
  }
}

let idp: ChildProcess | undefined;

/**
 * Starts the stand-in identity provider as its own process for the integration and browser tests,
 * registered for a web app on a port chosen here (browser tests listen on it).
 */
export async function setup(project: TestProject): Promise<void> {
  const [idpPort, appPort] = [await freePort(), await freePort()];
  const issuer = `http://127.0.0.1:${idpPort}`;
  idp = spawn(process.execPath, ['--import', 'tsx', join(import.meta.dirname, '..', '..', 'api', 'src', 'stand-ins', 'identity-provider', 'main.ts')], {
    env: {
      ...process.env,
      IDP_PORT: String(idpPort),
      OIDC_REDIRECT_URI: `http://127.0.0.1:${appPort}/auth/callback`,
      APP_BASE_URL: `http://127.0.0.1:${appPort}/`,
      ACCESS_TOKEN_TTL_SECONDS: '600',
    },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error('the identity provider did not start within 20 s')), 20_000);
    idp!.stdout!.on('data', (chunk: Buffer) => {
      if (chunk.toString().includes('identity provider')) {
        clearTimeout(timer);
        resolve();
      }
    });
    idp!.once('exit', (code) => reject(new Error(`the identity provider exited (${code})`)));
  });
  project.provide('auth', { issuer, appPort });
}

export async function teardown(): Promise<void> {
  if (idp && idp.exitCode === null) {
    idp.kill('SIGTERM');
    await new Promise((r) => idp!.once('exit', r));
  }
}
