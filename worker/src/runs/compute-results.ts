import {
  compareRates,
  personTimeOfHours,
  incidenceRate,
  mantelHaenszelRates,
  uChart,
  type RateGroup,
  type RateStratum,
  type MantelHaenszelRatesResult,
  type UChartPoint,
} from '@ratewarden/shared/stats';
import type { RunSettings } from '@ratewarden/shared/runs';
import { offeredWindows, windowContextOf, windowStartIndex } from '@ratewarden/shared/windows';
import { addTally, buildSeries, emptyTally, windowTally, type OutcomeSeries, type Tally } from './cell-series';
import type { Cell } from './cells-query';
import { monthIso } from '@ratewarden/shared/months';
import type { ResultAdjustment, StoredResult } from '@ratewarden/db/run-results';

export interface OutcomeInfo {
  id: number;
  /** The outcome's own reference group, else null (then the global one is used). */
  referenceGroupId: number | null;
}

export interface GroupInfo {
  id: number;
  exposureLevel: number | null;
  isReference: boolean;
}

/**
 * One result as the run computes it: the stored row (db/src/run-results.ts) without the run id,
 * which the writer puts first, and with what rule evaluation needs beside it (not stored).
 */
export interface ResultRow extends Omit<StoredResult, 'run_id'> {
  /** Month index of the period, kept for rule evaluation (not stored). */
  periodIndex: number;
  /** Only on the rows a SIR watch rule reads (rule-verdicts.ts): the group's SIR in this scope. */
  sir?: { estimate: number | null; lower: number | null; upper: number | null; p: number | null; expected: number };
}

export interface ComputedResults {
  results: ResultRow[];
  /** Outcomes for which no reference group exists (comparisons left empty). */
  outcomesWithoutReference: number[];
}

/** Adds one month's tally of a group into its running total. */
function addMonth(running: Map<number, Tally>, groupId: number, month: Tally | undefined): void {
  if (!month) return;
  let t = running.get(groupId);
  if (!t) running.set(groupId, (t = emptyTally()));
  addTally(t, month);
}

/** Turns hundredths of hours into the run's person-time unit. */
export function personTimeOf(cents: number, settings: RunSettings): number {
  const hours = cents / 100;
  return personTimeOfHours(hours, settings.personTimeBasis);
}

function strata(exposed: Tally, reference: Tally, pick: (t: Tally) => Map<string, { cases: number; cents: number }>, settings: RunSettings): RateStratum[] {
  const keys = new Set([...pick(exposed).keys(), ...pick(reference).keys()]);
  const group = (t: { cases: number; cents: number } | undefined): RateGroup => ({ cases: t?.cases ?? 0, personTime: personTimeOf(t?.cents ?? 0, settings) });
  return [...keys].sort().map((k) => ({ exposed: group(pick(exposed).get(k)), reference: group(pick(reference).get(k)) }));
}

function mh(s: RateStratum[], settings: RunSettings): MantelHaenszelRatesResult | null {
  return s.length === 0 ? null : mantelHaenszelRates(s, { confidence: settings.confidence, per: settings.per });
}

type Adjustment = ResultAdjustment;
type MhColumns<K extends Adjustment> = Pick<
  ResultRow,
  `mh_${K}_irr` | `mh_${K}_irr_lower` | `mh_${K}_irr_upper` | `mh_${K}_irr_p` | `mh_${K}_ird` | `mh_${K}_ird_lower` | `mh_${K}_ird_upper`
>;

/** The stored columns of one Mantel–Haenszel adjustment (null when there is none). */
function mhColumns<K extends Adjustment>(by: K, m: MantelHaenszelRatesResult | null): MhColumns<K> {
  return {
    [`mh_${by}_irr`]: m?.mhIrr.estimate ?? null,
    [`mh_${by}_irr_lower`]: m?.mhIrr.lower ?? null,
    [`mh_${by}_irr_upper`]: m?.mhIrr.upper ?? null,
    [`mh_${by}_irr_p`]: m?.mhIrr.p ?? null,
    [`mh_${by}_ird`]: m?.mhIrd.estimate ?? null,
    [`mh_${by}_ird_lower`]: m?.mhIrd.lower ?? null,
    [`mh_${by}_ird_upper`]: m?.mhIrd.upper ?? null,
  } as MhColumns<K>;
}

/** What the detail keeps of one adjustment: its homogeneity test and the strata it used. */
function mhDetail(by: 'Age' | 'Site' | 'Sex', m: MantelHaenszelRatesResult | null): Record<string, unknown> {
  return m ? { [`mh${by}Homogeneity`]: m.homogeneity, [`mh${by}StrataUsed`]: m.strataUsed } : {};
}

function uChartPoints(series: OutcomeSeries, groupId: number, settings: RunSettings): { centre: number | null; points: Map<number, UChartPoint> } {
  const months = series.groups.get(groupId);
  const indices: number[] = [];
  for (let m = series.firstMonth; m <= series.lastMonth; m++) indices.push(m);
  const chart = uChart(indices.map((m) => ({ count: months?.get(m)?.cases ?? 0, exposure: personTimeOf(months?.get(m)?.cents ?? 0, settings) })));
  const points = new Map<number, UChartPoint>();
  indices.forEach((m, i) => points.set(m, chart.points[i]!));
  return { centre: chart.centre, points };
}

