import { type ChildProcess, spawn } from 'node:child_process';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { openTestDataSource, testDatabaseUrl } from '../support/test-db';
import { currentRunId, makeCohort, settings, clearCohortData } from './runs-fixture';

const root = join(import.meta.dirname, '..', '..');
const children: ChildProcess[] = [];

function start(entry: string, env: NodeJS.ProcessEnv = {}): ChildProcess {
  const child = spawn(process.execPath, ['--import', 'tsx', entry], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: testDatabaseUrl(), RUN_POLL_MS: '100', NOTICE_POLL_MS: '60000', SMTP_PORT: '9', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout!.resume();
  child.stderr!.resume();
  children.push(child);
  return child;
}

async function until<T>(what: string, probe: () => Promise<T | undefined | null | false>, timeoutMs = 30_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await probe();
    if (v) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('one run at a time across workers', () => {
  let ds: DataSource;
  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    const c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['LOCK', 'recurrent']],
    });
    const w = await c.worker('w', 1980, 'F');
    await c.roster([[w, '2031-01-01', c.sites[0]!, c.groups.EXP!, 100]]);
  });
  afterEach(() => {
    for (const child of children.splice(0)) if (child.exitCode === null) child.kill('SIGKILL');
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('two runs started together in one process: one runs, the other is skipped as busy', async () => {
    const other = await openTestDataSource();
    try {
      const outcomes = await Promise.all([
        performRun(ds, { trigger: 'cli', settings, appUrl: 'x' }),
        performRun(other, { trigger: 'cli', settings, appUrl: 'x' }),
      ]);
      expect(outcomes.map((o) => o.status).sort()).toEqual(['skipped', 'succeeded']);
    } finally {
      await other.destroy();
    }
  });

  it('two worker processes started together produce exactly one run for one request', async () => {
    const marker = `two-workers-${Date.now()}`;
    await ds.query(`INSERT INTO run_requests (reason) VALUES ($1)`, [marker]);
    start('worker/src/main.ts');
    start('worker/src/main.ts');
    await until('the request to be picked', async () => {
      const rows = (await ds.query(`SELECT picked_at FROM run_requests WHERE reason = $1`, [marker])) as Array<{ picked_at: Date | null }>;
      return rows[0]?.picked_at !== null;
    });
    await new Promise((r) => setTimeout(r, 1_500)); // both workers poll many times meanwhile
    const runs = (await ds.query(`SELECT state FROM runs WHERE reason LIKE '%' || $1 || '%'`, [marker])) as Array<{ state: string }>;
    expect(runs).toEqual([{ state: 'succeeded' }]);
  });

  it('a worker killed mid-run leaves the previous results current, and the next run succeeds', async () => {
    const first = await performRun(ds, { trigger: 'cli', settings, appUrl: 'x', waitForLockMs: 10_000 });
    expect(first.status).toBe('succeeded');
    const previous = (first as { runId: string }).runId;

    // Hold the current-run pointer so the child's final transaction blocks there, mid-run.
    const holder = ds.createQueryRunner();
    await holder.connect();
    await holder.startTransaction();
    await holder.query(`LOCK TABLE current_run IN ACCESS EXCLUSIVE MODE`);
    const child = start('scripts/run-now.ts');
    const killed = await until('the child run to start', async () => {
      const rows = (await ds.query(`SELECT id FROM runs WHERE state = 'running' AND worker LIKE '%:' || $1`, [String(child.pid)])) as Array<{ id: string }>;
      return rows[0]?.id;
    });
    await new Promise((r) => setTimeout(r, 300));
    child.kill('SIGKILL');
    await new Promise((r) => child.once('exit', r));
    await holder.rollbackTransaction();
    await holder.release();

    expect(await currentRunId(ds)).toBe(previous);
    const [stored] = (await ds.query(`SELECT count(*)::int AS n FROM run_results WHERE run_id = $1`, [killed])) as Array<{ n: number }>;
    expect(stored!.n).toBe(0);

    const next = await performRun(ds, { trigger: 'cli', settings, appUrl: 'x', waitForLockMs: 20_000 });
    expect(next.status).toBe('succeeded');
    expect(await currentRunId(ds)).toBe((next as { runId: string }).runId);
    const [stale] = (await ds.query(`SELECT state, error FROM runs WHERE id = $1`, [killed])) as Array<{ state: string; error: string }>;
    expect(stale).toEqual({ state: 'failed', error: expect.stringMatching(/interrupted/) });
  });
});
