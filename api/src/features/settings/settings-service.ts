import type { DataSource, EntityManager } from 'typeorm';
import { AnalysisSettingsEntity, type AnalysisSettingsRow } from '@ratewarden/db/entities/analysis-settings';
import { requestRun } from '@ratewarden/db/run-requests';
import type { Principal } from '@ratewarden/shared/permissions';
import { ageBandEdgesOf } from '@ratewarden/shared/age-bands';
import { runSettingsSchema, type RunSettings } from '@ratewarden/shared/runs';
import type { AnalysisSettings, SettingsUpdate, SettingsUpdateResult, SettingsVersion } from '@ratewarden/shared/settings';
import { offeredWindows } from '@ratewarden/shared/windows';
import { recordAudit } from '../../audit/audit-log';

/** One version as the API answers it. */
const versionOf = (r: AnalysisSettingsRow): SettingsVersion => ({
  version: r.version,
  settings: runSettingsSchema.parse(r.settings),
  createdAt: r.createdAt.toISOString(),
  createdBy: r.createdByLabel,
});

/** Every version of the analysis settings, newest first; the first is the one runs use. */
export async function analysisSettings(db: DataSource | EntityManager): Promise<AnalysisSettings> {
  const all = (await db.getRepository(AnalysisSettingsEntity).find({ order: { version: 'DESC' } })).map(versionOf);
  return { current: all[0] ?? null, history: all.slice(1) };
}

/**
 * The settings compared as a run reads them (the order of statuses and windows does not matter;
 * no edges are ten-year bands; no windows are month and rolling 12 months).
 */
const canonical = (s: RunSettings) => {
  const windows = offeredWindows(s);
  return JSON.stringify({
    personTimeBasis: s.personTimeBasis,
    per: s.per,
    confidence: s.confidence,
    countedStatuses: [...s.countedStatuses].sort(),
    ageBandEdges: ageBandEdgesOf(s),
    windows,
    wholePeriodStart: windows.includes('whole') ? s.wholePeriodStart : null,
  });
};

/**
 * A change of the analysis settings: the next version, who and when, an audit line with before
 * and after, and a run request (the current results were computed with the old version). A body
 * equal to the current version writes nothing.
 */
export async function changeAnalysisSettings(
  ds: DataSource,
  p: Extract<Principal, { kind: 'user' }>,
  body: SettingsUpdate,
  ip?: string | null,
): Promise<SettingsUpdateResult> {
  return ds.transaction(async (em) => {
    // One writer at a time: versions are numbered without gaps, and readers are not blocked.
    await em.query(`LOCK TABLE analysis_settings IN EXCLUSIVE MODE`);
    const { current } = await analysisSettings(em);
    // Windows left out: the current version's stay (a client that does not know them keeps them).
    const start = body.wholePeriodStart ?? current?.settings.wholePeriodStart ?? null;
    const windows = offeredWindows({ windows: body.windows ?? current?.settings.windows, wholePeriodStart: start });
    const { wholePeriodStart: _start, ...rest } = body;
    const next: RunSettings = {
      ...rest,
      countedStatuses: [...body.countedStatuses].sort(),
      windows,
      ...(windows.includes('whole') && start !== null && { wholePeriodStart: start }),
    };
    if (current && canonical(current.settings) === canonical(next)) {
      return { current, changed: false, runRequested: false };
    }
    const version = (current?.version ?? 0) + 1;
    const versions = em.getRepository(AnalysisSettingsEntity);
    await versions.insert({ version, settings: next, createdBy: p.id, createdByLabel: p.name });
    const row = await versions.findOneByOrFail({ version });
    await recordAudit(em, {
      actor: p,
      action: 'settings.change',
      target: `settings:${version}`,
      ip,
      detail: { before: current?.settings ?? null, after: next },
    });
    await requestRun(em, `analysis settings changed to version ${version} by ${p.name}`);
    return { current: versionOf(row), changed: true, runRequested: true };
  });
}
