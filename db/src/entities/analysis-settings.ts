import { EntitySchema } from 'typeorm';
import type { RunSettings } from '@ratewarden/shared/runs';

/** One version of the analysis settings; never changed, a change is the next version. */
export interface AnalysisSettingsRow {
  version: number;
  settings: RunSettings;
  createdAt: Date;
  /** Null: seeded from the worker's environment for a new database. */
  createdBy: string | null;
  createdByLabel: string;
}

export const AnalysisSettingsEntity = new EntitySchema<AnalysisSettingsRow>({
  name: 'AnalysisSettings',
  tableName: 'analysis_settings',
  columns: {
    version: { type: 'integer', primary: true },
    settings: { type: 'jsonb' },
    createdAt: { name: 'created_at', type: 'timestamptz', createDate: true },
    createdBy: { name: 'created_by', type: 'uuid', nullable: true },
    createdByLabel: { name: 'created_by_label', type: 'text' },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [{ name: 'analysis_settings_version_check', expression: '(version > 0)' }],
  foreignKeys: [{ name: 'analysis_settings_created_by_fkey', target: 'User', columnNames: ['created_by'], referencedColumnNames: ['id'] }],
});
