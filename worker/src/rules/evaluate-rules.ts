import { benjaminiHochberg } from '@ratewarden/shared/stats';
import type { WatchRuleRow } from '@ratewarden/db/entities/watch-rule';
import type { ResultRow } from '../runs/compute-results';

/** The part of a watch rule that evaluation needs. */
export type RuleToEvaluate = Pick<
  WatchRuleRow,
  'id' | 'outcomeId' | 'exposureGroupId' | 'measure' | 'thresholdOn' | 'threshold' | 'minCases' | 'minExpected' | 'windowKind' | 'consecutivePeriods' | 'fdrControl' | 'fdrLevel'
>;

/** What a rule says about one exposure group at the latest period of a run. */
export interface RuleVerdict {
  ruleId: string;
  outcomeId: number;
  exposureGroupId: number;
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
  /** Benjamini–Hochberg adjusted p across the groups the rule covers (null when off or undefined). */
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
 * group passes when its measure is past the threshold, it has at least `minCases` cases and
 * `minExpected` expected cases, and (with false-discovery control) its Benjamini–Hochberg
 * adjusted p across the covered groups of that period is at most `fdrLevel`. A group crosses
 * the rule when it passes in every one of those periods.
 */
export function evaluateRule(rule: RuleToEvaluate, results: ResultRow[]): RuleVerdict[] {
  const rows = results.filter((r) => r.outcome_id === rule.outcomeId && r.window_kind === rule.windowKind && !r.is_reference);
  if (rows.length === 0) return [];
  const latest = Math.max(...rows.map((r) => r.periodIndex));
  const groupIds = rule.exposureGroupId === null ? [...new Set(rows.map((r) => r.exposure_group_id))].sort((a, b) => a - b) : [rule.exposureGroupId];
  const byKey = new Map(rows.map((r) => [`${r.exposure_group_id}:${r.periodIndex}`, r]));
  const useFdr = rule.fdrControl && rule.measure !== 'uchart';

  const passes = new Map<number, boolean>(groupIds.map((g) => [g, true]));
  const latestVerdict = new Map<number, RuleVerdict>();
  for (let period = latest - rule.consecutivePeriods + 1; period <= latest; period++) {
    const measured = groupIds.map((g) => {
      const r = byKey.get(`${g}:${period}`);
      return { g, r, m: r ? measure(rule, r) : null };
    });
    const qs = useFdr ? benjaminiHochberg(measured.map((x) => x.m?.p ?? null)) : measured.map(() => null);
    measured.forEach(({ g, r, m }, i) => {
      const q = qs[i] ?? null;
      const ok =
        r !== undefined &&
        m !== null &&
        m.passesThreshold &&
        r.cases >= rule.minCases &&
        (rule.minExpected === 0 || (m.expected !== null && m.expected >= rule.minExpected)) &&
        (!useFdr || (q !== null && q <= rule.fdrLevel));
      if (!ok) passes.set(g, false);
      if (period === latest && r && m) {
        latestVerdict.set(g, {
          ruleId: rule.id,
          outcomeId: rule.outcomeId,
          exposureGroupId: g,
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
  return [...latestVerdict.values()].map((v) => ({ ...v, crossing: passes.get(v.exposureGroupId) === true && v.value !== null }));
}
