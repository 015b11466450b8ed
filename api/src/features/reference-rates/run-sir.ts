import type { DataSource } from 'typeorm';
import type { SirAnswer, SirRow } from '@ratewarden/shared/reference-rates';
import { HOURS_PER_PERSON_YEAR } from '@ratewarden/shared/reference-rates';
import { METHODS } from '@ratewarden/shared/stats';
import { resultScope } from '../../disclosure/result-scope';
import { runFrame, seesEveryCount } from '../../disclosure/run-frame';
import { AppError } from '../../lib/app-error';
import { CurrentRunEntity } from '@ratewarden/db/entities/current-run';
import { RunEntity } from '@ratewarden/db/entities/run';
import { ReferenceRateTableEntity } from '@ratewarden/db/entities/reference-rate-table';

type Row = Record<string, any>;

const limit = (v: number | null): number | 'Infinity' | null => (v === null ? null : Number.isFinite(v) ? v : 'Infinity');

/**
 * The SIR rows of one run in the reader's scope (company-wide for readers of every site, else
 * one of their sites, as the results). For readers other than the physician a withheld observed
 * count (the worker's decision in run_sir.withheld) takes the SIR, O − E and the limits with it:
 * each gives the count back (O = SIR × E).
 */
export async function runSir(
  ds: DataSource,
  runId: string | 'current',
  q: { outcomeId?: number; siteId?: number },
  principal: Parameters<typeof seesEveryCount>[0],
): Promise<SirAnswer> {
  const id = runId === 'current' ? (await ds.getRepository(CurrentRunEntity).findOne({ where: { singleton: true } }))?.runId : runId;
  const run = id ? await ds.getRepository(RunEntity).findOne({ select: { id: true, number: true }, where: { id } }) : null;
  if (!run) throw new AppError('not_found', runId === 'current' ? 'no run has succeeded yet' : 'no such run');
  const siteId = await resultScope(ds, principal, q.siteId);
  // As for every run figure: readers other than the physician read the current run only (two runs
  // side by side would give back counts each withholds); the frame's checks say so (disclosure/run-frame.ts).
  await runFrame(ds, run.id, principal, q.outcomeId);
  const rows: Row[] = await ds.query(
    `SELECT s.*, s.hours::float8 AS hours_n, s.hours_uncovered::float8 AS hours_uncovered_n FROM run_sir s
     WHERE s.run_id = $1 AND s.site_id IS NOT DISTINCT FROM $2::int AND ($3::int IS NULL OR s.outcome_id = $3)
     ORDER BY s.outcome_id, s.exposure_group_id`,
    [run.id, siteId, q.outcomeId ?? null],
  );
  const all = seesEveryCount(principal);
  const tableId: number | null =
    rows[0]?.reference_table_id ??
    (await ds.query(`SELECT reference_table_id FROM run_sir WHERE run_id = $1 LIMIT 1`, [run.id]))[0]?.reference_table_id ??
    null;
  const sources =
    tableId === null ? [] : ((await ds.getRepository(ReferenceRateTableEntity).findOne({ select: { sources: true }, where: { id: tableId } }))?.sources ?? []);
  return {
    runId: run.id,
    runNumber: Number(run.number),
    referenceVersion: tableId,
    sources,
    rows: rows.map((r): SirRow => {
      const withheld = all ? null : (r.withheld as SirRow['withheld']);
      const hide = withheld !== null;
      return {
        outcomeId: r.outcome_id,
        exposureGroupId: r.exposure_group_id,
        siteId: r.site_id,
        observed: hide ? null : r.observed,
        expected: r.expected,
        sir: hide ? null : r.sir,
        excess: hide ? null : r.observed - r.expected,
        exact: hide ? { lower: null, upper: null } : { lower: limit(r.exact_lower), upper: limit(r.exact_upper) },
        byar: hide ? { lower: null, upper: null } : { lower: limit(r.byar_lower), upper: limit(r.byar_upper) },
        personYears: r.hours_n / HOURS_PER_PERSON_YEAR,
        personYearsUncovered: r.hours_uncovered_n / HOURS_PER_PERSON_YEAR,
        confidence: r.confidence,
        withheld,
        methods: { exact: METHODS.sirExact, byar: METHODS.sirByar },
      };
    }),
  };
}
