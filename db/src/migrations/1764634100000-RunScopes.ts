import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Run results per scope and adjusted by sex.
 *
 * - `site_id` on run_results and run_trends: null is the whole company, a site id is that site's
 *   cells alone. A run stores both, so that a person who may see only some sites is served
 *   figures computed from those sites (a company figure would include the others).
 * - `mh_sex_*`: the Mantel–Haenszel IRR and IRD by sex, beside those by age band and by site.
 * - The keys gain the scope; NULLS NOT DISTINCT keeps one company row per cell (PostgreSQL 15).
 */
export class RunScopes1764634100000 implements MigrationInterface {
  name = 'RunScopes1764634100000';

  async up(q: QueryRunner): Promise<void> {
    const interval = (p: string) => `ADD COLUMN ${p} double precision, ADD COLUMN ${p}_lower double precision, ADD COLUMN ${p}_upper double precision`;
    await q.query(
      `ALTER TABLE run_results ADD COLUMN site_id integer REFERENCES sites(id), ${interval('mh_sex_irr')}, ADD COLUMN mh_sex_irr_p double precision, ${interval('mh_sex_ird')}`,
    );
    await q.query(`ALTER TABLE run_results DROP CONSTRAINT run_results_pkey`);
    await q.query(
      `ALTER TABLE run_results ADD CONSTRAINT run_results_key UNIQUE NULLS NOT DISTINCT (run_id, site_id, outcome_id, exposure_group_id, window_kind, period)`,
    );
    await q.query(`ALTER TABLE run_trends ADD COLUMN site_id integer REFERENCES sites(id)`);
    await q.query(`ALTER TABLE run_trends DROP CONSTRAINT run_trends_pkey`);
    await q.query(`ALTER TABLE run_trends ADD CONSTRAINT run_trends_key UNIQUE NULLS NOT DISTINCT (run_id, site_id, outcome_id, window_kind, period)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DELETE FROM run_trends WHERE site_id IS NOT NULL`);
    await q.query(`ALTER TABLE run_trends DROP CONSTRAINT run_trends_key, DROP COLUMN site_id`);
    await q.query(`ALTER TABLE run_trends ADD PRIMARY KEY (run_id, outcome_id, window_kind, period)`);
    await q.query(`DELETE FROM run_results WHERE site_id IS NOT NULL`);
    await q.query(`ALTER TABLE run_results DROP CONSTRAINT run_results_key, DROP COLUMN site_id,
      DROP COLUMN mh_sex_irr, DROP COLUMN mh_sex_irr_lower, DROP COLUMN mh_sex_irr_upper, DROP COLUMN mh_sex_irr_p,
      DROP COLUMN mh_sex_ird, DROP COLUMN mh_sex_ird_lower, DROP COLUMN mh_sex_ird_upper`);
    await q.query(`ALTER TABLE run_results ADD PRIMARY KEY (run_id, outcome_id, exposure_group_id, window_kind, period)`);
  }
}
