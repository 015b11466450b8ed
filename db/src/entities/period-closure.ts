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
});
