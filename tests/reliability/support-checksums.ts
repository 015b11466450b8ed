import type { DataSource } from 'typeorm';

/**
 * One checksum per table: the MD5 of every row's text form, in sorted order. Two states of a
 * table have equal checksums exactly when they hold the same rows (up to MD5 collisions).
 */
export async function tableChecksums(ds: DataSource, tables: readonly string[]): Promise<Record<string, string>> {
  const sums: Record<string, string> = {};
  for (const table of tables) {
    const [row] = (await ds.query(
      `SELECT md5(coalesce(string_agg(t::text, E'\\n' ORDER BY t::text), '')) AS sum, count(*)::int AS n FROM ${table} t`,
    )) as Array<{ sum: string; n: number }>;
    sums[table] = `${row!.n}:${row!.sum}`;
  }
  return sums;
}

/** The cohort tables an intake writes. */
export const cohortTables = ['workers', 'roster_entries', 'roster_sums', 'roster_slices', 'case_events', 'intakes', 'run_requests', 'audit_events'] as const;

/** The tables a run writes, apart from its own row in `runs`. */
export const resultTables = ['current_run', 'run_results', 'run_cells', 'flags', 'flag_events', 'notices'] as const;
