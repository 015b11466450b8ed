import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Clinical notes on a flag: written and read by physicians only (`cases:*`), kept with the flag's
 * history, never changed or removed (the trigger refuses UPDATE and DELETE; TRUNCATE stays open
 * for the tests' emptying of flags, which cascades).
 */
export class FlagClinicalNotes1764635020000 implements MigrationInterface {
  name = 'FlagClinicalNotes1764635020000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE flag_notes (
        id bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
        flag_id uuid NOT NULL REFERENCES flags(id),
        author_id uuid NOT NULL REFERENCES users(id),
        text text NOT NULL CHECK (length(btrim(text)) > 0),
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX flag_notes_flag ON flag_notes (flag_id, created_at)`);
    await q.query(`
      CREATE FUNCTION flag_notes_kept() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'clinical notes are kept as written' USING ERRCODE = 'insufficient_privilege';
      END $$`);
    await q.query(`CREATE TRIGGER flag_notes_no_change BEFORE UPDATE OR DELETE ON flag_notes FOR EACH ROW EXECUTE FUNCTION flag_notes_kept()`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE flag_notes`);
    await q.query(`DROP FUNCTION flag_notes_kept`);
  }
}
