import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Two more counters of `data_versions` (see DataVersions1764635500000 for how a write raises
 * them): `config`, the lists of sites, exposure groups and outcomes every page reads; `runs`, the
 * run history (runs, their requests, the current-run pointer).
 */
const domains: Record<string, string[]> = {
  config: ['sites', 'exposure_groups', 'outcomes'],
  runs: ['runs', 'run_requests', 'current_run'],
};

export class ConfigAndRunsVersions1764636000000 implements MigrationInterface {
  name = 'ConfigAndRunsVersions1764636000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`INSERT INTO data_versions (domain) SELECT unnest($1::text[])`, [Object.keys(domains)]);
    for (const [domain, tables] of Object.entries(domains)) {
      for (const table of tables) {
        await q.query(
          `CREATE TRIGGER ${table}_marks_${domain} AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON ${table} FOR EACH STATEMENT EXECUTE FUNCTION mark_data_version('${domain}')`,
        );
      }
    }
  }

  async down(q: QueryRunner): Promise<void> {
    for (const [domain, tables] of Object.entries(domains)) {
      for (const table of tables) await q.query(`DROP TRIGGER ${table}_marks_${domain} ON ${table}`);
    }
    await q.query(`DELETE FROM data_versions WHERE domain = ANY($1::text[])`, [Object.keys(domains)]);
  }
}
