import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Drops `run_trends`. The worker stored a trend test per outcome × window × period that nothing
 * read, computed from every count; the trends page computes the test from the results its reader
 * may see (web/src/features/results/trend-levels.ts, with the statistics core's rateTrend), so a
 * level holding a withheld count gives no test there. Serving the stored test would have put
 * per-level sums beside the disclosure frame, which decides only the group counts. One
 * computation is kept: the page's. `down` recreates the table as it was (empty).
 */
export class DropRunTrends1764635700000 implements MigrationInterface {
  name = 'DropRunTrends1764635700000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE run_trends`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE run_trends (
        run_id uuid NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
        outcome_id integer NOT NULL REFERENCES outcomes(id),
        window_kind text NOT NULL CHECK (window_kind IN ('month', 'rolling12')),
        period date NOT NULL,
        chi2 double precision,
        p double precision,
        u double precision,
        levels jsonb NOT NULL,
        site_id integer REFERENCES sites(id),
        CONSTRAINT run_trends_key UNIQUE NULLS NOT DISTINCT (run_id, site_id, outcome_id, window_kind, period)
      )`);
  }
}