/**
 * Every result of a run from its cells: for each outcome, exposure group, window the settings
 * offer (shared/src/windows.ts: a row wherever a window of that kind ends) and month, the
 * rate with exact limits, and against the reference group the IRR (exact conditional, mid-p,
 * Wald) and IRD with their tests, Mantel–Haenszel IRR and IRD by age band, by site and by sex,
 * the u-chart limits of single months. (The trend test across exposure levels is the web's, on
 * the results each reader may see.) All statistics
 * come from the shared core.
 *
 * `siteId` names the scope the cells belong to: null for the whole company, else one site (the
 * caller passes that site's cells only). A site's rows serve people who may see that site only:
 * they carry everything the company rows do except the adjustment by site (a single site is one
 * stratum, nothing to adjust).
 */
export function computeResults(
  cells: Cell[],
  outcomes: OutcomeInfo[],
  groups: GroupInfo[],
  settings: RunSettings,
  siteId: number | null = null,
): ComputedResults {
  const series = buildSeries(cells);
  const globalReference = groups.find((g) => g.isReference)?.id ?? null;
  const opts = { confidence: settings.confidence, per: settings.per };
  const ctx = windowContextOf(settings);
  const results: ResultRow[] = [];
  const outcomesWithoutReference: number[] = [];

  for (const outcome of outcomes) {
    const s = series.get(outcome.id);
    if (!s) continue;
    const referenceId = outcome.referenceGroupId ?? globalReference;
    if (referenceId === null) outcomesWithoutReference.push(outcome.id);
    const groupIds = [...s.groups.keys()].sort((a, b) => a - b);
    const charts = new Map(groupIds.map((g) => [g, uChartPoints(s, g, settings)]));

    for (const kind of offeredWindows(settings)) {
      // The whole period grows a month at a time: its tallies are kept running, not summed again.
      const running = new Map<number, Tally>();
      for (let p = s.firstMonth; p <= s.lastMonth; p++) {
        const start = windowStartIndex(kind, p, ctx);
        if (start === null) continue;
        if (kind === 'whole') for (const g of groupIds) addMonth(running, g, s.groups.get(g)?.get(p));
        const tallyOf = (g: number) => (kind === 'whole' ? (running.get(g) ?? emptyTally()) : windowTally(s.groups.get(g), start, p));
        const period = monthIso(p);
        const ref = referenceId === null ? null : tallyOf(referenceId);
        const refGroup: RateGroup | null = ref ? { cases: ref.cases, personTime: personTimeOf(ref.cents, settings) } : null;

        for (const g of groupIds) {
          const t = tallyOf(g);
          if (t.cents === 0 && t.cases === 0) continue;
          const exposed: RateGroup = { cases: t.cases, personTime: personTimeOf(t.cents, settings) };
          const isReference = g === referenceId;
          const compared = ref !== null && !isReference;
          const mhBy = {
            age: compared
              ? mh(
                  strata(t, ref, (x) => x.byAge, settings),
                  settings,
                )
              : null,
            // A site's own rows are one stratum: nothing to adjust by site.
            site:
              compared && siteId === null
                ? mh(
                    strata(t, ref, (x) => x.bySite, settings),
                    settings,
                  )
                : null,
            sex: compared
              ? mh(
                  strata(t, ref, (x) => x.bySex, settings),
                  settings,
                )
              : null,
          };
          // The crude comparison once; the three adjustments add only their Mantel–Haenszel parts.
          const compare = compared ? compareRates(exposed, refGroup!, opts) : null;
          const rate = compare ? compare.rateExposed : incidenceRate(exposed, opts);
          const point = kind === 'month' ? (charts.get(g)!.points.get(p) ?? null) : null;
          const expected = refGroup && refGroup.personTime > 0 && !isReference ? (refGroup.cases * exposed.personTime) / refGroup.personTime : null;
          results.push({
            site_id: siteId,
            outcome_id: outcome.id,
            exposure_group_id: g,
            window_kind: kind,
            period,
            periodIndex: p,
            months_covered: t.months,
            is_reference: isReference,
            reference_group_id: referenceId,
            cases: t.cases,
            hours: (t.cents / 100).toFixed(2),
            person_time: exposed.personTime,
            rate: rate.estimate,
            rate_lower: rate.exact.lower,
            rate_upper: rate.exact.upper,
            expected,
            irr: compare?.irr.estimate ?? null,
            irr_lower: compare?.irr.exact.lower ?? null,
            irr_upper: compare?.irr.exact.upper ?? null,
            irr_p: compare?.irr.pExact ?? null,
            irr_wald_lower: compare?.irr.wald.lower ?? null,
            irr_wald_upper: compare?.irr.wald.upper ?? null,
            ird: compare?.ird.estimate ?? null,
            ird_lower: compare?.ird.wald.lower ?? null,
            ird_upper: compare?.ird.wald.upper ?? null,
            ird_p: compare?.ird.p ?? null,
            ...mhColumns('age', mhBy.age),
            ...mhColumns('site', mhBy.site),
            ...mhColumns('sex', mhBy.sex),
            u_centre: point ? charts.get(g)!.centre : null,
            u_lcl: point?.lcl ?? null,
            u_ucl: point?.ucl ?? null,
            u_signal: point?.signal ?? null,
            detail: {
              rateMidP: rate.midP,
              ...(compare && {
                irrMidP: compare.irr.midP,
                irrPMidP: compare.irr.pMidP,
                irrPWald: compare.irr.pWald,
                irrPScore: compare.irr.pScore,
                excessCases: compare.excessCases,
                afExposed: compare.afExposed.estimate,
              }),
              ...mhDetail('Age', mhBy.age),
              ...mhDetail('Site', mhBy.site),
              ...mhDetail('Sex', mhBy.sex),
              ...(point && { uExactLcl: point.exactLcl, uExactUcl: point.exactUcl, u: point.u }),
              reasons: compare ? compare.reasons : rate.reasons,
            },
          });
        }
      }
    }
  }
  return { results, outcomesWithoutReference };
}
