import type { QueryRunner } from 'typeorm';
import type { CaseStatus } from '@ratewarden/shared/intake';
import { HOURS_PER_PERSON_YEAR } from '@ratewarden/shared/reference-rates';
import { SIDES_CTES } from './cells-query';

/**
 * Observed and expected cases for the standardized incidence ratio, per outcome × site × exposure
 * group, from the run's own hours and cases (`both_sides` in cells-query.ts: same roster, cases,
 * lag and counting rule) read by the reference table's strata, not the analysis age bands: sex × age band
 * (age = calendar year − birth year, both band edges included) × calendar year of the month.
 * Expected E = Σ hours / 2,000 × rate (rates are per person-year; indirect standardization,
 * Breslow & Day 1987 Vol. II). Only person-time a reference rate covers enters E, and only cases
 * in that person-time enter O; the rest (unknown birth year, sex X, a year or band the table does
 * not hold) is reported as uncovered hours. Outcomes without reference rates are left out.
 */
export const SIR_SQL = `
  WITH ${SIDES_CTES},
  ref AS (SELECT outcome_id, sex, age_from, age_to, year, rate FROM reference_rates WHERE table_id = $2),
  matched AS (
    SELECT f.outcome_id, f.site_id, f.exposure_group_id, f.hours, f.n AS cases, r.rate
    FROM both_sides f
    LEFT JOIN ref r ON r.outcome_id = f.outcome_id AND r.sex = f.sex AND r.year = extract(year FROM f.month)::int
      AND extract(year FROM f.month)::int - f.birth_year BETWEEN r.age_from AND r.age_to
    WHERE f.outcome_id IN (SELECT DISTINCT outcome_id FROM ref)
  )
  SELECT outcome_id, site_id, exposure_group_id,
         coalesce(sum(hours) FILTER (WHERE rate IS NOT NULL), 0)::text AS hours,
         coalesce(sum(hours) FILTER (WHERE rate IS NULL), 0)::text AS hours_uncovered,
         coalesce(sum(cases) FILTER (WHERE rate IS NOT NULL), 0)::int AS observed,
         coalesce(sum(hours::float8 * rate) FILTER (WHERE rate IS NOT NULL), 0) / ${HOURS_PER_PERSON_YEAR} AS expected
  FROM matched
  GROUP BY outcome_id, site_id, exposure_group_id
  HAVING sum(hours) > 0 OR sum(cases) > 0
  ORDER BY outcome_id, site_id, exposure_group_id`;

export interface SirCell {
  outcomeId: number;
  siteId: number;
  groupId: number;
  /** Covered and uncovered hours in hundredths, exact integers. */
  cents: number;
  uncoveredCents: number;
  observed: number;
  expected: number;
}

/** The applied reference-rate table, or null when none was uploaded. */
export async function loadReferenceTableId(q: QueryRunner): Promise<number | null> {
  const rows: Array<{ id: number }> = await q.query(`SELECT id FROM reference_rate_tables WHERE state = 'applied'`);
  return rows[0]?.id ?? null;
}

/** Runs the SIR aggregation against one reference table (SIR_SQL). */
export async function loadSirCells(q: QueryRunner, countedStatuses: CaseStatus[], tableId: number): Promise<SirCell[]> {
  const rows: Array<{
    outcome_id: number;
    site_id: number;
    exposure_group_id: number;
    hours: string;
    hours_uncovered: string;
    observed: number;
    expected: number;
  }> = await q.query(SIR_SQL, [countedStatuses, tableId]);
  return rows.map((r) => ({
    outcomeId: r.outcome_id,
    siteId: r.site_id,
    groupId: r.exposure_group_id,
    cents: Math.round(Number(r.hours) * 100),
    uncoveredCents: Math.round(Number(r.hours_uncovered) * 100),
    observed: r.observed,
    expected: Number(r.expected),
  }));
}
