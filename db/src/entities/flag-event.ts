import { EntitySchema } from 'typeorm';
import type { FlagEventKind } from '@ratewarden/shared/flags';

/** One change of a flag, by a run (actor null) or a person. */
export interface FlagEventRow {
  id: string;
  flagId: string;
  at: Date;
  kind: FlagEventKind;
  actorId: string | null;
  runId: string | null;
  detail: Record<string, unknown>;
}

export const FlagEventEntity = new EntitySchema<FlagEventRow>({
  name: 'FlagEvent',
  tableName: 'flag_events',
  columns: {
    id: { type: 'bigint', primary: true, generated: 'increment' },
    flagId: { name: 'flag_id', type: 'uuid' },
    at: { type: 'timestamptz', createDate: true },
    kind: { type: 'text' },
    actorId: { name: 'actor_id', type: 'uuid', nullable: true },
    runId: { name: 'run_id', type: 'uuid', nullable: true },
    detail: { type: 'jsonb', default: () => "'{}'" },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    {
      name: 'flag_events_kind_check',
      expression:
        "(kind = ANY (ARRAY['raised'::text, 'updated'::text, 'escalated'::text, 'eased'::text, 'cleared'::text, 'crossed_again'::text, 'review_started'::text, 'closed'::text]))",
    },
  ],
  indices: [{ name: 'flag_events_flag', columns: ['flagId', 'at'] }],
  foreignKeys: [
    { name: 'flag_events_actor_id_fkey', target: 'User', columnNames: ['actor_id'], referencedColumnNames: ['id'] },
    { name: 'flag_events_flag_id_fkey', target: 'Flag', columnNames: ['flag_id'], referencedColumnNames: ['id'] },
    { name: 'flag_events_run_id_fkey', target: 'Run', columnNames: ['run_id'], referencedColumnNames: ['id'] },
  ],
});
