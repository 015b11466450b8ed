import { standardizedIncidenceRatio } from '@ratewarden/shared/stats';
import { isSmallCount } from '@ratewarden/shared/small-cells';
import type { WithheldCount } from '../disclosure/disclosure-frame';
import type { Cell } from './cells-query';
import type { SirCell } from './sir-query';

/** One stored SIR row (run_sir). */
export interface SirResultRow {
  outcomeId: number;
  groupId: number;
  siteId: number | null;
  observed: number;
  expected: number;
  cents: number;
  uncoveredCents: number;
  sir: number | null;
  exactLower: number | null;
  exactUpper: number | null;
  byarLower: number | null;
  byarUpper: number | null;
  /** Exact two-sided p of SIR = 1 (for a watch rule's false-discovery control; not stored). */
  p: number | null;
  withheld: 'small' | 'complement' | null;
}

/** What the disclosure decision needs besides the SIR cells. */
export interface SirDisclosure {
  /** Every case count the run publishes per outcome × group × scope sums to this (sirScopeKey). */
  totals: ReadonlyMap<string, number>;
  /** Outcome × group pairs (`${outcome}:${group}`) of which the run's disclosure frame withholds any count. */
  framed: ReadonlySet<string>;
}

export const sirScopeKey = (siteId: number | null, outcomeId: number, groupId: number) => `${siteId ?? 'all'}:${outcomeId}:${groupId}`;

/**
 * The SIR of every outcome × exposure group, company-wide and per site, from the SIR cells.
 * Disclosure for readers other than the physician, decided here once and for every scope of an
 * outcome × group together (so that no scope can be had from the others by subtraction): its SIR
 * rows are shown only when
 * - no observed count is small (1 to threshold − 1), in any scope;
 * - no uncovered count is small: the group's published cases minus its SIR observed count are the
 *   cases in person-time without a reference rate (unknown birth year, sex X, years or bands the
 *   table lacks), a count of its own;
 * - the run's disclosure frame withholds none of the group's counts along time (months, rolling
 *   windows, the u-chart series): the SIR's observed count is a total over all the covered months,
 *   which the frame's windows do not publish, and beside them it could give withheld months back by
 *   difference. (The frame's stratum-table entries split a window's count by age or sex; the SIR
 *   publishes no such split, so they do not withhold it.)
 * Otherwise every scope is withheld: 'small' where its own observed count is small, else
 * 'complement'. The physician sees everything.
 */
export function computeSir(cells: SirCell[], confidence: number, threshold: number, disclosure: SirDisclosure): SirResultRow[] {
  const byGroup = new Map<string, SirCell[]>();
  for (const c of cells) {
    const key = `${c.outcomeId}:${c.groupId}`;
    const list = byGroup.get(key);
    if (list) list.push(c);
    else byGroup.set(key, [c]);
  }
  const out: SirResultRow[] = [];
  for (const sites of byGroup.values()) {
    const first = sites[0]!;
    const company = sites.reduce(
      (t, c) => ({
        observed: t.observed + c.observed,
        expected: t.expected + c.expected,
        cents: t.cents + c.cents,
        uncoveredCents: t.uncoveredCents + c.uncoveredCents,
      }),
      { observed: 0, expected: 0, cents: 0, uncoveredCents: 0 },
    );
    const scopes: Array<{ siteId: number | null; t: typeof company }> = [
      { siteId: null, t: company },
      ...sites.map((s) => ({ siteId: s.siteId as number | null, t: s })),
    ];
    const uncovered = (siteId: number | null, observed: number) => (disclosure.totals.get(sirScopeKey(siteId, first.outcomeId, first.groupId)) ?? 0) - observed;
    const protect =
      disclosure.framed.has(`${first.outcomeId}:${first.groupId}`) ||
      scopes.some(({ siteId, t }) => isSmallCount(t.observed, threshold) || isSmallCount(uncovered(siteId, t.observed), threshold));
    for (const { siteId, t } of scopes) {
      const withheld = !protect ? null : isSmallCount(t.observed, threshold) ? 'small' : 'complement';
      out.push(row(first.outcomeId, first.groupId, siteId, t, confidence, withheld));
    }
  }
  return out;
}

function row(
  outcomeId: number,
  groupId: number,
  siteId: number | null,
  t: { observed: number; expected: number; cents: number; uncoveredCents: number },
  confidence: number,
  withheld: 'small' | 'complement' | null,
): SirResultRow {
  const r = standardizedIncidenceRatio(t.observed, t.expected, confidence);
  return {
    outcomeId,
    groupId,
    siteId,
    observed: t.observed,
    expected: t.expected,
    cents: t.cents,
    uncoveredCents: t.uncoveredCents,
    sir: r.sir,
    exactLower: r.exact.lower,
    exactUpper: r.exact.upper,
    byarLower: r.byar.lower,
    byarUpper: r.byar.upper,
    p: r.pExact,
    withheld,
  };
}

/** The published case totals per scope (the cells summed: the company and each site) and the pairs the frame touches. */
export function sirDisclosure(cells: readonly Cell[], frame: readonly WithheldCount[]): SirDisclosure {
  const totals = new Map<string, number>();
  const add = (k: string, n: number) => totals.set(k, (totals.get(k) ?? 0) + n);
  for (const c of cells) {
    add(sirScopeKey(null, c.outcomeId, c.groupId), c.cases);
    add(sirScopeKey(c.siteId, c.outcomeId, c.groupId), c.cases);
  }
  const alongTime = frame.filter((w) => w.window !== 'strata_age' && w.window !== 'strata_sex');
  return { totals, framed: new Set(alongTime.map((w) => `${w.outcomeId}:${w.exposureGroupId}`)) };
}
