import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { provisionUser } from '../support/sign-in';
import { openTestDataSource } from '../support/test-db';
import {
  abortedPost,
  health,
  multipartBody,
  rawPost,
  signInToProcess,
  startApiProcess,
  type ApiProcess,
  type ProcessSession,
  type RawAnswer,
} from '../integration/intake-api-process';
import { makeCorner, type Corner } from '../integration/intake-support';
import { hostileCases, validCases, validRoster, type HostileCase } from './hostile-generators';

const SEED = 20261202;
/** The server's upload limit in this suite, small enough to send files over it. */
const MAX_BYTES = 2 * 1024 * 1024;
/** Longest wait for one answer: past it the request counts as hung. */
const REQUEST_TIMEOUT_MS = 30_000;

/** Stored tables whose rows hostile uploads must leave exactly as they were. */
const STORED = ['workers', 'roster_entries', 'roster_sums', 'roster_slices', 'case_events', 'run_requests', 'sites', 'exposure_groups', 'outcomes'];

interface Outcome {
  c: HostileCase;
  status: number | 'aborted' | 'no answer';
  answer: RawAnswer | null;
  error?: string;
}

/** Files that can never pass: a \. line, a zero byte, year 0000 or 9999. */
const NEVER_CLEAN = /\\\. line|NUL byte|0000-|9999-/;

/** A problem with a line must name it; these are about the file as a whole. */
const FILE_WIDE = /holds \d+ data rows but|cannot be checked|the file is empty|larger than the limit/;

/**
 * Several hundred generated malformed and hostile files (hostile-generators.ts, seeded) sent
 * through the intake check route of the real server process as a signed-in hygienist. Each is
 * answered: 4xx with a message (its problems with line and column where a line applies) or a 2xx
 * check result; never 5xx, never a hang. Afterwards the process still serves, the stored tables are
 * byte-identical (md5 over ordered rows), and the only staging tables are those of checked intakes.
 */
