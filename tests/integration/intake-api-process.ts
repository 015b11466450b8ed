import { type ChildProcess, spawn } from 'node:child_process';
import http from 'node:http';
import net from 'node:net';
import { join } from 'node:path';
import type { Express } from 'express';
import { inject } from 'vitest';
import { freePort } from '../support/free-port';
import { signIn, type SignedInAgent } from '../support/sign-in';
import { testDatabaseUrl } from '../support/test-db';

/**
 * The real API server (api/src/server.ts) as its own process on the test database, so a test can
 * see whether hostile input ends the process: an uncaught error there is an exit, not a test error.
 */
export interface ApiProcess {
  baseUrl: string;
  child: ChildProcess;
  /** Everything the process wrote to stderr. */
  stderr(): string;
  alive(): boolean;
  stop(): Promise<void>;
}

export async function startApiProcess(env: Record<string, string> = {}): Promise<ApiProcess> {
  const { issuer, appPort } = inject('auth');
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', join(import.meta.dirname, '..', '..', 'api', 'src', 'server.ts')], {
    env: {
      ...process.env,
      NODE_ENV: 'test',
      PORT: String(port),
      HOST: '127.0.0.1',
      DATABASE_URL: testDatabaseUrl(),
      OIDC_ISSUER: issuer,
      // Sign-in's callback is fetched by the test's agent from this process; the identity provider knows this address.
      OIDC_REDIRECT_URI: `http://127.0.0.1:${appPort}/auth/callback`,
      APP_BASE_URL: `http://127.0.0.1:${appPort}/`,
      AUTH_RATE_LIMIT: '10000',
      INTAKE_RATE_LIMIT: '100000',
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let err = '';
  child.stderr!.on('data', (c: Buffer) => (err += c.toString()));
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`the API did not start within 30 s: ${err}`)), 30_000);
    child.stdout!.on('data', (c: Buffer) => {
      if (c.toString().includes('listening on')) {
        clearTimeout(timer);
        resolve();
      }
    });
    child.once('exit', (code) => reject(new Error(`the API exited (${code}): ${err}`)));
  });
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    child,
    stderr: () => err,
    alive: () => child.exitCode === null && child.signalCode === null,
    stop: async () => {
      if (child.exitCode !== null || child.signalCode !== null) return;
      const gone = new Promise((r) => child.once('exit', r));
      child.kill('SIGTERM');
      await gone;
    },
  };
}

/** A signed-in person on the process, with the session cookie for raw requests. */
export interface ProcessSession extends SignedInAgent {
  cookie: string;
}

export async function signInToProcess(api: ApiProcess, email: string): Promise<ProcessSession> {
  // supertest takes a base URL as well as an app; signIn is typed for the app.
  const s = await signIn(api.baseUrl as unknown as Express, email);
  const probe = s.agent.get('/api/session') as unknown as { cookies?: string };
  const cookie = probe.cookies ?? '';
  await (probe as unknown as PromiseLike<unknown>);
  if (!cookie) throw new Error('no session cookie after sign-in');
  return { ...s, cookie };
}

export interface RawAnswer {
  status: number;
  body: { code?: string; message?: string; details?: unknown } | null;
}

/**
 * POSTs `body` as it is (any bytes, any content type), with the session's cookie and token. With
 * `announced`, the content length says that many bytes but only `body` is sent, and the answer is
 * awaited (a server refusing an announced size answers before reading and closes the connection).
 */
