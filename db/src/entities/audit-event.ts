import { EntitySchema } from 'typeorm';

/** One line of the append-only audit log: who did what, when, from where. */
export interface AuditEvent {
  id: string;
  at: Date;
  actorId: string | null;
  actorLabel: string;
  action: string;
  target: string | null;
  detail: Record<string, unknown>;
  ip: string | null;
}

export const AuditEventEntity = new EntitySchema<AuditEvent>({
  name: 'AuditEvent',
  tableName: 'audit_events',
  columns: {
    id: { type: 'bigint', primary: true, generated: 'increment' },
    at: { type: 'timestamptz', createDate: true },
    actorId: { name: 'actor_id', type: 'uuid', nullable: true },
    actorLabel: { name: 'actor_label', type: 'text' },
    action: { type: 'text' },
    target: { type: 'text', nullable: true },
    detail: { type: 'jsonb', default: {} },
    ip: { type: 'text', nullable: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  indices: [
    { name: 'audit_events_action', columns: ['action', 'at'] },
    { name: 'audit_events_at', columns: ['at'] },
  ],
  foreignKeys: [{ name: 'audit_events_actor_id_fkey', target: 'User', columnNames: ['actor_id'], referencedColumnNames: ['id'] }],
});
