import { roleMay } from '@ratewarden/shared/permissions';
import { DECADE_AGE_BAND_EDGES, runSettingsSchema, type RunSettings } from '@ratewarden/shared/runs';
import type { SessionUser } from '@ratewarden/shared/session';
import { ResultTable } from '../../components/table/result-table';
import { formatConfidence } from '../../components/units/units-strip';
import { formatMonth, formatWhen } from '../../lib/dates';
import { useAnalysisSettings } from '../../api/get-settings';
import { DEFAULT_WINDOWS, offeredWindows, windowContextOf, windowLabel } from '@ratewarden/shared/windows';
import { SettingsForm } from './settings-form';
import { basisLabels, statusLabels } from './settings-labels';

const summary = (s: RunSettings) =>
  `${basisLabels[s.personTimeBasis]}; per ${s.per.toLocaleString('en-GB')}; ${formatConfidence(s.confidence)}; counts ${s.countedStatuses.map((x) => statusLabels[x]).join(', ')}; age band edges ${(s.ageBandEdges ?? DECADE_AGE_BAND_EDGES).join(', ')}; windows ${offeredWindows(
    s,
  )
    .map((w) => windowLabel(w, windowContextOf(s), formatMonth).toLowerCase())
    .join(', ')}`;

/**
 * The analysis settings every run computes with, as numbered versions: the administrator and the
 * hygienist save a new version (a run is requested), everyone else reads which version is current.
 */
export function SettingsPage({ user }: { user: SessionUser }) {
  const { data } = useAnalysisSettings();
  const canWrite = roleMay(user.role, 'settings:write');
  const current = data.current?.settings ?? runSettingsSchema.parse({ ageBandEdges: [...DECADE_AGE_BAND_EDGES], windows: [...DEFAULT_WINDOWS] });
  const versions = data.current ? [data.current, ...data.history] : [];
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Analysis settings</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        How every run counts person-time, scales rates, sets its intervals, counts cases, bands ages and which analysis windows it computes. Each change is
        saved as a new version with who made it and when; each run records the version it used, shown beside its figures. A change asks for a run, so the
        figures follow.
      </p>
      <p className="mt-2 max-w-3xl text-sm">
        {data.current ? (
          <>
            Current: <strong>version {data.current.version}</strong>, saved {formatWhen(data.current.createdAt)} by {data.current.createdBy}.
          </>
        ) : (
          <>No version yet: the worker's defaults become version 1 at its first start or run, unless one is saved here first.</>
        )}
      </p>
      {canWrite ? (
        <SettingsForm current={current} />
      ) : (
        <p className="mt-4 note note-plain max-w-3xl px-4 py-3">{summary(current)}. The administrator or the hygienist can change them.</p>
      )}
      <p className="mt-4 max-w-3xl text-sm text-ink-soft">
        A narrower confidence level (90 %) gives narrower intervals and more watch-rule crossings by chance; a finding is a prompt for a licensed professional's
        review, not a conclusion, and local regulations may prescribe other conventions.
      </p>
      {versions.length > 0 && (
        <div className="mt-6">
          <ResultTable
            caption={`Versions (${versions.length}), newest first`}
            columns={['Version', 'Saved', 'By', 'Settings']}
            exportName="analysis-settings-versions"
            rows={versions.map((v) => ({
              key: String(v.version),
              cells: [String(v.version), formatWhen(v.createdAt), v.createdBy, summary(v.settings)],
              csv: [v.version, v.createdAt, v.createdBy, summary(v.settings)],
            }))}
          />
        </div>
      )}
    </section>
  );
}
