import type { QueryRunner } from 'typeorm';
import type { CaseStatus } from '@ratewarden/shared/intake';
import { HOURS_PER_PERSON_YEAR } from '@ratewarden/shared/reference-rates';
import { CELL_ROWS, cellOf, SIDES_CTES, type Cell } from './cells-query';

/**
 * Observed and expected cases for the standardized incidence ratio, per outcome × site × exposure
 * group, from the run's own hours and cases (`both_sides` in cells-query.ts: same roster, cases,
 * lag and counting rule) read by the reference table's strata, not the analysis age bands: sex × age band
 * (age = calendar year − birth year, both band edges included) × calendar year of the month.
 * Expected E = Σ hours / 2,000 × rate (rates are per person-year; indirect standardization,
 * Breslow & Day 1987 Vol. II). Only person-time a reference rate covers enters E, and only cases
 * in that person-time enter O; the rest (unknown birth year, sex X, a year or band the table does
 * not hold) is reported as uncovered hours. Outcomes without reference rates are left out. The
 * months are first summed by calendar year (`by_year`, a twelfth of the rows) before the join.
 */
const sirCtes = (tableParam: string) => `
  ref AS (SELECT outcome_id, sex, age_from, age_to, year, rate FROM reference_rates WHERE table_id = ${tableParam}),
  by_year AS (
    SELECT outcome_id, site_id, exposure_group_id, sex, extract(year FROM month)::int AS year, birth_year, sum(hours) AS hours, sum(n) AS cases
    FROM both_sides
    WHERE outcome_id IN (SELECT outcome_id FROM ref)
    GROUP BY 1, 2, 3, 4, 5, 6
  ),
  matched AS (
    SELECT f.outcome_id, f.site_id, f.exposure_group_id, f.hours, f.cases, r.rate
    FROM by_year f
    LEFT JOIN ref r ON r.outcome_id = f.outcome_id AND r.sex = f.sex AND r.year = f.year AND f.year - f.birth_year BETWEEN r.age_from AND r.age_to
  ),
  sir AS (
    SELECT outcome_id, site_id, exposure_group_id,
           coalesce(sum(hours) FILTER (WHERE rate IS NOT NULL), 0)::text AS hours,
           coalesce(sum(hours) FILTER (WHERE rate IS NULL), 0)::text AS hours_uncovered,
           coalesce(sum(cases) FILTER (WHERE rate IS NOT NULL), 0)::int AS observed,
           coalesce(sum(hours::float8 * rate) FILTER (WHERE rate IS NOT NULL), 0) / ${HOURS_PER_PERSON_YEAR} AS expected
    FROM matched
    GROUP BY outcome_id, site_id, exposure_group_id
    HAVING sum(hours) > 0 OR sum(cases) > 0
  )`;

/**
 * The run's cells (cells-query.ts CELL_ROWS) and the SIR's observed and expected counts in one
 * statement ($1 counted statuses, $2 age band edges, $3 the reference table): `both_sides` is
 * referenced twice, so PostgreSQL computes it once and both aggregations read it. Rows of kind
 * 'cell' carry a cell; rows of kind 'sir' an outcome × site × group's SIR counts.
 */
export const CELLS_AND_SIR_SQL = `
  WITH ${SIDES_CTES}, ${sirCtes('$3')},
  cells AS (${CELL_ROWS})
  SELECT 'cell' AS kind, outcome_id, site_id, exposure_group_id, month, age_band, sex, hours, cases,
         NULL::text AS hours_uncovered, NULL::float8 AS expected
  FROM cells
  UNION ALL
  SELECT 'sir', outcome_id, site_id, exposure_group_id, NULL, NULL, NULL, hours, observed, hours_uncovered, expected
  FROM sir`;

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

interface CellOrSirRow {
  kind: 'cell' | 'sir';
  outcome_id: number;
  site_id: number;
  exposure_group_id: number;
  month: string | null;
  age_band: number | null;
  sex: string | null;
  hours: string;
  cases: number;
  hours_uncovered: string | null;
  expected: number | null;
}

const cents = (hours: string) => Math.round(Number(hours) * 100);

/** The cells and the SIR counts against one reference table, from one statement (CELLS_AND_SIR_SQL). */
export async function loadCellsAndSir(
  q: QueryRunner,
  countedStatuses: CaseStatus[],
  ageBandEdges: readonly number[],
  tableId: number,
): Promise<{ cells: Cell[]; sirCells: SirCell[] }> {
  const rows: CellOrSirRow[] = await q.query(CELLS_AND_SIR_SQL, [countedStatuses, ageBandEdges, tableId]);
  const cells: Cell[] = [];
  const sirCells: SirCell[] = [];
  for (const r of rows) {
    if (r.kind === 'cell') cells.push(cellOf({ ...r, month: r.month! }));
    else
      sirCells.push({
        outcomeId: r.outcome_id,
        siteId: r.site_id,
        groupId: r.exposure_group_id,
        cents: cents(r.hours),
        uncoveredCents: cents(r.hours_uncovered!),
        observed: r.cases,
        expected: Number(r.expected),
      });
  }
  sirCells.sort((a, b) => a.outcomeId - b.outcomeId || a.siteId - b.siteId || a.groupId - b.groupId);
  return { cells, sirCells };
}
