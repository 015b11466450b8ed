import type { DataSource, EntityManager } from 'typeorm';
import type { Principal } from '@ratewarden/shared/permissions';

/** Who did it: a signed-in person or an integration client, nobody (`null`: signed out), or one of Ratewarden's own processes by name. */
export type AuditActor = Principal | null | { kind: 'system'; name: string };

export interface AuditEntry {
  actor: AuditActor;
  /** Dotted verb, e.g. `auth.sign_in`, `intake.apply`, `cases.read`, `flag.close`. */
  action: string;
  target?: string;
  detail?: Record<string, unknown>;
  ip?: string | null;
}

function labelOf(actor: AuditActor): string {
  if (!actor) return 'anonymous';
  if (actor.kind === 'user') return actor.email;
  if (actor.kind === 'client') return `client:${actor.clientId}`;
  return `system:${actor.name}`;
}

/**
 * Appends one line to the audit log (table audit_events), for the API and the worker alike. Pass
 * the transaction's EntityManager so the line commits (or rolls back) with the change it records.
 */
export async function recordAudit(db: DataSource | EntityManager, entry: AuditEntry): Promise<void> {
  const actorId = entry.actor?.kind === 'user' ? entry.actor.id : null;
  await db.query(`INSERT INTO audit_events (actor_id, actor_label, action, target, detail, ip) VALUES ($1, $2, $3, $4, $5, $6)`, [
    actorId,
    labelOf(entry.actor),
    entry.action,
    entry.target ?? null,
    JSON.stringify(entry.detail ?? {}),
    entry.ip ?? null,
  ]);
}
