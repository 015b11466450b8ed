import type { EntityManager } from 'typeorm';
import type { SirResultRow } from './compute-sir';

const cents = (c: number) => (c / 100).toFixed(2);

/** Stores the run's SIR rows (run_sir) in one statement; ±∞ limits go in as double precision 'Infinity'. */
export async function storeSir(em: EntityManager, runId: string, tableId: number, confidence: number, rows: SirResultRow[]): Promise<void> {
  if (rows.length === 0) return;
  const col = <T>(f: (r: SirResultRow) => T) => rows.map(f);
  const dbl = (v: number | null) => (v === null ? null : Number.isFinite(v) ? v : v > 0 ? 'Infinity' : '-Infinity');
  await em.query(
    `INSERT INTO run_sir (run_id, reference_table_id, confidence, outcome_id, exposure_group_id, site_id, observed, expected, hours, hours_uncovered,
                          sir, exact_lower, exact_upper, byar_lower, byar_upper, withheld)
     SELECT $1, $2, $3, * FROM unnest($4::int[], $5::int[], $6::int[], $7::int[], $8::float8[], $9::numeric[], $10::numeric[],
                                      $11::float8[], $12::float8[], $13::float8[], $14::float8[], $15::float8[], $16::text[])`,
    [
      runId,
      tableId,
      confidence,
      col((r) => r.outcomeId),
      col((r) => r.groupId),
      col((r) => r.siteId),
      col((r) => r.observed),
      col((r) => r.expected),
      col((r) => cents(r.cents)),
      col((r) => cents(r.uncoveredCents)),
      col((r) => dbl(r.sir)),
      col((r) => dbl(r.exactLower)),
      col((r) => dbl(r.exactUpper)),
      col((r) => dbl(r.byarLower)),
      col((r) => dbl(r.byarUpper)),
      col((r) => r.withheld),
    ],
  );
}
