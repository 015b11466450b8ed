import { EntitySchema } from 'typeorm';
import type { IntakeKind, IntakeState } from '@ratewarden/shared/intake';

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
  problems: unknown[];
  diff: Record<string, unknown> | null;
  submittedBy: string | null;
  submittedByClient: string | null;
  createdAt: Date;
  checkedAt: Date | null;
  appliedAt: Date | null;
  supersededAt: Date | null;
  /** Case lists: the last month whose cases the list reports (every earlier month too), and for which sites. */
  reportsThrough: string | null;
  reportsSiteIds: number[] | null;
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
  },
});
