import type { DataSource, EntityManager } from 'typeorm';
import type { Principal } from '@ratewarden/shared/permissions';
import { AuditEventEntity } from './entities/audit-event';

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
  // save, not insert: TypeORM's insert types refuse a jsonb column typed as a record. One INSERT, no transaction of its own.
  await ('manager' in db ? db.manager : db)
    .getRepository(AuditEventEntity)
    .save(
      { actorId, actorLabel: labelOf(entry.actor), action: entry.action, target: entry.target ?? null, detail: entry.detail ?? {}, ip: entry.ip ?? null },
      { transaction: false, reload: false },
    );
}