export function rawPost(
  baseUrl: string,
  path: string,
  s: ProcessSession,
  contentType: string,
  body: Buffer,
  opts: { chunked?: boolean; timeoutMs?: number; pauseAt?: number; announced?: number } = {},
): Promise<RawAnswer> {
  return new Promise((resolve, reject) => {
    const req = http.request(new URL(path, baseUrl), {
      method: 'POST',
      headers: {
        cookie: s.cookie,
        'x-csrf-token': s.csrf,
        'content-type': contentType,
        ...(opts.chunked ? { 'transfer-encoding': 'chunked' } : { 'content-length': String(opts.announced ?? body.length) }),
      },
    });
    req.setTimeout(opts.timeoutMs ?? 30_000, () => req.destroy(new Error(`no answer within ${opts.timeoutMs ?? 30_000} ms`)));
    let answered = false;
    // The server may close the connection right after an early answer (413): the answer counts.
    req.on('error', (err) => {
      if (!answered) reject(err);
    });
    req.on('response', (res) => {
      answered = true;
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => {
        // A body announced larger than sent is never finished: the answer came first.
        if (opts.announced !== undefined) req.destroy();
        const text = Buffer.concat(chunks).toString();
        let parsed: RawAnswer['body'] = null;
        try {
          parsed = JSON.parse(text) as RawAnswer['body'];
        } catch {
          parsed = null;
        }
        resolve({ status: res.statusCode ?? 0, body: parsed });
      });
      res.on('error', reject);
    });
    // Written in pieces, so a large body streams rather than arriving in one chunk; with `pauseAt`,
    // the server has the first part for a while before the rest comes.
    const send = (part: Buffer) => {
      for (let i = 0; i < part.length; i += 64 * 1024) req.write(part.subarray(i, i + 64 * 1024));
    };
    if (opts.announced !== undefined) {
      // Only the start of an announced body is sent; the server answers from the announcement.
      send(body);
    } else if (opts.pauseAt === undefined) {
      send(body);
      req.end();
    } else {
      send(body.subarray(0, opts.pauseAt));
      setTimeout(() => {
        send(body.subarray(opts.pauseAt));
        req.end();
      }, 300);
    }
  });
}

/**
 * Announces a body of `announced` bytes, sends `sent` of it and hangs up: the connection is gone
 * mid-upload. Resolves once the socket is closed.
 */
export function abortedPost(baseUrl: string, path: string, s: ProcessSession, contentType: string, sent: Buffer, announced: number): Promise<void> {
  const url = new URL(path, baseUrl);
  return new Promise((resolve, reject) => {
    const sock = net.connect(Number(url.port), url.hostname, () => {
      sock.write(
        `POST ${url.pathname}${url.search} HTTP/1.1\r\nHost: ${url.host}\r\nCookie: ${s.cookie}\r\nX-CSRF-Token: ${s.csrf}\r\n` +
          `Content-Type: ${contentType}\r\nContent-Length: ${announced}\r\n\r\n`,
      );
      sock.write(sent, () => setTimeout(() => sock.destroy(), 50));
    });
    sock.on('error', reject);
    sock.on('close', () => resolve());
  });
}

export const BOUNDARY = 'ratewarden-test-boundary';
export const MULTIPART = `multipart/form-data; boundary=${BOUNDARY}`;

/** One file part of a multipart body (without the closing boundary). */
export function filePart(content: Buffer | string, fileName = 'upload.csv', field = 'file'): Buffer {
  return Buffer.concat([
    Buffer.from(`--${BOUNDARY}\r\nContent-Disposition: form-data; name="${field}"; filename="${fileName}"\r\nContent-Type: text/csv\r\n\r\n`),
    Buffer.isBuffer(content) ? content : Buffer.from(content),
    Buffer.from('\r\n'),
  ]);
}

export const closing = () => Buffer.from(`--${BOUNDARY}--\r\n`);

/** A whole, well-formed multipart body with one file. */
export function multipartBody(content: Buffer | string, fileName = 'upload.csv'): Buffer {
  return Buffer.concat([filePart(content, fileName), closing()]);
}

/** GET /api/health on the process: its status, or 0 when nothing answers. */
export async function health(baseUrl: string): Promise<number> {
  try {
    return (await fetch(new URL('/api/health', baseUrl), { signal: AbortSignal.timeout(10_000) })).status;
  } catch {
    return 0;
  }
}
