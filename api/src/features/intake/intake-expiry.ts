import type { PoolClient } from 'pg';
import type { DataSource, EntityManager } from 'typeorm';
import { reasons } from '@ratewarden/shared/intake-columns';
import type { IntakeProblem } from '@ratewarden/shared/intake-schemas';
import { pgClientOf } from '@ratewarden/db/sql';
import { recordAudit } from '../../audit/audit-log';
import { dropStaging } from './staging-drop';
import { IntakeEntity } from '@ratewarden/db/entities/intake';

/** Hours a checked intake waits for apply or discard before it expires (INTAKE_EXPIRY_HOURS). */
export const DEFAULT_EXPIRY_HOURS = 24;

export function expiredProblem(hours: number): IntakeProblem {
  return { line: null, column: null, value: null, reason: reasons.intakeExpired(hours) };
}

/**
 * Expires one checked intake in the caller's transaction: it becomes rejected with the reason that
 * it expired, and its staging tables are dropped.
 */
export async function expireIntake(client: PoolClient, em: EntityManager, id: string, table: string | null, hours: number): Promise<void> {
  await em.getRepository(IntakeEntity).update(id, { state: 'rejected', discardedAt: () => 'now()', problemCount: 1, problems: [expiredProblem(hours)] });
  if (table) await dropStaging(client, id, table);
  await recordAudit(em, { actor: null, action: 'intake.expire', target: `intake:${id}`, detail: { hours } });
}

/**
 * Checked intakes keep UNLOGGED staging tables until apply or discard; one never applied would keep
 * them for ever. This expires every checked intake older than `hours`, and drops staging tables
 * that no intake names (a table of an intake still being received is not yet visible to this
 * transaction, so it is safe). It only tries the intake lock: while another intake is being
 * checked or applied it does nothing, and the next intake request sweeps instead.
 */
export async function sweepStaging(ds: DataSource, hours: number): Promise<{ expired: string[]; orphans: string[] }> {
  return ds.transaction(async (em) => {
    const client = await pgClientOf(em);
    const lock = await client.query<{ ok: boolean }>(`SELECT pg_try_advisory_xact_lock(hashtext('ratewarden.intake.apply')) AS ok`);
    if (!lock.rows[0]!.ok) return { expired: [], orphans: [] };
    const { rows } = await client.query<{ id: string; staging_table: string | null }>(
      `SELECT id, staging_table FROM intakes WHERE state = 'checked' AND checked_at < now() - $1 * interval '1 hour' FOR UPDATE`,
      [hours],
    );
    for (const r of rows) await expireIntake(client, em, r.id, r.staging_table, hours);
    const { rows: orphans } = await client.query<{ name: string }>(`
      SELECT c.relname AS name FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
      WHERE n.nspname = 'intake_staging' AND c.relkind = 'r'
        AND NOT EXISTS (SELECT 1 FROM intakes i WHERE i.staging_table IS NOT NULL AND c.relname IN (i.staging_table, i.staging_table || '_w', i.staging_table || '_sl'))`);
    for (const o of orphans) await client.query(`DROP TABLE IF EXISTS intake_staging.${quoteIdent(o.name)}`);
    return { expired: rows.map((r) => r.id), orphans: orphans.map((o) => o.name) };
  });
}

function quoteIdent(name: string): string {
  return `"${name.replace(/"/g, '""')}"`;
}
