import { standardizedIncidenceRatio } from '@ratewarden/shared/stats';
import { isSmallCount, marginSuppression } from '@ratewarden/shared/small-cells';
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

/**
 * The SIR of every outcome × exposure group, company-wide and per site, from the SIR cells.
 * Disclosure for readers other than the physician, decided here once: the company's observed
 * count is the sum of the sites' (each case sits in one site's roster row), so the sites are the
 * parts of a published total and are suppressed as such (marginSuppression: small ones, then
 * complements; the total when no part is left), and a small total is withheld in its own right.
 */
export function computeSir(cells: SirCell[], confidence: number, threshold: number): SirResultRow[] {
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
      (t, c) => ({ observed: t.observed + c.observed, expected: t.expected + c.expected, cents: t.cents + c.cents, uncoveredCents: t.uncoveredCents + c.uncoveredCents }),
      { observed: 0, expected: 0, cents: 0, uncoveredCents: 0 },
    );
    const margin = marginSuppression(sites.map((s) => s.observed), threshold);
    const companyWithheld = isSmallCount(company.observed, threshold) ? 'small' : margin.total ? 'complement' : null;
    out.push(row(first.outcomeId, first.groupId, null, company, confidence, companyWithheld));
    sites.forEach((s, i) => out.push(row(s.outcomeId, s.groupId, s.siteId, s, confidence, margin.parts[i] as 'small' | 'complement' | null)));
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
