import { EntitySchema } from 'typeorm';

/** The hygienist closing or reopening one site × month; append-only, the latest row decides. */
export interface PeriodClosure {
  id: string;
  siteId: number;
  month: string;
  action: 'close' | 'reopen';
  reason: string | null;
  personId: string | null;
  at: Date;
}

export const PeriodClosureEntity = new EntitySchema<PeriodClosure>({
  name: 'PeriodClosure',
  tableName: 'period_closures',
  columns: {
    id: { type: 'bigint', primary: true, generated: 'increment' },
    siteId: { name: 'site_id', type: 'integer' },
    month: { type: 'date' },
    action: { type: 'text' },
    reason: { type: 'text', nullable: true },
    personId: { name: 'person_id', type: 'uuid', nullable: true },
    at: { type: 'timestamptz', createDate: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'period_closures_action_check', expression: "(action = ANY (ARRAY['close'::text, 'reopen'::text]))" },
    { name: 'period_closures_month_check', expression: '(EXTRACT(day FROM month) = (1)::numeric)' },
    { name: 'period_closures_reason_check', expression: '(char_length(reason) <= 500)' },
  ],
  indices: [{ name: 'period_closures_latest', columns: ['siteId', 'month', 'id'] }],
  foreignKeys: [
    { name: 'period_closures_person_id_fkey', target: 'User', columnNames: ['person_id'], referencedColumnNames: ['id'] },
    { name: 'period_closures_site_id_fkey', target: 'Site', columnNames: ['site_id'], referencedColumnNames: ['id'] },
  ],
});
