import type { DataSource } from 'typeorm';
import type { StoredResult } from '@ratewarden/db/run-results';
import { SiteEntity } from '@ratewarden/db/entities/site';
import type { Withheld } from '@ratewarden/shared/small-cells';
import { ageBandEdgesOf, ageBandLabel } from '@ratewarden/shared/age-bands';
import type { RunSettings, RunStrata, RunStrataQuery, RunStratum } from '@ratewarden/shared/runs';
import { compareRates, METHODS, personTimeOfHours } from '@ratewarden/shared/stats';
import { AppError } from '../../lib/app-error';
import { runFrame, withheldCount, withheldIn, type RunFrame } from '../../disclosure/run-frame';
import { resultScope } from '../../disclosure/result-scope';
import { n, type ResultReader } from './result-reader';
import { getRun } from './runs-service';
import { isTwelveMonthWindow, windowContextOf, windowMonths } from '@ratewarden/shared/windows';

const KEY_SQL = { age: 'c.age_band::text', site: 'c.site_id::text', sex: 'c.sex' } as const;

const sexLabels: Record<string, string> = { F: 'female', M: 'male', X: 'another sex' };

interface Arm {
  cases: number;
  hours: string;
}

/**
 * The stratum table behind an adjusted figure: one exposure group and its reference group, in
 * each age band, site or sex, read from the cells the run aggregated (run_cells) over the same
 * window and scope as its results, with each stratum's own IRR (exact conditional) and IRD (Wald)
 * from the shared core. For every reader but the physician the strata of each arm go through
 * the same suppression as the results: small counts, then their complements (the strata add up
 * to the group's count shown in the results); a whole arm is withheld when its group's count is.
 */
export async function runStrata(ds: DataSource, runId: string, q: RunStrataQuery, reader: ResultReader): Promise<RunStrata> {
  const run = await getRun(ds, runId);
  const siteId = await resultScope(ds, reader.principal, q.siteId);
  if (q.by === 'site' && siteId !== null)
    throw new AppError('bad_request', 'one site is a single site stratum: stratify by age band or sex, or read the whole company');
  const [row]: Array<Pick<StoredResult, 'cases' | 'reference_group_id' | 'is_reference'>> = await ds.query(
    `SELECT cases, reference_group_id, is_reference FROM run_results
     WHERE run_id = $1 AND site_id IS NOT DISTINCT FROM $2::int AND outcome_id = $3 AND exposure_group_id = $4 AND window_kind = $5 AND period = $6`,
    [runId, siteId, q.outcomeId, q.exposureGroupId, q.window, q.period],
  );
  if (!row) throw new AppError('not_found', 'this run has no result for that outcome, group, window and period in your scope');
  const referenceId = row.is_reference ? null : row.reference_group_id;
  // The row exists, so the period ends a window of its kind (shared/src/windows.ts).
  const [windowStart] = windowMonths(q.window, q.period, windowContextOf(run.settings));
  const groupIds = referenceId === null ? [q.exposureGroupId] : [q.exposureGroupId, referenceId];
  const cells: Array<{ group_id: number; k: string | null; hours: string; cases: number }> = await ds.query(
    `SELECT rc.exposure_group_id AS group_id, ${KEY_SQL[q.by]} AS k, sum(c.hours)::text AS hours, sum(c.cases)::int AS cases
     FROM run_cells rc, unnest(rc.months, rc.site_ids, rc.age_bands, rc.sexes, rc.hours, rc.cases) AS c(month, site_id, age_band, sex, hours, cases)
     WHERE rc.run_id = $1 AND rc.outcome_id = $2 AND rc.exposure_group_id = ANY($3::int[]) AND c.month BETWEEN $4 AND $5 AND ($6::int IS NULL OR c.site_id = $6)
     GROUP BY 1, 2`,
    [runId, q.outcomeId, groupIds, windowStart ?? q.period, q.period, siteId],
  );
  const arms = new Map<string, Map<number, Arm>>();
  for (const c of cells) {
    const k = c.k ?? '';
    const m = arms.get(k) ?? new Map<number, Arm>();
    m.set(c.group_id, { cases: c.cases, hours: c.hours });
    arms.set(k, m);
  }
  const siteNames =
    q.by === 'site' ? new Map((await ds.getRepository(SiteEntity).find({ select: { id: true, name: true } })).map((s) => [String(s.id), s.name])) : null;
  const label = (k: string) =>
    k === ''
      ? 'not recorded'
      : q.by === 'age'
        ? ageBandLabel(Number(k), ageBandEdgesOf(run.settings as RunSettings))
        : q.by === 'site'
          ? (siteNames!.get(k) ?? `site ${k}`)
          : (sexLabels[k] ?? k);
  const keys = [...arms.keys()].sort((a, b) => {
    if (a === '' || b === '') return a === '' ? 1 : -1; // unknown last
    return q.by === 'age' ? Number(a) - Number(b) : label(a).localeCompare(label(b));
  });

  const frame = await runFrame(ds, runId, reader.principal, q.outcomeId);
  const withheld = armWithholding(frame, q, siteId, reader.smallCellThreshold, keys, arms, groupIds);
  const { personTimeBasis, confidence, per } = run.settings as RunSettings;
  const personTime = (hours: string) => personTimeOfHours(Number(hours), personTimeBasis);

  const strata: RunStratum[] = keys.map((k) => {
    const arm = (g: number) => arms.get(k)!.get(g) ?? { cases: 0, hours: '0.00' };
    const shown = (g: number) => {
      const a = arm(g);
      const w = withheld.get(g)?.get(k) ?? null;
      const pt = personTime(a.hours);
      return { cases: w ? null : a.cases, withheld: w, hours: a.hours, personTime: pt, rate: w || pt === 0 ? null : n((a.cases / pt) * per) };
    };
    const exposed = shown(q.exposureGroupId);
    const reference = referenceId === null ? null : shown(referenceId);
    const comparable = reference !== null && exposed.withheld === null && reference.withheld === null;
    const c = comparable
      ? compareRates(
          { cases: arm(q.exposureGroupId).cases, personTime: exposed.personTime },
          { cases: arm(referenceId!).cases, personTime: reference.personTime },
          { confidence, per },
        )
      : null;
    return {
      key: k === '' ? null : k,
      label: label(k),
      exposed,
      reference,
      irr: c ? { estimate: n(c.irr.estimate), lower: n(c.irr.exact.lower), upper: n(c.irr.exact.upper) } : null,
      ird: c ? { estimate: n(c.ird.estimate), lower: n(c.ird.wald.lower), upper: n(c.ird.wald.upper) } : null,
    };
  });
  return {
    by: q.by,
    siteId,
    exposureGroupId: q.exposureGroupId,
    referenceGroupId: referenceId,
    strata,
    methods: { irr: METHODS.irrExact, ird: METHODS.irdWald },
  };
}

