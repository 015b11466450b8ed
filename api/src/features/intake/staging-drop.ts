import type { PoolClient } from 'pg';
import { rosterStage } from './roster-stage';

/** Drops an intake's staging tables (a case list has only the first; a roster has all three). */
export async function dropStaging(client: PoolClient, id: string, table: string): Promise<void> {
  const st = rosterStage(table);
  await client.query(`DROP TABLE IF EXISTS ${st.rows}, ${st.workers}, ${st.slices}`);
  await client.query(`UPDATE intakes SET staging_table = NULL WHERE id = $1`, [id]);
}
