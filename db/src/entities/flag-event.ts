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
});
