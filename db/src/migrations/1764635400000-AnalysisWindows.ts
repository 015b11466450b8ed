import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Analysis windows beyond the month and the rolling twelve months (issue 15): calendar quarter,
 * calendar year and the whole period from a chosen start (shared/src/windows.ts). Which windows a
 * run computes is part of the analysis settings (a jsonb version, no column); the result, trend
 * and disclosure-frame rows only need to accept the new kinds. Watch rules keep to the month and
 * the rolling twelve months.
 */
const KINDS = `'month', 'rolling12', 'quarter', 'year', 'whole'`;

export class AnalysisWindows1764635400000 implements MigrationInterface {
  name = 'AnalysisWindows1764635400000';

  async up(q: QueryRunner): Promise<void> {
    for (const table of ['run_results', 'run_trends']) {
      await q.query(`ALTER TABLE ${table} DROP CONSTRAINT ${table}_window_kind_check`);
      await q.query(`ALTER TABLE ${table} ADD CONSTRAINT ${table}_window_kind_check CHECK (window_kind IN (${KINDS}))`);
    }
    await q.query(`ALTER TABLE run_withheld DROP CONSTRAINT run_withheld_window_kind_check`);
    await q.query(
      `ALTER TABLE run_withheld ADD CONSTRAINT run_withheld_window_kind_check CHECK (window_kind IN (${KINDS}, 'series', 'strata_age', 'strata_sex'))`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DELETE FROM run_withheld WHERE window_kind IN ('quarter', 'year', 'whole')`);
    await q.query(`ALTER TABLE run_withheld DROP CONSTRAINT run_withheld_window_kind_check`);
    await q.query(
      `ALTER TABLE run_withheld ADD CONSTRAINT run_withheld_window_kind_check CHECK (window_kind IN ('month', 'rolling12', 'series', 'strata_age', 'strata_sex'))`,
    );
    for (const table of ['run_results', 'run_trends']) {
      await q.query(`DELETE FROM ${table} WHERE window_kind IN ('quarter', 'year', 'whole')`);
      await q.query(`ALTER TABLE ${table} DROP CONSTRAINT ${table}_window_kind_check`);
      await q.query(`ALTER TABLE ${table} ADD CONSTRAINT ${table}_window_kind_check CHECK (window_kind IN ('month', 'rolling12'))`);
    }
  }
}
