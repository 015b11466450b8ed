import type { DataSource } from 'typeorm';
import type { ResultAdjustment, ResultInterval, StoredResult } from '@ratewarden/db/run-results';
import type { RunResult, RunResultsQuery } from '@ratewarden/shared/runs';
import { toJsonValue } from '@ratewarden/shared/stats';
import { resultScope } from '../../disclosure/result-scope';
import { runFrame, withheldIn, type RunFrame } from '../../disclosure/run-frame';
import { n, withheldOf, type ResultReader } from './result-reader';
import { isTwelveMonthWindow } from '@ratewarden/shared/windows';
import { completenessOf, runPeriodBook, runWindowContext } from './run-periods';
import { getRun } from './runs-service';

/**
 * A stored result as listResults reads it (`r.*`): node-postgres gives its period as a Date, so
 * the statement adds it as YYYY-MM-DD (`period_iso`), with the reference group's count beside it.
 */
type ResultRead = Omit<StoredResult, 'period'> & { period: Date; period_iso: string; ref_cases: number | null };

const limits = (r: ResultRead, p: ResultInterval) => ({ estimate: n(r[p]), lower: n(r[`${p}_lower` as const]), upper: n(r[`${p}_upper` as const]) });

const nullLimits = () => ({ estimate: null, lower: null, upper: null });

/** "outcome|group|window|period" of every site count the frame withholds (a by-site adjustment is shown only without any). */
function siteCountsWithheld(frame: RunFrame | null): Set<string> {
  const out = new Set<string>();
  for (const key of frame?.keys() ?? []) {
    const [site, ...rest] = key.split('|');
    if (site !== 'all') out.add(rest.join('|'));
  }
  return out;
}

const MH_DETAIL = {
  age: ['mhAgeHomogeneity', 'mhAgeStrataUsed'],
  site: ['mhSiteHomogeneity', 'mhSiteStrataUsed'],
  sex: ['mhSexHomogeneity', 'mhSexStrataUsed'],
} as const;

/**
 * A result row as its reader may see it. A withheld count goes with every figure that would give
 * it back (rate and limits, u-chart, comparisons; a withheld reference count takes the
 * comparisons and the expected count). An adjusted measure is a function of its strata, so it is
 * shown only where they are: by age band and by sex where the company's stratum tables of both
 * groups are shown (run-strata.ts: twelve-month windows ending in December), by site where every site's count of both groups is.
 */
