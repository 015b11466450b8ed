import { EntitySchema } from 'typeorm';
import type { IntakeKind, IntakeState } from '@ratewarden/shared/intake';
import type { IntakeDiff, IntakeProblem } from '@ratewarden/shared/intake-schemas';

/** One uploaded roster or case list and what became of it. */
export interface Intake {
  id: string;
  kind: IntakeKind;
  state: IntakeState;
  fileName: string;
  checksum: string;
  sizeBytes: string;
  siteIds: number[];
  monthFrom: string | null;
  monthTo: string | null;
  rowCount: number;
  problemCount: number;
  /** The first 1,000 problems, by line (`problemCount` counts them all). */
  problems: IntakeProblem[];
  diff: IntakeDiff | null;
  submittedBy: string | null;
  submittedByClient: string | null;
  createdAt: Date;
  checkedAt: Date | null;
  appliedAt: Date | null;
  supersededAt: Date | null;
  /** Case lists: the last month whose cases the list reports (every earlier month too), and for which sites. */
  reportsThrough: string | null;
  reportsSiteIds: number[] | null;
  /** The staging table of a checked intake awaiting apply (s_ and 32 hex digits), dropped after. */
  stagingTable: string | null;
  /** The file's header, as read. */
  columns: string[];
  delimiter: ',' | ';' | null;
  restoredAt: Date | null;
  discardedAt: Date | null;
}

export const IntakeEntity = new EntitySchema<Intake>({
  name: 'Intake',
  tableName: 'intakes',
  columns: {
    id: { type: 'uuid', primary: true, generated: 'uuid' },
    kind: { type: 'text' },
    state: { type: 'text', default: 'received' },
    fileName: { name: 'file_name', type: 'text' },
    checksum: { type: 'text' },
    sizeBytes: { name: 'size_bytes', type: 'bigint' },
    siteIds: { name: 'site_ids', type: 'integer', array: true, default: () => "'{}'" },
    monthFrom: { name: 'month_from', type: 'date', nullable: true },
    monthTo: { name: 'month_to', type: 'date', nullable: true },
    rowCount: { name: 'row_count', type: 'integer', default: 0 },
    problemCount: { name: 'problem_count', type: 'integer', default: 0 },
    problems: { type: 'jsonb', default: () => "'[]'" },
    diff: { type: 'jsonb', nullable: true },
    submittedBy: { name: 'submitted_by', type: 'uuid', nullable: true },
    submittedByClient: { name: 'submitted_by_client', type: 'text', nullable: true },
    createdAt: { name: 'created_at', type: 'timestamptz', createDate: true },
    checkedAt: { name: 'checked_at', type: 'timestamptz', nullable: true },
    appliedAt: { name: 'applied_at', type: 'timestamptz', nullable: true },
    supersededAt: { name: 'superseded_at', type: 'timestamptz', nullable: true },
    reportsThrough: { name: 'reports_through', type: 'date', nullable: true },
    reportsSiteIds: { name: 'reports_site_ids', type: 'integer', array: true, nullable: true },
    stagingTable: { name: 'staging_table', type: 'text', nullable: true },
    columns: { type: 'text', array: true, default: () => "'{}'" },
    delimiter: { type: 'text', nullable: true },
    restoredAt: { name: 'restored_at', type: 'timestamptz', nullable: true },
    discardedAt: { name: 'discarded_at', type: 'timestamptz', nullable: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'intakes_check', expression: '((submitted_by IS NOT NULL) OR (submitted_by_client IS NOT NULL))' },
    { name: 'intakes_checksum_check', expression: "(checksum ~ '^[0-9a-f]{64}$'::text)" },
    { name: 'intakes_delimiter_check', expression: "(delimiter = ANY (ARRAY[','::text, ';'::text]))" },
    { name: 'intakes_kind_check', expression: "(kind = ANY (ARRAY['roster'::text, 'cases'::text]))" },
    { name: 'intakes_reports_through_check', expression: '(EXTRACT(day FROM reports_through) = (1)::numeric)' },
    { name: 'intakes_size_bytes_check', expression: '(size_bytes >= 0)' },
    { name: 'intakes_staging_table_check', expression: "(staging_table ~ '^s_[0-9a-f]{32}$'::text)" },
    {
      name: 'intakes_state_check',
      expression: "(state = ANY (ARRAY['received'::text, 'checked'::text, 'applied'::text, 'rejected'::text, 'superseded'::text]))",
    },
  ],
  indices: [
    { name: 'intakes_checksum', columns: ['kind', 'checksum'] },
    { name: 'intakes_created', columns: ['createdAt'] },
    { name: 'intakes_state', columns: ['state', 'createdAt'] },
  ],
  foreignKeys: [{ name: 'intakes_submitted_by_fkey', target: 'User', columnNames: ['submitted_by'], referencedColumnNames: ['id'] }],
});
