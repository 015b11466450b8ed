import type { DataSource, EntityManager } from 'typeorm';
import { periodStateOf, type SitePeriod } from '@ratewarden/shared/periods';
import { rows } from './sql';

interface PeriodRow {
  site_id: number;
  month: string;
  roster: boolean;
  cases: boolean;
  closed: boolean;
  corrected: boolean;
  closed_at: Date | null;
  closed_by: string | null;
  retired: boolean;
}

/**
 * Every site × month from the first rostered month to `through` (or the latest month received),
 * with what has been received and whether the hygienist closed it; the state itself is decided by
 * `periodStateOf` (shared/src/periods.ts). A case list reports its sites through `reports_through`.
 * A closed month is corrected when a roster or case list touching it was applied after it closed.
 * A month after the one a site was retired in is marked `retired` (the site is not expected then).
 */
export async function readSitePeriods(
  db: DataSource | EntityManager,
  opts: { through?: string | null; siteIds?: number[] | null } = {},
): Promise<SitePeriod[]> {
  const found = await rows<PeriodRow>(
    db,
    `
    WITH reported AS (
      SELECT s AS site_id, max(i.reports_through) AS through
      FROM intakes i CROSS JOIN LATERAL unnest(i.reports_site_ids) AS s
      WHERE i.kind = 'cases' AND i.state IN ('applied', 'superseded') GROUP BY s),
    bounds AS (
      SELECT least((SELECT min(month) FROM roster_slices), (SELECT min(through) FROM reported)) AS lo,
             greatest((SELECT max(month) FROM roster_slices), (SELECT max(through) FROM reported), $1::date) AS hi),
    months AS (SELECT generate_series(lo, hi, interval '1 month')::date AS month FROM bounds WHERE lo IS NOT NULL),
    closures AS (
      SELECT DISTINCT ON (site_id, month) site_id, month, action, at, person_id FROM period_closures ORDER BY site_id, month, id DESC)
    SELECT s.id AS site_id, to_char(m.month, 'YYYY-MM-DD') AS month,
           rs.intake_id IS NOT NULL AS roster,
           coalesce(r.through >= m.month, false) AS cases,
           coalesce(c.action = 'close', false) AS closed,
           c.action = 'close' AND (
             coalesce(ri.applied_at > c.at, false)
             OR EXISTS (SELECT 1 FROM intakes ci WHERE ci.kind = 'cases' AND ci.state IN ('applied', 'superseded') AND ci.applied_at > c.at
                          AND s.id = ANY(ci.site_ids) AND m.month BETWEEN ci.month_from AND ci.month_to)) AS corrected,
           CASE WHEN c.action = 'close' THEN c.at END AS closed_at,
           CASE WHEN c.action = 'close' THEN u.name END AS closed_by,
           coalesce(m.month > date_trunc('month', s.retired_at)::date, false) AS retired
    FROM sites s CROSS JOIN months m
    LEFT JOIN roster_slices rs ON rs.site_id = s.id AND rs.month = m.month
    LEFT JOIN intakes ri ON ri.id = rs.intake_id
    LEFT JOIN reported r ON r.site_id = s.id
    LEFT JOIN closures c ON c.site_id = s.id AND c.month = m.month
    LEFT JOIN users u ON u.id = c.person_id
    WHERE $2::integer[] IS NULL OR s.id = ANY($2::integer[])
    ORDER BY s.id, m.month`,
    [opts.through ?? null, opts.siteIds ?? null],
  );
  return found.map((r) => ({
    siteId: r.site_id,
    month: r.month,
    state: periodStateOf(r),
    roster: r.roster,
    correctedAfterClose: r.corrected === true,
    closedAt: r.closed_at ? r.closed_at.toISOString() : null,
    closedBy: r.closed_by,
    retired: r.retired,
  }));
}
