import { EntitySchema } from 'typeorm';
import type { IntakeProblem } from '@ratewarden/shared/intake-schemas';

/** One uploaded version of the reference-rate table (see the ReferenceRates migration). */
export interface ReferenceRateTable {
  id: number;
  state: 'applied' | 'superseded' | 'rejected';
  fileName: string;
  checksum: string;
  rowCount: number;
  problemCount: number;
  problems: IntakeProblem[];
  sources: string[];
  uploadedBy: string | null;
  createdAt: Date;
  supersededAt: Date | null;
}

export const ReferenceRateTableEntity = new EntitySchema<ReferenceRateTable>({
  name: 'ReferenceRateTable',
  tableName: 'reference_rate_tables',
  columns: {
    id: { type: 'integer', primary: true, generated: 'increment' },
    state: { type: 'text' },
    fileName: { name: 'file_name', type: 'text' },
    checksum: { type: 'text' },
    rowCount: { name: 'row_count', type: 'integer', default: 0 },
    problemCount: { name: 'problem_count', type: 'integer', default: 0 },
    problems: { type: 'jsonb', default: () => "'[]'" },
    sources: { type: 'text', array: true, default: () => "'{}'" },
    uploadedBy: { name: 'uploaded_by', type: 'uuid', nullable: true },
    createdAt: { name: 'created_at', type: 'timestamptz', createDate: true },
    supersededAt: { name: 'superseded_at', type: 'timestamptz', nullable: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'reference_rate_tables_checksum_check', expression: "(checksum ~ '^[0-9a-f]{64}$'::text)" },
    { name: 'reference_rate_tables_state_check', expression: "(state = ANY (ARRAY['applied'::text, 'superseded'::text, 'rejected'::text]))" },
  ],
  indices: [{ name: 'reference_rate_tables_applied', columns: [], unique: true, where: "(state = 'applied'::text)", synchronize: false }],
  foreignKeys: [{ name: 'reference_rate_tables_uploaded_by_fkey', target: 'User', columnNames: ['uploaded_by'], referencedColumnNames: ['id'] }],
});
