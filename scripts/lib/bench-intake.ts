import { spawn } from 'node:child_process';
import { createReadStream, statSync } from 'node:fs';
import { request } from 'node:http';
import { basename } from 'node:path';
import { pipeline } from 'node:stream/promises';
import pg from 'pg';
import { from as copyFrom } from 'pg-copy-streams';

/** (a) A bare COPY of the file into an empty all-text table: the floor any intake stands on. */
export async function bareCopySeconds(url: string, file: string): Promise<number> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    await client.query(`DROP TABLE IF EXISTS bench_bare`);
    await client.query(
      `CREATE TABLE bench_bare (worker_key text, site text, exposure_group text, month text, hours text, birth_year text, sex text, job_title text)`,
    );
    const t = process.hrtime.bigint();
    await pipeline(createReadStream(file, { highWaterMark: 256 * 1024 }), client.query(copyFrom(`COPY bench_bare FROM STDIN WITH (FORMAT csv, HEADER true)`)));
    const s = Number(process.hrtime.bigint() - t) / 1e9;
    await client.query(`DROP TABLE bench_bare`);
    return s;
  } finally {
    await client.end();
  }
}

export interface IntakeChild {
  port: number;
  stop(): void;
}

export async function startIntakeChild(root: string, url: string): Promise<IntakeChild> {
  const child = spawn(process.execPath, ['--import', 'tsx', `${root}/scripts/lib/bench-intake-child.ts`, url], {
    cwd: root,
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  const port = await new Promise<number>((resolve, reject) => {
    child.stdout.on('data', (d: Buffer) => {
      const m = /port (\d+)/.exec(d.toString());
      if (m) resolve(Number(m[1]));
    });
    child.on('exit', (code) => reject(new Error(`intake process exited (${code})`)));
  });
  return { port, stop: () => child.kill('SIGTERM') };
}

/** Headers a request rides on: a signed-in person's session cookie and CSRF token (none for the intake process). */
export type CallHeaders = Record<string, string>;

function call(
  port: number,
  method: string,
  path: string,
  headers: CallHeaders = {},
  body?: (req: import('node:http').ClientRequest) => Promise<void>,
): Promise<{ status: number; json: any }> {
  return new Promise((resolve, reject) => {
    const boundary = 'ratewardenbench';
    const req = request(
      { host: '127.0.0.1', port, method, path, headers: { ...headers, ...(body ? { 'content-type': `multipart/form-data; boundary=${boundary}` } : {}) } },
      (res) => {
        let text = '';
        res.setEncoding('utf8');
        res.on('data', (d) => (text += d));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, json: text ? JSON.parse(text) : null }));
      },
    );
    req.on('error', reject);
    if (body) body(req).catch(reject);
    else req.end();
  });
}

/** (b) The real intake: multipart upload over HTTP into the intake router, checks included. */
export async function uploadSeconds(
  port: number,
  file: string,
  mode: 'check' | 'apply',
  { kind = 'roster', headers = {} }: { kind?: 'roster' | 'cases'; headers?: CallHeaders } = {},
): Promise<{ seconds: number; status: number; body: any }> {
  const boundary = 'ratewardenbench';
  const t = process.hrtime.bigint();
  const res = await call(port, 'POST', `/api/intakes?kind=${kind}&mode=${mode}`, headers, async (req) => {
    req.write(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${basename(file)}"\r\nContent-Type: text/csv\r\n\r\n`);
    await pipeline(createReadStream(file, { highWaterMark: 256 * 1024 }), req, { end: false });
    req.end(`\r\n--${boundary}--\r\n`);
  });
  return { seconds: Number(process.hrtime.bigint() - t) / 1e9, status: res.status, body: res.json };
}

export async function applySeconds(port: number, id: string, headers: CallHeaders = {}): Promise<{ seconds: number; status: number; body: any }> {
  const t = process.hrtime.bigint();
  const res = await call(port, 'POST', `/api/intakes/${id}/apply`, headers);
  return { seconds: Number(process.hrtime.bigint() - t) / 1e9, status: res.status, body: res.json };
}

/** Discards a checked intake, so the same file can be checked again (the checksum guard skips only kept versions). */
export async function discardIntake(port: number, id: string): Promise<number> {
  return (await call(port, 'POST', `/api/intakes/${id}/discard`)).status;
}

export async function peakRss(port: number): Promise<number> {
  return (await call(port, 'GET', '/rss')).json.peakRssMb as number;
}

export const fileSize = (f: string) => statSync(f).size;
