import type { DataSource, EntityManager } from 'typeorm';
import type { Principal } from '@ratewarden/shared/permissions';

export interface AuditEntry {
  actor: Principal | null;
  /** Dotted verb, e.g. `auth.sign_in`, `intake.apply`, `cases.read`, `flag.close`. */
  action: string;
  target?: string;
  detail?: Record<string, unknown>;
  ip?: string | null;
}

/**
 * Appends one line to the audit log. Pass the transaction's EntityManager so the line commits
 * (or rolls back) with the change it records.
 */
export async function recordAudit(db: DataSource | EntityManager, entry: AuditEntry): Promise<void> {
  const actorId = entry.actor?.kind === 'user' ? entry.actor.id : null;
  const actorLabel = !entry.actor ? 'anonymous' : entry.actor.kind === 'user' ? entry.actor.email : `client:${entry.actor.clientId}`;
  await db.query(
    `INSERT INTO audit_events (actor_id, actor_label, action, target, detail, ip) VALUES ($1, $2, $3, $4, $5, $6)`,
    [actorId, actorLabel, entry.action, entry.target ?? null, JSON.stringify(entry.detail ?? {}), entry.ip ?? null],
  );
}