function resultOf(r: ResultRead, reader: ResultReader, frame: RunFrame | null, sitesWithheld: Set<string>): Omit<RunResult, 'completeness'> {
  const t = reader.smallCellThreshold;
  const withheld = withheldOf(frame, r.cases, r.site_id, r.outcome_id, r.exposure_group_id, r.window_kind, r.period_iso, t);
  const suppressed = withheld !== null;
  const refId: number | null = r.reference_group_id === null || r.is_reference ? null : r.reference_group_id;
  const refWithheld = refId === null ? null : withheldOf(frame, r.ref_cases, r.site_id, r.outcome_id, refId, r.window_kind, r.period_iso, t);
  const comparisonSuppressed = !suppressed && refWithheld !== null;
  const hide = suppressed || comparisonSuppressed;
  const groups = refId === null ? [r.exposure_group_id] : [r.exposure_group_id, refId];
  const strataShown = (by: 'age' | 'sex') =>
    frame === null ||
    (r.site_id === null &&
      isTwelveMonthWindow(r.window_kind) &&
      groups.every((g) => withheldIn(frame, null, r.outcome_id, g, `strata_${by}`, r.period_iso) === null));
  const open = {
    age: !hide && strataShown('age'),
    sex: !hide && strataShown('sex'),
    site: !hide && (frame === null || (r.site_id === null && groups.every((g) => !sitesWithheld.has(`${r.outcome_id}|${g}|${r.window_kind}|${r.period_iso}`)))),
  };
  const mh = (by: ResultAdjustment) => {
    const p = `mh_${by}` as const;
    return open[by]
      ? { irr: { ...limits(r, `${p}_irr`), p: r[`${p}_irr_p`] }, ird: limits(r, `${p}_ird`) }
      : { irr: { ...nullLimits(), p: null }, ird: nullLimits() };
  };
  const detail = hide ? {} : (toJsonValue(r.detail) as Record<string, unknown>);
  for (const by of ['age', 'site', 'sex'] as const) if (!open[by]) for (const k of MH_DETAIL[by]) delete detail[k];
  return {
    siteId: r.site_id,
    outcomeId: r.outcome_id,
    exposureGroupId: r.exposure_group_id,
    window: r.window_kind,
    period: r.period_iso,
    monthsCovered: r.months_covered,
    isReference: r.is_reference,
    referenceGroupId: r.reference_group_id,
    cases: suppressed ? null : r.cases,
    suppressed,
    withheld,
    comparisonSuppressed,
    hours: r.hours,
    personTime: r.person_time,
    // The rate times the person-time gives the count back, and so do its exact limits.
    rate: suppressed ? nullLimits() : limits(r, 'rate'),
    // Expected cases come from the reference group's count: withheld with it, whether or not this row's count is.
    expected: refWithheld !== null ? null : r.expected,
    irr: hide
      ? { ...nullLimits(), p: null, waldLower: null, waldUpper: null }
      : { ...limits(r, 'irr'), p: r.irr_p, waldLower: n(r.irr_wald_lower), waldUpper: n(r.irr_wald_upper) },
    ird: hide ? { ...nullLimits(), p: null } : { ...limits(r, 'ird'), p: r.ird_p },
    mhAge: mh('age'),
    mhSite: mh('site'),
    mhSex: mh('sex'),
    uChart: suppressed ? { centre: null, lcl: null, ucl: null, signal: null } : { centre: r.u_centre, lcl: r.u_lcl, ucl: r.u_ucl, signal: r.u_signal },
    detail,
  };
}

/**
 * The results of one run, filtered; ordered by outcome, group, window and period. Company-wide
 * rows for readers of every site, one site's rows (computed by the run from that site's cells
 * alone) when `siteId` is given; small counts suppressed unless the reader is the physician.
 */
export async function listResults(ds: DataSource, runId: string, q: RunResultsQuery, reader: ResultReader): Promise<RunResult[]> {
  const run = await getRun(ds, runId); // a run's existence is not scoped (the run list shows every run)
  const siteId = await resultScope(ds, reader.principal, q.siteId);
  const frame = await runFrame(ds, runId, reader.principal, q.outcomeId);
  const rows: ResultRead[] = await ds.query(
    `SELECT r.*, to_char(r.period, 'YYYY-MM-DD') AS period_iso, ref.cases AS ref_cases
     FROM run_results r
     LEFT JOIN run_results ref ON ref.run_id = r.run_id AND ref.site_id IS NOT DISTINCT FROM r.site_id AND ref.outcome_id = r.outcome_id
       AND ref.exposure_group_id = r.reference_group_id AND ref.window_kind = r.window_kind AND ref.period = r.period AND NOT r.is_reference
     WHERE r.run_id = $1 AND r.site_id IS NOT DISTINCT FROM $7::int AND ($2::int IS NULL OR r.outcome_id = $2) AND ($3::int IS NULL OR r.exposure_group_id = $3)
       AND ($4::text IS NULL OR r.window_kind = $4) AND ($5::date IS NULL OR r.period >= $5) AND ($6::date IS NULL OR r.period <= $6)
       AND ($8::text[] IS NULL OR r.window_kind = ANY($8))
     ORDER BY r.outcome_id, r.exposure_group_id, r.window_kind, r.period`,
    [runId, q.outcomeId ?? null, q.exposureGroupId ?? null, q.window ?? null, q.from ?? null, q.to ?? null, siteId, q.windows ?? null],
  );
  const sitesWithheld = siteCountsWithheld(frame);
  const completeness = completenessOf(await runPeriodBook(ds, runId), runWindowContext(run));
  return rows.map((r) => ({ ...resultOf(r, reader, frame, sitesWithheld), completeness: completeness(r.window_kind, r.period_iso, r.site_id) }));
}
