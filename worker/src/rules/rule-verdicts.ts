import type { Completeness, PeriodBook } from '@ratewarden/shared/periods';
import type { WithheldCount } from '../disclosure/disclosure-frame';
import { frameIndex, frameKey } from '../disclosure/store-frame';
import { ruleSiteKey } from '../runs/compute-scopes';
import type { ResultRow } from '../runs/compute-results';
import type { SirResultRow } from '../runs/compute-sir';
import { evaluateRule, type RuleToEvaluate, type RuleVerdict } from './evaluate-rules';

/** A verdict with the completeness of its period in its scope (notices state it). */
export interface ScopedVerdict extends RuleVerdict {
  completeness: Completeness;
}

/** The outcome × sites that site-level rules watch: the run keeps those sites' rows for them (ruleSiteKey). */
export function ruleSites(rules: readonly RuleToEvaluate[]): Set<string> {
  return new Set(rules.flatMap((r) => (r.siteIds ?? []).map((s) => ruleSiteKey(r.outcomeId, s))));
}

export interface VerdictOptions {
  frame: WithheldCount[];
  periods: PeriodBook;
  /** RULES_ON_PARTIAL_PERIODS: let rules look at partial periods too. */
  rulesOnPartialPeriods: boolean;
  /** SMALL_CELL_THRESHOLD: no rule selects on fewer cases. */
  threshold: number;
  /** The run's SIR rows (none without reference rates), for rules on the SIR. */
  sir?: readonly SirResultRow[];
  /** Hours per unit of the run's person-time (2,000 or 200,000), to state a SIR's person-time in the run's units. */
  hoursPerUnit?: number;
}

/**
 * Every active rule evaluated on a run's rows (the company's and the sites' site rules watch),
 * each row read only when
 * - its period is complete in its scope (shared/src/periods.ts), unless partial periods are let
 *   in: a roster in before its case list is a month of person-time without its cases;
 * - its count, and its reference group's, are shown to everyone who reads flags of that scope
 *   (the run's disclosure frame, per site for a site's rows): a flag raised on a withheld count,
 *   or on a comparison with one, would tell them which side of the threshold it lies.
 */
export function ruleVerdicts(rules: readonly RuleToEvaluate[], rows: readonly ResultRow[], o: VerdictOptions): ScopedVerdict[] {
  const withheld = frameIndex(o.frame);
  const shown = (groupId: number | null, r: ResultRow) =>
    groupId === null || !withheld.has(frameKey(r.site_id, r.outcome_id, groupId, r.window_kind, r.period));
  const scopeOf = (siteId: number | null) => (siteId === null ? null : [siteId]);
  const complete = (r: ResultRow) => o.rulesOnPartialPeriods || o.periods.windowComplete(r.window_kind, r.period, scopeOf(r.site_id));
  const usable = rows.filter((r) => complete(r) && shown(r.exposure_group_id, r) && (r.is_reference || shown(r.reference_group_id, r)));
  const sirRows = sirCarriers(usable, o.sir ?? [], o.hoursPerUnit ?? 2000);
  return rules.flatMap((rule) =>
    evaluateRule(
      rule.measure === 'sir'
        ? { ...rule, consecutivePeriods: 1, minCases: Math.max(rule.minCases, o.threshold) }
        : { ...rule, minCases: Math.max(rule.minCases, o.threshold) },
      rule.measure === 'sir' ? sirRows : usable,
    ).map((v) => ({
      ...v,
      completeness: o.periods.completeness(rule.windowKind, v.period, scopeOf(v.siteId)),
    })),
  );
}

/**
 * The rows a SIR rule reads: the SIR covers all the person-time the reference rates do, not one
 * window, so it rides on each group's latest usable row of each window and scope (complete, its
 * counts shown), carrying the SIR's observed count, expected count and person-time instead of the
 * window's. A SIR whose observed count is withheld from readers of flags (small, or a complement)
 * is left out, as a withheld count is for every rule.
 */
function sirCarriers(usable: readonly ResultRow[], sir: readonly SirResultRow[], hoursPerUnit: number): ResultRow[] {
  if (sir.length === 0) return [];
  const key = (site: number | null, outcome: number, group: number) => `${site ?? 'all'}:${outcome}:${group}`;
  const bySir = new Map(sir.filter((s) => s.withheld === null).map((s) => [key(s.siteId, s.outcomeId, s.groupId), s]));
  const latest = new Map<string, ResultRow>();
  for (const r of usable) {
    const k = `${key(r.site_id, r.outcome_id, r.exposure_group_id)}:${r.window_kind}`;
    const seen = latest.get(k);
    if (bySir.has(key(r.site_id, r.outcome_id, r.exposure_group_id)) && (!seen || r.periodIndex > seen.periodIndex)) latest.set(k, r);
  }
  return [...latest.values()].map((r) => {
    const s = bySir.get(key(r.site_id, r.outcome_id, r.exposure_group_id))!;
    return {
      ...r,
      cases: s.observed,
      person_time: s.cents / 100 / hoursPerUnit,
      sir: { estimate: s.sir, lower: s.exactLower, upper: s.exactUpper, p: s.p, expected: s.expected },
    };
  });
}
