import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { ageBandEdgesOf } from '@ratewarden/shared/age-bands';
import type { RunSettings } from '@ratewarden/shared/runs';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings, storedResults, type Cohort } from './runs-fixture';

/**
 * Audiograms in, standard threshold shifts out, counted in the next run. Each worker's expected
 * verdict is worked out by hand beside it (29 CFR 1910.95(g)(10): average change at 2000, 3000,
 * 4000 Hz of 10 dB or more against the baseline; Appendix F Table F-1 for the males' ages).
 */
const HEADER = 'worker_key,test_date,ear,test_type,hl_500,hl_1000,hl_2000,hl_3000,hl_4000,hl_6000,hl_8000';

describe('audiogram intake → derived shifts → next run', () => {
  let ds: DataSource;
  let c: Cohort;
  let app: ReturnType<typeof createApp>;
  let hyg: SignedInAgent;
  let phys: SignedInAgent;
  const key = (k: string) => `${c.tag}-${k}`;
  const upload = (who: SignedInAgent, body: Buffer, name = 'audiograms.csv') =>
    who.agent.post('/api/audiograms').set('x-csrf-token', who.csrf).attach('file', body, { filename: name });

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['NOISE', 2],
      ],
      reference: 'REF',
      outcomes: [['HEAR', 'first_event']],
    });
    const ids: Record<string, number> = {};
    // n1, n2 born 1990 (M); n3 born 1985 (F: Table F-2 not stored, compared uncorrected); r1, r2 reference.
    for (const [k, by, sex] of [
      ['n1', 1990, 'M'],
      ['n2', 1990, 'M'],
      ['n3', 1985, 'F'],
      ['r1', 1980, 'M'],
      ['r2', 1982, 'F'],
    ] as const)
      ids[k] = await c.worker(k, by, sex);
    const rows: Array<[number, string, number, number, number]> = [];
    for (let m = 1; m <= 12; m += 1) {
      const month = `2025-${String(m).padStart(2, '0')}-01`;
      for (const k of ['n1', 'n2', 'n3']) rows.push([ids[k]!, month, c.sites[0]!, c.groups.NOISE!, 160]);
      for (const k of ['r1', 'r2']) rows.push([ids[k]!, month, c.sites[1]!, c.groups.REF!, 160]);
    }
    await c.roster(rows);
    app = createApp({ dataSource: ds, config: testApiConfig({ HEARING_OUTCOME_CODE: `HEAR${c.tag}` }) });
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', c.sites);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', c.sites);
    hyg = await signIn(app, 'hygienist@demo.ratewarden.test');
    phys = await signIn(app, 'physician@demo.ratewarden.test');
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('rejects a file with wrong cells and unknown workers, naming line and column, storing nothing', async () => {
    const body = [
      HEADER,
      `${key('n1')},2024-03-04,left,baseline,5,5,12,10,10,10,`,
      `NOBODY-1,2024-03-04,left,baseline,5,5,10,10,10,10,`,
      `${key('n1')},2024-13-04,left,annual,5,5,10,10,10,10,`,
    ].join('\n');
    const res = await upload(hyg, Buffer.from(body)).expect(422);
    expect(res.body.details.problems).toEqual([
      expect.objectContaining({ line: 2, column: 'hl_2000', value: '12' }),
      expect.objectContaining({ line: 4, column: 'test_date', value: '2024-13-04' }),
    ]);
    // Cell problems first; the store's checks (unknown workers) run on a file whose cells are right.
    const unknown = await upload(hyg, Buffer.from([HEADER, `NOBODY-1,2024-03-04,left,baseline,5,5,10,10,10,10,`].join('\n'))).expect(422);
    expect(unknown.body.details.problems).toEqual([expect.objectContaining({ line: 2, column: 'worker_key', value: 'NOBODY-1' })]);
    expect(await ds.query(`SELECT count(*)::int AS n FROM audiograms`)).toEqual([{ n: 0 }]);
  });

  it("takes the cohort's audiograms and answers the hygienist without any shift count", async () => {
    const both = (k: string, date: string, type: string, v: string) => [`${key(k)},${date},left,${type},${v}`, `${key(k)},${date},right,${type},${v}`];
    const normal = '5,5,5,5,10,10,';
    const body = [
      HEADER,
      // n1: baseline 5,5,10 at 2/3/4 kHz (age 34); annual 2025-06-10 left 20,20,25 (age 35): change 15,15,15 minus Table F-1
      // 35 − 34 (not stored → uncorrected, reported) → average 15 ≥ 10: shift, left ear. Right ear unchanged.
      ...both('n1', '2024-06-10', 'baseline', normal),
      `${key('n1')},2025-06-10,left,annual,5,5,20,20,25,20,`,
      `${key('n1')},2025-06-10,right,annual,${normal}`,
      // n2: the annual shows a shift but a retest 20 days later does not: no shift (1910.95(g)(7)(ii)).
      ...both('n2', '2024-06-10', 'baseline', normal),
      `${key('n2')},2025-06-10,left,annual,5,5,20,20,25,20,`,
      `${key('n2')},2025-06-10,right,annual,${normal}`,
      `${key('n2')},2025-06-30,left,retest,${normal}`,
      // n3: right ear 15,15,20 against 5,5,10: average change 10: shift (exactly 10 counts).
      ...both('n3', '2024-07-01', 'baseline', normal),
      `${key('n3')},2025-07-01,left,annual,${normal}`,
      `${key('n3')},2025-07-01,right,annual,5,5,15,15,20,10,`,
      // r1, r2: no change.
      ...both('r1', '2024-05-01', 'baseline', normal),
      ...both('r1', '2025-05-01', 'annual', normal),
      ...both('r2', '2024-05-01', 'baseline', normal),
      ...both('r2', '2025-05-01', 'annual', normal),
    ].join('\r\n');
    const res = await upload(hyg, Buffer.from(body)).expect(201);
    expect(res.body).toEqual({ intakeId: expect.any(String), rows: 21, workers: 5 });
    const cases = (await ds.query(
      `SELECT w.worker_key, to_char(e.onset_date, 'YYYY-MM-DD') AS onset, e.status FROM case_events e JOIN workers w ON w.id = e.worker_id WHERE e.intake_id = $1 ORDER BY 1`,
      [res.body.intakeId],
    )) as unknown[];
    expect(cases).toEqual([
      { worker_key: key('n1'), onset: '2025-06-10', status: 'suspected' },
      { worker_key: key('n3'), onset: '2025-07-01', status: 'suspected' },
    ]);
    expect(await ds.query(`SELECT count(*)::int AS n FROM run_requests WHERE intake_id = $1`, [res.body.intakeId])).toEqual([{ n: 1 }]);
    // The same test twice is refused.
    await upload(hyg, Buffer.from([HEADER, `${key('r1')},2025-05-01,left,annual,${normal}`].join('\n'))).expect(422);
  });

  it('takes an .xlsx of the same format', async () => {
    const book = new ExcelJS.Workbook();
    const sheet = book.addWorksheet('audiograms');
    sheet.addRow(HEADER.split(','));
    sheet.addRow([key('r1'), '2026-05-04', 'left', 'annual', 5, 5, 5, 10, 10, 10, 15]);
    sheet.addRow([key('r1'), '2026-05-04', 'right', 'annual', 5, 5, 5, 5, 10, 10, null]);
    const bytes = Buffer.from(await book.xlsx.writeBuffer());
    const res = await upload(hyg, bytes, 'audiograms.xlsx').expect(201);
    expect(res.body.rows).toBe(2);
    expect(await ds.query(`SELECT hl_8000 FROM audiograms WHERE intake_id = $1 ORDER BY ear`, [res.body.intakeId])).toEqual([
      { hl_8000: 15 },
      { hl_8000: null },
    ]);
  });

  it('shows the physician each shift with its computation, audited; nobody else reads audiograms', async () => {
    const res = await phys.agent.get(`/api/audiograms/workers/${key('n1')}`).expect(200);
    const left = res.body.ears.find((e: { ear: string }) => e.ear === 'left');
    expect(left.shifts).toHaveLength(1);
    expect(left.shifts[0].computation).toMatchObject({ change: { 2000: 15, 3000: 15, 4000: 15 }, averageChange: 15, shift: true, recordable: false });
    const compared = left.steps.find((s: { kind: string }) => s.kind === 'compared');
    expect(compared.ageCorrection).toMatchObject({ applied: false });
    expect(res.body.cases).toEqual([{ caseRef: `STS-${key('n1')}-2025-06-10`, onsetDate: '2025-06-10', status: 'suspected' }]);
    const audit = (await ds.query(`SELECT count(*)::int AS n FROM audit_events WHERE action = 'cases.read' AND target LIKE 'audiograms:worker:%'`)) as {
      n: number;
    }[];
    expect(audit[0]!.n).toBeGreaterThan(0);
    const list = await phys.agent.get('/api/audiograms/workers').expect(200);
    expect(list.body.workers.map((w: { workerKey: string; shifts: number }) => [w.workerKey, w.shifts])).toEqual([
      [key('n1'), 1],
      [key('n2'), 0],
      [key('n3'), 1],
      [key('r1'), 0],
      [key('r2'), 0],
    ]);
    await hyg.agent.get(`/api/audiograms/workers/${key('n1')}`).expect(403);
    await hyg.agent.get('/api/audiograms/workers').expect(403);
  });

  it("the next run counts the derived cases (suspected cases counted in this run's settings)", async () => {
    // Counted statuses are an analysis setting (a version in the database, issue 15): suspected cases
    // are counted for this run, and the settings in force before are put back after it (the run
    // fixture's when no version has been saved yet, as in a fresh database with this file alone).
    const before: RunSettings = (await hyg.agent.get('/api/settings').expect(200)).body.current?.settings ?? settings;
    const settingsOf = (counted: string[]) => ({
      personTimeBasis: before.personTimeBasis,
      per: before.per,
      confidence: before.confidence,
      countedStatuses: counted,
      ageBandEdges: ageBandEdgesOf(before),
    });
    const putSettings = (body: object) => hyg.agent.put('/api/settings').set('x-csrf-token', hyg.csrf).send(body).expect(200);
    await putSettings(settingsOf(['suspected', 'confirmed']));
    const outcome = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000' }).finally(() =>
      putSettings(settingsOf(before.countedStatuses)),
    );
    expect(outcome.status).toBe('succeeded');
    const runId = (outcome as { runId: string }).runId;
    const results = await storedResults(ds, runId, c.outcomes.HEAR!);
    // n1 in June 2025 and n3 in July 2025, both NOISE; no REF case.
    expect(results.get(`${c.groups.NOISE}:month:2025-06`)!.cases).toBe(1);
    expect(results.get(`${c.groups.NOISE}:month:2025-07`)!.cases).toBe(1);
    const summary = (
      (await ds.query(`SELECT summary FROM runs WHERE id = $1`, [runId])) as Array<{ summary: { cases: Array<{ outcomeId: number; counted: number }> } }>
    )[0]!.summary;
    expect(summary.cases.find((t) => t.outcomeId === c.outcomes.HEAR)!.counted).toBe(2);
  });
});
