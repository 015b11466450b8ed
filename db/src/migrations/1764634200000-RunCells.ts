import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The cells each run aggregated (outcome × month × site × exposure group × age band × sex, after
 * the counting rule and the exposure lag): what its results were computed from, kept with them so
 * that a stratum table (the adjusted view) reads the run's own numbers, and a run can be audited.
 *
 * One row per run × outcome × exposure group, its cells as parallel arrays (read back with
 * unnest). One row per cell took some 0.2 s of the timed run for the 25,000 cells of the
 * benchmark roster (tuple, index and foreign-key work per cell); the arrays are stored in a few
 * milliseconds. Only the run writes them, from its own GROUP BY, which guarantees one element per
 * key and references that exist. Hours in hundredths are exact as numeric(14, 2); an unknown age
 * band or sex is a null element.
 */
export class RunCells1764634200000 implements MigrationInterface {
  name = 'RunCells1764634200000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE run_cells (
        run_id uuid NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
        outcome_id integer NOT NULL,
        exposure_group_id integer NOT NULL,
        months date[] NOT NULL,
        site_ids integer[] NOT NULL,
        age_bands smallint[] NOT NULL,
        sexes text[] NOT NULL,
        hours numeric(14, 2)[] NOT NULL,
        cases integer[] NOT NULL,
        PRIMARY KEY (run_id, outcome_id, exposure_group_id),
        CHECK (cardinality(months) = cardinality(site_ids) AND cardinality(months) = cardinality(age_bands) AND cardinality(months) = cardinality(sexes)
          AND cardinality(months) = cardinality(hours) AND cardinality(months) = cardinality(cases))
      )`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE run_cells`);
  }
}
