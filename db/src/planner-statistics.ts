/**
 * The tables a run's aggregation and a case list's checks read; their plans are only as good as
 * these tables' statistics. The small ones count too: autovacuum never analyzes a table of a few
 * outcomes (its threshold is 50 changed rows), and the planner's guess for a table never
 * analyzed (hundreds of rows) multiplied the aggregation's estimate a hundredfold.
 */
export const AGGREGATED_TABLES = ['roster_entries', 'roster_sums', 'roster_slices', 'workers', 'case_events', 'outcomes', 'exposure_groups'] as const;

export interface TableActivity {
  table: string;
  liveRows: number;
  modifiedSinceAnalyze: number;
  everAnalyzed: boolean;
}

/** autovacuum's analyze rule: changed rows above threshold + scale factor × live rows. */
export interface AnalyzeRule {
  threshold: number;
  scaleFactor: number;
}

/**
 * Tables whose planner statistics are missing, or stale by the server's own autovacuum rule
 * (PostgreSQL documentation, "The Autovacuum Daemon": autovacuum_analyze_threshold +
 * autovacuum_analyze_scale_factor × reltuples), so that a run or a case list's check right after
 * a large intake does not wait for autovacuum. Without them the aggregation of the 1.2 M-row
 * benchmark roster took 42 s instead of 1.3 s, and the case list's checks 125 s instead of 2.9 s.
 */
export function tablesToAnalyze(activity: TableActivity[], rule: AnalyzeRule): string[] {
  return activity.filter((t) => !t.everAnalyzed || t.modifiedSinceAnalyze > rule.threshold + rule.scaleFactor * t.liveRows).map((t) => t.table);
}

/** Runs SQL and returns the rows: a TypeORM QueryRunner's `query`, or pg's with `.rows` taken. */
export type QueryRows = (sql: string, params?: unknown[]) => Promise<unknown[]>;

/** Analyzes the cohort tables that need it (before a run's read-only snapshot, before a case list's checks). Returns their names. */
export async function refreshPlannerStatistics(query: QueryRows): Promise<string[]> {
  const rows = (await query(
    `SELECT relname AS table, n_live_tup::text AS live, n_mod_since_analyze::text AS modified,
            (last_analyze IS NOT NULL OR last_autoanalyze IS NOT NULL) AS analyzed,
            current_setting('autovacuum_analyze_threshold') AS threshold, current_setting('autovacuum_analyze_scale_factor') AS scale
     FROM pg_stat_user_tables WHERE schemaname = current_schema() AND relname = ANY($1::text[])`,
    [AGGREGATED_TABLES],
  )) as Array<{ table: string; live: string; modified: string; analyzed: boolean; threshold: string; scale: string }>;
  if (rows.length === 0) return [];
  const rule = { threshold: Number(rows[0]!.threshold), scaleFactor: Number(rows[0]!.scale) };
  const stale = tablesToAnalyze(
    rows.map((r) => ({ table: r.table, liveRows: Number(r.live), modifiedSinceAnalyze: Number(r.modified), everAnalyzed: r.analyzed })),
    rule,
  );
  if (stale.length) await query(`ANALYZE ${stale.map((t) => `"${t}"`).join(', ')}`);
  return stale;
}
