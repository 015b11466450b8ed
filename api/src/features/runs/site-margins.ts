import type { DataSource } from 'typeorm';
import { marginSuppression, type Withheld } from '@ratewarden/shared/small-cells';
import type { RunResultsQuery } from '@ratewarden/shared/runs';

/** Key of one result cell in one scope: site id (or "all" for the company), outcome, group, window, period. */
export const cellKey = (siteId: number | null, outcomeId: number, groupId: number, window: string, period: string) =>
  `${siteId ?? 'all'}|${outcomeId}|${groupId}|${window}|${period}`;

type MarginFilter = Pick<RunResultsQuery, 'outcomeId' | 'window' | 'from' | 'to'>;

/**
 * Complementary suppression across the site margin of one run: the sites' counts of a cell add up
 * to the company's count (a case belongs to one site), so a reader of both could get a withheld
 * site count back by subtraction. For each outcome × group × window × period, the sites' counts
 * go through marginSuppression; the answer maps every cell withheld as a complement (a site's
 * count, or the company's when no site count was left to withhold) to 'complement'. Small counts
 * themselves are left to the caller. Every exposure group is read, since a row's comparison also
 * depends on its reference group's row.
 */
export async function siteMarginWithheld(ds: DataSource, runId: string, q: MarginFilter, threshold: number): Promise<Map<string, Withheld>> {
  const rows: Array<{ site_id: number; outcome_id: number; exposure_group_id: number; window_kind: string; period: string; cases: number }> = await ds.query(
    `SELECT site_id, outcome_id, exposure_group_id, window_kind, to_char(period, 'YYYY-MM-DD') AS period, cases
     FROM run_results
     WHERE run_id = $1 AND site_id IS NOT NULL AND ($2::int IS NULL OR outcome_id = $2) AND ($3::text IS NULL OR window_kind = $3)
       AND ($4::date IS NULL OR period >= $4) AND ($5::date IS NULL OR period <= $5)
     ORDER BY outcome_id, exposure_group_id, window_kind, period, site_id`,
    [runId, q.outcomeId ?? null, q.window ?? null, q.from ?? null, q.to ?? null],
  );
  const withheld = new Map<string, Withheld>();
  const flush = (group: typeof rows) => {
    if (group.length === 0) return;
    const r = marginSuppression(group.map((g) => g.cases), threshold);
    group.forEach((g, i) => {
      if (r.parts[i] === 'complement') withheld.set(cellKey(g.site_id, g.outcome_id, g.exposure_group_id, g.window_kind, g.period), 'complement');
    });
    const g = group[0]!;
    if (r.total) withheld.set(cellKey(null, g.outcome_id, g.exposure_group_id, g.window_kind, g.period), 'complement');
  };
  let margin: typeof rows = [];
  for (const r of rows) {
    const head = margin[0];
    if (head && (head.outcome_id !== r.outcome_id || head.exposure_group_id !== r.exposure_group_id || head.window_kind !== r.window_kind || head.period !== r.period)) {
      flush(margin);
      margin = [];
    }
    margin.push(r);
  }
  flush(margin);
  return withheld;
}