/**
 * For each arm, which strata counts a reader may not see (group id → stratum key → why), as the
 * run's disclosure frame says (worker/src/disclosure/disclosure-frame.ts). By site, the strata are
 * the sites' own counts in the results, withheld as there. By age band and by sex, a reader other
 * than the physician sees the company's tables in yearly windows only (the rolling twelve months
 * ending in December and the calendar year), each whole or not
 * at all ('strata'): zeros too, since the zeros of a table would say how many strata share its
 * total. A whole arm is withheld when its group's count is.
 */
function armWithholding(
  frame: RunFrame | null,
  q: RunStrataQuery,
  siteId: number | null,
  threshold: number,
  keys: string[],
  arms: Map<string, Map<number, Arm>>,
  groupIds: number[],
): Map<number, Map<string, Withheld>> {
  const out = new Map<number, Map<string, Withheld>>();
  if (frame === null) return out;
  for (const g of groupIds) {
    const counts = keys.map((k) => arms.get(k)!.get(g)?.cases ?? 0);
    const total = counts.reduce((a, b) => a + b, 0);
    const row = withheldCount(frame, total, threshold, siteId, q.outcomeId, g, q.window, q.period);
    const m = new Map<string, Withheld>();
    if (q.by === 'site') {
      keys.forEach((k, i) => {
        const w = withheldCount(frame, counts[i]!, threshold, Number(k), q.outcomeId, g, q.window, q.period);
        if (w || (row && counts[i]! > 0)) m.set(k, w ?? row!);
      });
    } else {
      const tableShown =
        row === null && siteId === null && isTwelveMonthWindow(q.window) && withheldIn(frame, null, q.outcomeId, g, `strata_${q.by}`, q.period) === null;
      // One label for a withheld table's every entry: each stratum's own would say which are small.
      if (!tableShown) keys.forEach((k) => m.set(k, 'strata'));
    }
    out.set(g, m);
  }
  return out;
}
