import { EntitySchema } from 'typeorm';
import { timestampColumns, type Timestamps } from './base';

/** A workplace (plant, yard, office) that rosters and cases belong to. */
export interface Site extends Timestamps {
  id: number;
  code: string;
  name: string;
  region: string | null;
  /** When the administrator retired it: it keeps its history, and reports no month after this one. */
  retiredAt: Date | null;
}

export const SiteEntity = new EntitySchema<Site>({
  name: 'Site',
  tableName: 'sites',
  columns: {
    id: { type: 'integer', primary: true, generated: 'increment' },
    code: { type: 'text', unique: true },
    name: { type: 'text' },
    region: { type: 'text', nullable: true },
    retiredAt: { name: 'retired_at', type: 'timestamptz', nullable: true },
    ...timestampColumns,
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [{ name: 'sites_code_check', expression: "(code ~ '^[A-Za-z0-9_-]{1,32}$'::text)" }],
});