describe('hostile intake files', () => {
  let ds: DataSource;
  let c: Corner;
  let api: ApiProcess;
  let hyg: ProcessSession;
  const checksums = async () =>
    Object.fromEntries(
      await Promise.all(
        STORED.map(
          async (t) =>
            [
              t,
              (
                (await ds.query(`SELECT md5(coalesce(string_agg(x::text, E'\\n' ORDER BY x::text), '')) AS h, count(*)::int AS n FROM ${t} x`)) as Array<{
                  h: string;
                  n: number;
                }>
              )[0]!,
            ] as const,
        ),
      ),
    );
  const stagingTables = async () =>
    ((await ds.query(`SELECT count(*)::int AS n FROM pg_tables WHERE schemaname = 'intake_staging'`)) as Array<{ n: number }>)[0]!.n;

  beforeAll(async () => {
    ds = await openTestDataSource();
    c = await makeCorner(ds);
    // Stored data for the checks to meet: a roster and a case list of the corner, applied.
    expect((await c.upload('roster', validRoster(c.codes), { mode: 'apply' })).intake.state).toBe('applied');
    expect((await c.upload('cases', validCases(c.codes, 3), { mode: 'apply' })).intake.state).toBe('applied');
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', c.siteIds);
    api = await startApiProcess({ INTAKE_MAX_BYTES: String(MAX_BYTES) });
    hyg = await signInToProcess(api, 'hygienist@demo.ratewarden.test');
  });
  afterAll(async () => {
    await api?.stop();
    await ds?.destroy();
  });

  it('answers every one with 4xx and a message or a check result, and changes nothing stored', async () => {
    const cases = hostileCases(SEED, c.codes, MAX_BYTES);
    expect(cases.length).toBeGreaterThanOrEqual(300);
    const before = await checksums();
    const tablesBefore = await stagingTables();
    const started = new Date();

    const outcomes: Outcome[] = [];
    let slowest = { ms: 0, name: '' };
    for (const hc of cases) {
      const d = hc.delivery;
      const path = `/api/intakes?${d.how === 'raw' && d.query ? d.query : `kind=${d.kind}&mode=check`}`;
      const t0 = performance.now();
      let outcome: Outcome;
      if (d.how === 'abort') {
        await abortedPost(api.baseUrl, path, hyg, d.contentType, d.sent, d.announced);
        outcome = { c: hc, status: 'aborted', answer: null };
      } else {
        try {
          const answer =
            d.how === 'file'
              ? await rawPost(api.baseUrl, path, hyg, 'multipart/form-data; boundary=ratewarden-test-boundary', multipartBody(d.file, `${hc.category}.csv`), {
                  chunked: d.chunked,
                  timeoutMs: REQUEST_TIMEOUT_MS,
                })
              : await rawPost(api.baseUrl, path, hyg, d.contentType, d.body, { timeoutMs: REQUEST_TIMEOUT_MS, announced: d.announced });
          outcome = { c: hc, status: answer.status, answer };
        } catch (err) {
          // A hang (past the timeout) or a connection the server dropped without answering.
          outcome = { c: hc, status: 'no answer', answer: null, error: (err as Error).message };
        }
      }
      const ms = performance.now() - t0;
      if (ms > slowest.ms) slowest = { ms, name: hc.name };
      outcomes.push(outcome);
      // The process is alive after each one, not only at the end.
      expect(api.alive(), `${hc.category}: ${hc.name}\n${api.stderr()}`).toBe(true);
    }

    const failures: string[] = [];
    for (const { c: hc, status, answer } of outcomes) {
      const label = `${hc.category}: ${hc.name} → ${status}`;
      if (status === 'aborted') continue;
      if (status === 'no answer') {
        failures.push(`${label}: ${outcomes.find((o) => o.c === hc)!.error}`);
        continue;
      }
      const body = answer!.body;
      if (NEVER_CLEAN.test(hc.name) && status < 300) failures.push(`${label}: taken in`);
      if (status >= 500 || status < 200 || (status >= 300 && status < 400)) {
        failures.push(`${label} ${JSON.stringify(body)}`);
      } else if (status >= 400) {
        if (!body?.message) failures.push(`${label}: no message`);
        const problems = (body?.details as { intake?: { problems?: Array<{ line: number | null; reason: string }> } } | undefined)?.intake?.problems;
        for (const p of problems ?? []) {
          if (!p.reason) failures.push(`${label}: a problem without a reason`);
          if (p.line === null && !FILE_WIDE.test(p.reason)) failures.push(`${label}: no line for "${p.reason}"`);
        }
      } else {
        const intake = (body as { intake?: { state: string; problems: unknown[]; problemCount: number } } | null)?.intake;
        if (!intake || !['checked', 'applied', 'superseded'].includes(intake.state))
          failures.push(`${label}: not a check result ${JSON.stringify(body)?.slice(0, 300)}`);
      }
    }
    expect(failures).toEqual([]);

    // Still serving, nothing stored changed, no transaction left open.
    expect(await health(api.baseUrl)).toBe(200);
    expect(await checksums()).toEqual(before);
    await expect
      .poll(
        async () =>
          (
            (await ds.query(
              `SELECT count(*)::int AS n FROM pg_stat_activity WHERE datname = current_database() AND state LIKE 'idle in transaction%'`,
            )) as Array<{ n: number }>
          )[0]!.n,
        { timeout: 10_000 },
      )
      .toBe(0);

    // Staging tables: those of the intakes checked in this run (a roster has three, a case list one), no more.
    const mine = (await ds.query(`SELECT kind, state, staging_table FROM intakes WHERE created_at >= $1`, [started])) as Array<{
      kind: string;
      state: string;
      staging_table: string | null;
    }>;
    expect(mine.filter((i) => i.state === 'received')).toEqual([]);
    expect(mine.filter((i) => i.state !== 'checked' && i.staging_table !== null)).toEqual([]);
    const expected = mine.filter((i) => i.state === 'checked').reduce((n, i) => n + (i.kind === 'roster' ? 3 : 1), 0);
    expect(await stagingTables()).toBe(tablesBefore + expected);

    const count = (f: (o: Outcome) => boolean) => outcomes.filter(f).length;
    const byStatus = new Map<string, number>();
    for (const o of outcomes) byStatus.set(String(o.status), (byStatus.get(String(o.status)) ?? 0) + 1);
    const checked = count((o) => o.status === 201);
    console.log(
      `hostile intake files (seed ${SEED}): ${outcomes.length} sent in ${new Set(cases.map((x) => x.category)).size} categories; ` +
        [...byStatus]
          .sort()
          .map(([s, n]) => `${s}: ${n}`)
          .join(', ') +
        `; checked clean: ${checked}; 5xx: ${count((o) => typeof o.status === 'number' && o.status >= 500)}; slowest answer ${(slowest.ms / 1000).toFixed(2)} s (${slowest.name})`,
    );
  });
});
