import { benjaminiHochberg } from '@ratewarden/shared/stats';
import type { WatchRuleRow } from '@ratewarden/db/entities/watch-rule';
import type { ResultRow } from '../runs/compute-results';

/** The part of a watch rule that evaluation needs. */
export type RuleToEvaluate = Pick<
  WatchRuleRow,
  | 'id'
  | 'outcomeId'
  | 'exposureGroupId'
  | 'siteIds'
  | 'measure'
  | 'thresholdOn'
  | 'threshold'
  | 'minCases'
  | 'minExpected'
  | 'windowKind'
  | 'consecutivePeriods'
  | 'fdrControl'
  | 'fdrLevel'
>;

/** What a rule says about one exposure group in one scope (the company, or one site) at the latest period of a run. */
export interface RuleVerdict {
  ruleId: string;
  outcomeId: number;
  exposureGroupId: number;
  /** null: the company's results; else that site's own. */
  siteId: number | null;
  crossing: boolean;
  period: string;
  /** The value compared with the rule (estimate or lower bound; u ÷ UCL for u-charts); null when undefined. */
  value: number | null;
  estimate: number | null;
  lower: number | null;
  upper: number | null;
  cases: number;
  expected: number | null;
  personTime: number;
  p: number | null;
  /** Benjamini–Hochberg adjusted p across the rule's family: its groups × its sites (null when off or undefined). */
  q: number | null;
}

interface Measured {
  value: number | null;
  estimate: number | null;
  lower: number | null;
  upper: number | null;
  p: number | null;
  expected: number | null;
  passesThreshold: boolean;
}

/** The rule's measure for one result row. */
export function measure(rule: RuleToEvaluate, r: ResultRow): Measured {
  const pick = (estimate: number | null, lower: number | null, upper: number | null, p: number | null): Measured => {
    const value = rule.thresholdOn === 'estimate' ? estimate : lower;
    return { value, estimate, lower, upper, p, expected: r.expected, passesThreshold: value !== null && rule.threshold !== null && value > rule.threshold };
  };
  switch (rule.measure) {
    case 'irr':
      return pick(r.irr, r.irr_lower, r.irr_upper, r.irr_p);
    case 'ird':
      return pick(r.ird, r.ird_lower, r.ird_upper, r.ird_p);
    case 'rate':
      // The test of a group's rate is its comparison with the reference rate.
      return pick(r.rate, r.rate_lower, r.rate_upper, r.irr_p);
    case 'sir': {
      const s = r.sir;
      const m = pick(s?.estimate ?? null, s?.lower ?? null, s?.upper ?? null, s?.p ?? null);
      return { ...m, passesThreshold: s !== undefined && m.passesThreshold, expected: s?.expected ?? null };
    }
    case 'uchart': {
      const u = r.person_time > 0 ? r.cases / r.person_time : null;
      const value = u !== null && r.u_ucl !== null && r.u_ucl > 0 ? u / r.u_ucl : null;
      const expected = r.u_centre !== null ? r.u_centre * r.person_time : null;
      return { value, estimate: u, lower: r.u_lcl, upper: r.u_ucl, p: null, expected, passesThreshold: r.u_signal === 'above' };
    }
  }
}

/**
 * Evaluates one rule on a run's results: at each of the last `consecutivePeriods` periods, a
 * group in a scope passes when its measure is past the threshold, it has at least `minCases`
 * cases and `minExpected` expected cases, and (with false-discovery control) its
 * Benjamini–Hochberg adjusted p is at most `fdrLevel`. A group crosses the rule in a scope when
 * it passes in every one of those periods.
 *
 * Scopes: a company-wide rule (`siteIds` null) reads the company's rows; a site rule reads each
 * chosen site's own rows. The family of the false-discovery control is one per period: every
 * covered group × every scope of the rule with a row in that period. The latest period is the
 * latest any of the rule's scopes has among `results` (the caller leaves out partial periods).
 */
export function evaluateRule(rule: RuleToEvaluate, results: ResultRow[]): RuleVerdict[] {
  const inScope = (siteId: number | null) => (rule.siteIds === null ? siteId === null : siteId !== null && rule.siteIds.includes(siteId));
  const rows = results.filter((r) => r.outcome_id === rule.outcomeId && r.window_kind === rule.windowKind && !r.is_reference && inScope(r.site_id));
  if (rows.length === 0) return [];
  const latest = Math.max(...rows.map((r) => r.periodIndex));
  const groupIds = rule.exposureGroupId === null ? [...new Set(rows.map((r) => r.exposure_group_id))].sort((a, b) => a - b) : [rule.exposureGroupId];
  const scopes: Array<number | null> = rule.siteIds === null ? [null] : [...rule.siteIds].sort((a, b) => a - b);
  const units = scopes.flatMap((siteId) => groupIds.map((g) => ({ siteId, g, key: `${siteId ?? 'all'}:${g}` })));
  const byKey = new Map(rows.map((r) => [`${r.site_id ?? 'all'}:${r.exposure_group_id}:${r.periodIndex}`, r]));
  const useFdr = rule.fdrControl && rule.measure !== 'uchart';

  const passes = new Map<string, boolean>(units.map((u) => [u.key, true]));
  const latestVerdict = new Map<string, RuleVerdict>();
  for (let period = latest - rule.consecutivePeriods + 1; period <= latest; period++) {
    const measured = units.map((u) => {
      const r = byKey.get(`${u.key}:${period}`);
      return { ...u, r, m: r ? measure(rule, r) : null };
    });
    // One family: the units without a row this period have no p and do not count in it.
    const qs = useFdr ? benjaminiHochberg(measured.map((x) => x.m?.p ?? null)) : measured.map(() => null);
    measured.forEach(({ siteId, g, key, r, m }, i) => {
      const q = qs[i] ?? null;
      const ok =
        r !== undefined &&
        m !== null &&
        m.passesThreshold &&
        r.cases >= rule.minCases &&
        (rule.minExpected === 0 || (m.expected !== null && m.expected >= rule.minExpected)) &&
        (!useFdr || (q !== null && q <= rule.fdrLevel));
      if (!ok) passes.set(key, false);
      if (period === latest && r && m) {
        latestVerdict.set(key, {
          ruleId: rule.id,
          outcomeId: rule.outcomeId,
          exposureGroupId: g,
          siteId,
          crossing: false,
          period: r.period,
          value: m.value,
          estimate: m.estimate,
          lower: m.lower,
          upper: m.upper,
          cases: r.cases,
          expected: m.expected,
          personTime: r.person_time,
          p: m.p,
          q,
        });
      }
    });
  }
  return [...latestVerdict.entries()].map(([key, v]) => ({ ...v, crossing: passes.get(key) === true && v.value !== null }));
}
