import type { DataSource, QueryRunner } from 'typeorm';
import { AnalysisSettingsEntity } from '@ratewarden/db/entities/analysis-settings';
import { ageBandEdgesOf } from '@ratewarden/shared/age-bands';
import { runSettingsSchema, type RunSettings } from '@ratewarden/shared/runs';

export interface VersionedSettings {
  version: number;
  settings: RunSettings;
}

/**
 * The analysis settings a run uses: the current version (db table analysis_settings, written by
 * the settings page). A new database has none: the worker's environment (RUN_PER and the others,
 * given here as `defaults`) becomes version 1, once, whichever worker gets there first.
 */
export async function currentAnalysisSettings(q: DataSource | QueryRunner, defaults: RunSettings): Promise<VersionedSettings> {
  // Seeding stays SQL: one statement that inserts only into an empty table, whichever worker comes first.
  await q.query(
    `INSERT INTO analysis_settings (version, settings, created_by_label)
     SELECT 1, $1::jsonb, 'worker environment' WHERE NOT EXISTS (SELECT 1 FROM analysis_settings)
     ON CONFLICT (version) DO NOTHING`,
    // Written whole (the age band edges too), so the settings page shows what runs use.
    [JSON.stringify(runSettingsSchema.parse({ ...defaults, ageBandEdges: [...ageBandEdgesOf(defaults)] }))],
  );
  const [row] = await q.manager.getRepository(AnalysisSettingsEntity).find({ select: { version: true, settings: true }, order: { version: 'DESC' }, take: 1 });
  return { version: row!.version, settings: runSettingsSchema.parse(row!.settings) };
}
