import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * `roster_sums`: each roster intake's hours summed per site × month × exposure group × birth year
 * × sex, the grain of the run's person-time (worker/src/runs/cells-query.ts, `base`). An intake's
 * entries never change once stored and a worker's birth year and sex are those of their first
 * intake, so these sums are exact for as long as the entries exist; triggers keep them so for
 * every writer (the intake's apply, the seeds, the tests):
 * - an INSERT into roster_entries adds its rows' sums (one statement-level trigger with the
 *   statement's new rows as a transition table, so a 1.2 M-row apply aggregates once);
 * - a DELETE subtracts them, a TRUNCATE empties the sums (by DELETE: a TRUNCATE … CASCADE may
 *   already be truncating them);
 * - an UPDATE of roster entries, or of a worker's birth year or sex, is refused: either would
 *   leave the sums of earlier intakes wrong.
 * The nightly run then reads the current slices' sums (thousands of rows) instead of summing the
 * roster (1.2 M rows on the benchmark), once per upload instead of once per run.
 */
export class RosterSums1764635900000 implements MigrationInterface {
  name = 'RosterSums1764635900000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE roster_sums (
        intake_id uuid NOT NULL REFERENCES intakes(id) ON DELETE CASCADE,
        site_id integer NOT NULL,
        month date NOT NULL,
        exposure_group_id integer NOT NULL,
        birth_year integer,
        sex text,
        hours numeric NOT NULL,
        entries integer NOT NULL CHECK (entries >= 0),
        CONSTRAINT roster_sums_key UNIQUE NULLS NOT DISTINCT (intake_id, site_id, month, exposure_group_id, birth_year, sex)
      )`);
    await q.query(`
      CREATE FUNCTION roster_sums_add() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        INSERT INTO roster_sums AS t (intake_id, site_id, month, exposure_group_id, birth_year, sex, hours, entries)
        SELECT n.intake_id, n.site_id, n.month, n.exposure_group_id, w.birth_year, w.sex, sum(n.hours), count(*)
        FROM new_rows n JOIN workers w ON w.id = n.worker_id
        GROUP BY 1, 2, 3, 4, 5, 6
        ON CONFLICT ON CONSTRAINT roster_sums_key
        DO UPDATE SET hours = t.hours + EXCLUDED.hours, entries = t.entries + EXCLUDED.entries;
        RETURN NULL;
      END $$`);
    await q.query(`
      CREATE FUNCTION roster_sums_subtract() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        UPDATE roster_sums t SET hours = t.hours - d.hours, entries = t.entries - d.entries
        FROM (
          SELECT o.intake_id, o.site_id, o.month, o.exposure_group_id, w.birth_year, w.sex, sum(o.hours) AS hours, count(*)::int AS entries
          FROM old_rows o JOIN workers w ON w.id = o.worker_id
          GROUP BY 1, 2, 3, 4, 5, 6
        ) d
        WHERE t.intake_id = d.intake_id AND t.site_id = d.site_id AND t.month = d.month AND t.exposure_group_id = d.exposure_group_id
          AND t.birth_year IS NOT DISTINCT FROM d.birth_year AND t.sex IS NOT DISTINCT FROM d.sex;
        DELETE FROM roster_sums WHERE entries = 0;
        RETURN NULL;
      END $$`);
    await q.query(`CREATE FUNCTION roster_sums_clear() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN DELETE FROM roster_sums; RETURN NULL; END $$`);
    await q.query(`
      CREATE FUNCTION roster_sums_refuse() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION '% of %: roster entries and the birth year and sex of workers are never changed in place (roster_sums would be wrong)', TG_OP, TG_TABLE_NAME
          USING ERRCODE = 'restrict_violation';
      END $$`);
    await q.query(
      `CREATE TRIGGER roster_sums_add AFTER INSERT ON roster_entries REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION roster_sums_add()`,
    );
    await q.query(
      `CREATE TRIGGER roster_sums_subtract AFTER DELETE ON roster_entries REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION roster_sums_subtract()`,
    );
    await q.query(`CREATE TRIGGER roster_sums_clear AFTER TRUNCATE ON roster_entries FOR EACH STATEMENT EXECUTE FUNCTION roster_sums_clear()`);
    await q.query(`CREATE TRIGGER roster_entries_unchanged BEFORE UPDATE ON roster_entries FOR EACH ROW EXECUTE FUNCTION roster_sums_refuse()`);
    await q.query(
      `CREATE TRIGGER workers_traits_unchanged BEFORE UPDATE OF birth_year, sex ON workers FOR EACH ROW
       WHEN (OLD.birth_year IS DISTINCT FROM NEW.birth_year OR OLD.sex IS DISTINCT FROM NEW.sex) EXECUTE FUNCTION roster_sums_refuse()`,
    );
    await q.query(`
      INSERT INTO roster_sums (intake_id, site_id, month, exposure_group_id, birth_year, sex, hours, entries)
      SELECT r.intake_id, r.site_id, r.month, r.exposure_group_id, w.birth_year, w.sex, sum(r.hours), count(*)
      FROM roster_entries r JOIN workers w ON w.id = r.worker_id
      GROUP BY 1, 2, 3, 4, 5, 6`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TRIGGER workers_traits_unchanged ON workers`);
    await q.query(`DROP TRIGGER roster_entries_unchanged ON roster_entries`);
    await q.query(`DROP TRIGGER roster_sums_clear ON roster_entries`);
    await q.query(`DROP TRIGGER roster_sums_subtract ON roster_entries`);
    await q.query(`DROP TRIGGER roster_sums_add ON roster_entries`);
    await q.query(`DROP FUNCTION roster_sums_refuse(), roster_sums_clear(), roster_sums_subtract(), roster_sums_add()`);
    await q.query(`DROP TABLE roster_sums`);
  }
}
