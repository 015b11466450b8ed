import { spawn } from 'node:child_process';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { applyIntake, discardIntake, restoreIntake } from '@ratewarden/api/features/intake/intake-service';
import { caseCsvHeader, caseCsvLine, generateCohort, rosterCsvHeader, rosterCsvLine } from '@ratewarden/db/seed/demo-generator';
import { openTestDataSource, testDatabaseUrl } from '../support/test-db';
import { currentRoster, makeCorner, type Corner } from './intake-support';

const roster = (rows: string[]) => `worker_key,site,exposure_group,month,hours,birth_year,sex\n${rows.join('\n')}\n`;

describe('intake versions: check, apply, supersede, restore (service level, real PostgreSQL)', () => {
  let ds: DataSource;
  let c: Corner;
  beforeAll(async () => {
    ds = await openTestDataSource();
    c = await makeCorner(ds);
  });
  afterAll(async () => {
    await ds?.destroy();
  });

  it('checks, shows the diff against the stored month, applies, supersedes and restores', async () => {
    const v1 = await c.upload(
      'roster',
      roster(['{W}1,{S1},{GA},2024-03,160,1980,F', '{W}2,{S1},{GA},2024-03,150,1981,M', '{W}3,{S1},{GB},2024-03,140,1982,F']),
      { mode: 'apply' },
    );
    expect(v1.intake.state).toBe('applied');
    expect(v1.intake.runRequest?.reason).toBe('roster intake applied');

    // Version 2 of the same site × month: W1 unchanged, W2 moved to GB, W3 hours changed, W4 added; (W2 in GB, and W3 …)
    const v2 = await c.upload(
      'roster',
      roster([
        '{W}1,{S1},{GA},2024-03,160,1980,F',
        '{W}2,{S1},{GB},2024-03,150,1981,M',
        '{W}3,{S1},{GB},2024-03,141.5,1982,F',
        '{W}4,{S1},{GC},2024-03,20,1999,X',
      ]),
    );
    expect(v2.intake.state).toBe('checked');
    expect(v2.intake.diff).toMatchObject({
      kind: 'roster',
      newWorkers: 1,
      totals: { added: 1, removed: 0, moved: 1, hoursChanged: 1, unchanged: 1, newSlices: 0, replacedSlices: 1 },
      orphanedCases: { count: 0, withheld: null, cases: [] },
      slices: [
        {
          siteCode: c.codes.S1,
          month: '2024-03',
          stored: true,
          storedHours: 450,
          newHours: 471.5,
          workers: { added: [`${c.codes.W}4`], removed: [], moved: [`${c.codes.W}2`], hoursChanged: [`${c.codes.W}3`] },
        },
      ],
    });
    // Still the old version until apply.
    expect((await currentRoster(ds, c.siteIds)).map((r) => r.hours)).toEqual(['160.00', '150.00', '140.00']);

    const applied = await applyIntake(ds, c.principal, v2.intake.id);
    expect(applied.state).toBe('applied');
    expect((await currentRoster(ds, c.siteIds)).map((r) => [r.worker_key.slice(-1), r.grp.slice(0, 2), r.hours])).toEqual([
      ['1', 'GA', '160.00'],
      ['2', 'GB', '150.00'],
      ['3', 'GB', '141.50'],
      ['4', 'GC', '20.00'],
    ]);
    const [old] = await ds.query(`SELECT state, superseded_at IS NOT NULL AS marked FROM intakes WHERE id = $1`, [v1.intake.id]);
    expect(old).toEqual({ state: 'superseded', marked: true });
    // The old rows are kept.
    expect(await ds.query(`SELECT count(*)::int AS n FROM roster_entries WHERE intake_id = $1`, [v1.intake.id])).toEqual([{ n: 3 }]);

    const restored = await restoreIntake(ds, c.principal, v1.intake.id);
    expect(restored.state).toBe('applied');
    expect((await currentRoster(ds, c.siteIds)).map((r) => r.hours)).toEqual(['160.00', '150.00', '140.00']);
    const [v2now] = await ds.query(`SELECT state FROM intakes WHERE id = $1`, [v2.intake.id]);
    expect(v2now.state).toBe('superseded');
    const audit = await ds.query(`SELECT action FROM audit_events WHERE target = ANY($1) ORDER BY id`, [[`intake:${v1.intake.id}`, `intake:${v2.intake.id}`]]);
    expect(audit.map((a: { action: string }) => a.action)).toEqual(['intake.receive', 'intake.apply', 'intake.receive', 'intake.apply', 'intake.restore']);
    await expect(restoreIntake(ds, c.principal, v1.intake.id)).rejects.toMatchObject({ code: 'conflict' });
  });

  it('refuses a worker already rostered at another site in the same month', async () => {
    await c.upload('roster', roster(['{W}50,{S1},{GA},2024-05,100,1970,M']), { mode: 'apply' });
    const other = await c.upload('roster', roster(['{W}50,{S2},{GA},2024-05,100,1970,M']));
    expect(other.intake.state).toBe('rejected');
    expect(other.intake.problems[0]).toMatchObject({
      line: 2,
      column: 'site',
      reason: 'the worker is already on the stored roster of another site for this month',
    });
  });

  it('detects the very same file by checksum and changes nothing', async () => {
    const body = roster(['{W}60,{S2},{GA},2024-06,100,1970,M']);
    const first = await c.upload('roster', body, { mode: 'apply' });
    const counts = await ds.query(
      `SELECT (SELECT count(*) FROM intakes) AS i, (SELECT count(*) FROM roster_entries) AS r, (SELECT count(*) FROM run_requests) AS q`,
    );
    const again = await c.upload('roster', body, { mode: 'apply' });
    expect(again.duplicate).toBe(true);
    expect(again.intake.id).toBe(first.intake.id);
    expect(
      await ds.query(`SELECT (SELECT count(*) FROM intakes) AS i, (SELECT count(*) FROM roster_entries) AS r, (SELECT count(*) FROM run_requests) AS q`),
    ).toEqual(counts);
  });

  it('discards a checked intake: staged rows dropped, nothing applied', async () => {
    const { intake } = await c.upload('roster', roster(['{W}70,{S2},{GA},2024-07,100,1970,M']));
    const discarded = await discardIntake(ds, c.principal, intake.id);
    expect(discarded).toMatchObject({ state: 'rejected', staged: false });
    expect(await ds.query(`SELECT count(*)::int AS n FROM roster_entries WHERE intake_id = $1`, [intake.id])).toEqual([{ n: 0 }]);
    await expect(applyIntake(ds, c.principal, intake.id)).rejects.toMatchObject({ code: 'conflict' });
  });

  it('re-checks at apply time: a checked intake that no longer fits is rejected and stores nothing', async () => {
    const late = await c.upload('roster', roster(['{W}80,{S2},{GA},2024-08,100,1970,M']));
    await c.upload('roster', roster(['{W}80,{S1},{GA},2024-08,100,1970,M']), { mode: 'apply' });
    const result = await applyIntake(ds, c.principal, late.intake.id);
    expect(result.state).toBe('rejected');
    expect(await ds.query(`SELECT count(*)::int AS n FROM roster_entries WHERE intake_id = $1`, [late.intake.id])).toEqual([{ n: 0 }]);
  });

  it('refuses a hygienist a file for a site outside their sites', async () => {
    const narrow = { ...c.principal, siteIds: [c.siteIds[0]!] } as typeof c.principal;
    await expect(c.upload('roster', roster(['{W}90,{S2},{GA},2024-09,100,1970,M']), { principal: narrow })).rejects.toMatchObject({ code: 'forbidden' });
    expect(await ds.query(`SELECT 1 FROM workers WHERE worker_key = $1`, [`${c.codes.W}90`])).toEqual([]);
  });

  it('supersedes a changed case and restores the earlier case list', async () => {
    await c.upload('roster', roster(['{W}100,{S1},{GA},2024-10,100,1970,M']), { mode: 'apply' });
    const first = await c.upload('cases', 'case_ref,worker_key,outcome,onset_date,status\nK1{W},{W}100,{OA},2024-10-02,suspected\n', { mode: 'apply' });
    expect(first.intake.state).toBe('applied');
    const second = await c.upload(
      'cases',
      'case_ref,worker_key,outcome,onset_date,status\nK1{W},{W}100,{OA},2024-10-02,confirmed\nK2{W},{W}100,{OB},2024-10-20,confirmed\n',
      { mode: 'apply' },
    );
    expect(second.intake.diff).toMatchObject({ kind: 'cases', new: 1, changed: 1, unchanged: 0 });
    const status = () =>
      ds.query(`SELECT case_ref, status FROM case_events WHERE superseded_by IS NULL AND case_ref LIKE $1 ORDER BY case_ref`, [`%${c.codes.W}`]);
    expect(await status()).toEqual([
      { case_ref: `K1${c.codes.W}`, status: 'confirmed' },
      { case_ref: `K2${c.codes.W}`, status: 'confirmed' },
    ]);
    expect((await ds.query(`SELECT state FROM intakes WHERE id = $1`, [first.intake.id]))[0].state).toBe('superseded');
    await restoreIntake(ds, c.principal, first.intake.id);
    expect(await status()).toEqual([
      { case_ref: `K1${c.codes.W}`, status: 'suspected' },
      { case_ref: `K2${c.codes.W}`, status: 'confirmed' },
    ]);
  });

  it('leaves nothing behind when the intake process is killed mid-COPY', async () => {
    const prefix = `${c.codes.W}K`;
    const child = spawn(
      process.execPath,
      ['--import', 'tsx', join(import.meta.dirname, 'intake-kill-child.ts'), testDatabaseUrl(), c.codes.S2, c.codes.GA, prefix, JSON.stringify(c.principal)],
      { stdio: ['ignore', 'pipe', 'inherit'] },
    );
    await new Promise<void>((resolve, reject) => {
      child.stdout.on('data', (d: Buffer) => d.toString().includes('copying') && resolve());
      child.on('exit', (code) => reject(new Error(`child exited early (${code})`)));
    });
    // The COPY is running: its backend is in the middle of the transaction.
    const active = await ds.query(`SELECT count(*)::int AS n FROM pg_stat_activity WHERE application_name = 'intake-kill-child' AND query LIKE 'COPY%'`);
    expect(active).toEqual([{ n: 1 }]);
    child.kill('SIGKILL');
    for (let i = 0; i < 100; i++) {
      const [{ n }] = await ds.query(`SELECT count(*)::int AS n FROM pg_stat_activity WHERE application_name = 'intake-kill-child'`);
      if (n === 0) break;
      await new Promise((r) => setTimeout(r, 100));
    }
    expect(await ds.query(`SELECT count(*)::int AS n FROM pg_stat_activity WHERE application_name = 'intake-kill-child'`)).toEqual([{ n: 0 }]);
    expect(await ds.query(`SELECT count(*)::int AS n FROM intakes WHERE file_name = 'killed.csv'`)).toEqual([{ n: 0 }]);
    expect(await ds.query(`SELECT count(*)::int AS n FROM workers WHERE worker_key LIKE $1`, [`${prefix}%`])).toEqual([{ n: 0 }]);
    expect(await ds.query(`SELECT count(*)::int AS n FROM roster_slices WHERE site_id = $1 AND month < '2020-01-01'`, [c.siteIds[1]])).toEqual([{ n: 0 }]);
  });

  it('stores person-time and case counts equal to totals computed independently from the generated CSV', async () => {
    const shape = {
      seed: 99,
      workers: 300,
      firstMonth: '2018-01',
      months: 24,
      sites: [c.codes.S1, c.codes.S2],
      workerPrefix: `${c.codes.W}G`,
      groups: [
        { code: c.codes.GA, share: 0.5 },
        { code: c.codes.GB, share: 0.3 },
        { code: c.codes.GC, share: 0.2 },
      ],
      outcomes: [
        { code: c.codes.OA, ratePer100py: 30, firstEventOnly: true, rateRatio: { [c.codes.GC]: 3 } },
        { code: c.codes.OB, ratePer100py: 50, firstEventOnly: false },
      ],
    };
    let rosterCsv = rosterCsvHeader;
    let casesCsv = caseCsvHeader;
    generateCohort(
      shape,
      (r) => (rosterCsv += rosterCsvLine(r)),
      (k) => (casesCsv += caseCsvLine(k)),
    );
    const r = await c.upload('roster', Buffer.from(rosterCsv), { mode: 'apply' });
    expect(r.intake.problems).toEqual([]);
    const k = await c.upload('cases', Buffer.from(casesCsv), { mode: 'apply' });
    expect(k.intake.problems).toEqual([]);

    // Independent totals: csv-parse over the same text, summed in integer hundredths of an hour.
    const rows = parse(rosterCsv, { columns: true }) as Array<Record<string, string>>;
    const hoursByGroup = new Map<string, number>();
    for (const row of rows) hoursByGroup.set(row.exposure_group!, (hoursByGroup.get(row.exposure_group!) ?? 0) + Math.round(Number(row.hours) * 100));
    const caseRows = parse(casesCsv, { columns: true }) as Array<Record<string, string>>;
    const casesByOutcome = new Map<string, number>();
    for (const row of caseRows) casesByOutcome.set(row.outcome!, (casesByOutcome.get(row.outcome!) ?? 0) + 1);

    const stored = await ds.query(
      `SELECT g.code, (sum(re.hours) * 100)::bigint::text AS centi, count(*)::int AS n FROM roster_entries re
       JOIN roster_slices rs ON rs.intake_id = re.intake_id AND rs.site_id = re.site_id AND rs.month = re.month
       JOIN exposure_groups g ON g.id = re.exposure_group_id WHERE re.intake_id = $1 GROUP BY g.code ORDER BY g.code`,
      [r.intake.id],
    );
    expect(stored.map((s: { code: string; centi: string }) => [s.code, Number(s.centi)])).toEqual([...hoursByGroup].sort(([a], [b]) => a.localeCompare(b)));
    expect(stored.reduce((t: number, s: { n: number }) => t + s.n, 0)).toBe(rows.length);
    const storedCases = await ds.query(
      `SELECT o.code, count(*)::int AS n FROM case_events ce JOIN outcomes o ON o.id = ce.outcome_id WHERE ce.intake_id = $1 AND ce.superseded_by IS NULL GROUP BY o.code ORDER BY o.code`,
      [k.intake.id],
    );
    expect(storedCases.map((s: { code: string; n: number }) => [s.code, s.n])).toEqual([...casesByOutcome].sort(([a], [b]) => a.localeCompare(b)));
    expect(caseRows.length).toBeGreaterThan(20);
  });
});
