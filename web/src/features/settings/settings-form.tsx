import { caseStatusSchema, type CaseStatus } from '@ratewarden/shared/intake';
import type { PersonTimeBasis, RunSettings } from '@ratewarden/shared/runs';
import { CONFIDENCE_LEVELS, settingsUpdateSchema } from '@ratewarden/shared/settings';
import { DECADE_AGE_BAND_EDGES } from '@ratewarden/shared/runs';
import { offeredWindows, windowKinds, windowLabels, type WindowKind } from '@ratewarden/shared/windows';
import { useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { SelectField } from '../../components/form/select-field';
import { TextField } from '../../components/form/text-field';
import { formatConfidence } from '../../components/units/units-strip';
import { useSaveSettings } from './api/save-settings';
import { basisLabels, statusLabels } from './settings-labels';

/** The next version of the analysis settings, as one form; nothing is saved until the button. */
export function SettingsForm({ current }: { current: RunSettings }) {
  const save = useSaveSettings();
  const [basis, setBasis] = useState<PersonTimeBasis>(current.personTimeBasis);
  const [per, setPer] = useState(String(current.per));
  const [confidence, setConfidence] = useState(String(current.confidence));
  const [statuses, setStatuses] = useState<CaseStatus[]>(current.countedStatuses);
  const [edges, setEdges] = useState((current.ageBandEdges ?? DECADE_AGE_BAND_EDGES).join(', '));
  const [windows, setWindows] = useState<WindowKind[]>(offeredWindows(current));
  const [wholeStart, setWholeStart] = useState(current.wholePeriodStart?.slice(0, 7) ?? '');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const levels = CONFIDENCE_LEVELS.includes(current.confidence as (typeof CONFIDENCE_LEVELS)[number])
    ? [...CONFIDENCE_LEVELS]
    : [...CONFIDENCE_LEVELS, current.confidence].sort((a, b) => a - b);
  return (
    <form
      aria-label="Change the analysis settings"
      className="mt-4 grid max-w-3xl gap-4 form-panel p-4 sm:grid-cols-2"
      onSubmit={(e) => {
        e.preventDefault();
        const parsed = settingsUpdateSchema.safeParse({
          personTimeBasis: basis,
          per: Number(per),
          confidence: Number(confidence),
          countedStatuses: statuses,
          ageBandEdges: edges
            .split(/[,\s]+/)
            .filter(Boolean)
            .map(Number),
          windows: windowKinds.filter((w) => windows.includes(w)),
          // The month as typed (YYYY-MM); the schema refuses anything else with its own words.
          wholePeriodStart: windows.includes('whole')
            ? /^\d{4}-\d{2}$/.test(wholeStart.trim())
              ? `${wholeStart.trim()}-01`
              : wholeStart.trim() || null
            : null,
        });
        if (!parsed.success) {
          setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
          return;
        }
        setErrors({});
        save.mutate(parsed.data);
      }}
    >
      <SelectField
        label="Person-time"
        value={basis}
        onChange={(e) => setBasis(e.target.value as PersonTimeBasis)}
        options={(Object.keys(basisLabels) as PersonTimeBasis[]).map((b) => ({ value: b, label: basisLabels[b] }))}
      />
      <TextField
        label="Rate multiplier"
        hint="1000: rates per 1,000 person-years; 1 with units of 200,000 h: the OSHA-style rate"
        inputMode="decimal"
        value={per}
        onChange={(e) => setPer(e.target.value)}
        error={errors.per}
      />
      <SelectField
        label="Confidence level"
        value={confidence}
        onChange={(e) => setConfidence(e.target.value)}
        options={levels.map((c) => ({ value: String(c), label: formatConfidence(c) }))}
      />
      <TextField
        label="Age band edges"
        hint="whole years, increasing: 18, 25, 65 gives under 18, 18–24, 25–64, 65 and over"
        value={edges}
        onChange={(e) => setEdges(e.target.value)}
        error={errors.ageBandEdges}
      />
      <fieldset className="sm:col-span-2" aria-describedby={errors.countedStatuses ? 'counted-error' : undefined}>
        <legend className="text-sm font-medium">Case statuses counted</legend>
        <div className="mt-1 flex flex-wrap gap-4">
          {caseStatusSchema.options.map((s) => (
            <label key={s} className="flex items-center gap-2">
              <input
                type="checkbox"
                checked={statuses.includes(s)}
                onChange={(e) => setStatuses(e.target.checked ? [...statuses, s] : statuses.filter((x) => x !== s))}
              />
              {statusLabels[s]}
            </label>
          ))}
        </div>
        {errors.countedStatuses && (
          <span id="counted-error" className="text-sm text-alarm">
            <span aria-hidden="true">⚠ </span>choose at least one status
          </span>
        )}
      </fieldset>
      <fieldset className="sm:col-span-2" aria-describedby="windows-hint">
        <legend className="text-sm font-medium">Analysis windows offered</legend>
        <span id="windows-hint" className="text-xs text-ink-soft">
          Each run computes these windows and the results pages offer them; the single month is always computed. Fewer windows make runs shorter. Watch rules
          read the single month or the rolling 12 months only.
        </span>
        <div className="mt-1 flex flex-wrap gap-4">
          {windowKinds.map((w) => (
            <label key={w} className="flex items-center gap-2">
              <input
                type="checkbox"
                checked={windows.includes(w)}
                disabled={w === 'month'}
                onChange={(e) => setWindows(e.target.checked ? [...windows, w] : windows.filter((x) => x !== w))}
              />
              {windowLabels[w]}
              {w === 'month' && <span className="text-xs text-ink-soft">(always)</span>}
            </label>
          ))}
        </div>
      </fieldset>
      {windows.includes('whole') && (
        <TextField
          label="Whole period starts"
          hint="the first month of the whole-period window, as YYYY-MM, e.g. 2024-01"
          value={wholeStart}
          onChange={(e) => setWholeStart(e.target.value)}
          error={errors.wholePeriodStart}
        />
      )}
      {save.isError && (
        <div className="sm:col-span-2">
          <ProblemNotice title="Not saved" problem={problemOf(save.error).problem} />
        </div>
      )}
      <div className="flex flex-wrap items-center gap-3 sm:col-span-2">
        <button type="submit" disabled={save.isPending} className="btn btn-primary px-4 py-2">
          Save as a new version
        </button>
        <p role="status" className="text-sm">
          {save.data &&
            (save.data.changed ? `Saved as version ${save.data.current.version}; a run has been requested.` : 'Nothing changed: the current version stays.')}
        </p>
      </div>
    </form>
  );
}
