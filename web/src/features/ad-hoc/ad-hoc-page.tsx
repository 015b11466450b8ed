import { useEffect, useMemo, useState } from 'react';
import { Cautions } from '../../components/cautions/cautions';
import { UnitsStrip, type UnitsSettings } from '../../components/units/units-strip';
import type { RateInput, TableInput } from './ad-hoc-schemas';
import { basisLabels, differenceMethodLabels, perLabel, ratioMethodLabels, type AdHocSettings } from './ad-hoc-settings';
import { computeRates, computeRisks } from './compute';
import { RateForm } from './rate-form';
import { RateResults } from './rate-results';
import { RiskResults } from './risk-results';
import { SettingsControls } from './settings-controls';
import { loadSettings, saveSettings } from './stored-settings';
import { TableForm } from './table-form';

type Mode = 'rates' | 'table';

/** Two groups compared in the browser by the shared statistics core; nothing is sent anywhere. */
export function AdHocPage() {
  const [mode, setMode] = useState<Mode>('rates');
  const [settings, setSettings] = useState<AdHocSettings>(() => loadSettings(browserStorage()));
  useEffect(() => saveSettings(browserStorage(), settings), [settings]);
  const [rateInput, setRateInput] = useState<RateInput | null>(null);
  const [tableInput, setTableInput] = useState<TableInput | null>(null);

  const rates = useMemo(() => (rateInput ? computeRates(rateInput, settings.confidence, settings.per) : null), [rateInput, settings.confidence, settings.per]);
  const risks = useMemo(() => (tableInput ? computeRisks(tableInput, settings.confidence) : null), [tableInput, settings.confidence]);

  const units: UnitsSettings =
    mode === 'rates'
      ? {
          basis: basisLabels[settings.basis],
          multiplier: perLabel(settings),
          confidence: settings.confidence,
          intervalMethod: `${ratioMethodLabels[settings.ratioMethod]} leads; the other methods are compared in the fold below`,
        }
      : {
          basis: 'people followed for the same period (a fixed cohort)',
          multiplier: 'risks as proportions',
          confidence: settings.confidence,
          intervalMethod: `${differenceMethodLabels[settings.differenceMethod]} leads for the risk difference; Katz for the risk ratio; Woolf and exact for the odds ratio; the other methods are compared in the fold below`,
        };
  const computed = mode === 'rates' ? rates : risks;

  return (
    <section>
      <h1 className="text-3xl font-bold tracking-tight">Ad hoc comparison</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        Compare an exposed group with a reference group from your own counts. Everything is computed in this browser by Ratewarden's statistics core; nothing
        you type leaves the page.
      </p>

      <fieldset className="no-print mt-6 flex flex-wrap gap-x-6 gap-y-2">
        <legend className="mb-2 text-sm font-semibold">What do you have?</legend>
        <label className="flex items-center gap-2">
          <input type="radio" name="mode" value="rates" checked={mode === 'rates'} onChange={() => setMode('rates')} />
          Cases and person-time for two groups (rates)
        </label>
        <label className="flex items-center gap-2">
          <input type="radio" name="mode" value="table" checked={mode === 'table'} onChange={() => setMode('table')} />A 2×2 table of counts for a fixed cohort
          (risks)
        </label>
      </fieldset>

      <div className="no-print mt-4">
        <SettingsControls mode={mode} settings={settings} onChange={setSettings} />
      </div>
      <div className="no-print mt-4">
        {mode === 'rates' ? <RateForm basis={settings.basis} onSubmit={setRateInput} /> : <TableForm onSubmit={setTableInput} />}
      </div>

      <div aria-live="polite" className="mt-8">
        {computed && (
          <>
            <UnitsStrip settings={units} />
            <div className="mt-4">
              {!computed.ok ? (
                <p role="alert" className="note note-alarm px-4 py-3">
                  These counts cannot be compared: {computed.message}
                </p>
              ) : mode === 'rates' && rates?.ok && rateInput ? (
                <RateResults input={rateInput} result={rates.result} settings={settings} />
              ) : mode === 'table' && risks?.ok ? (
                <RiskResults result={risks.result} method={settings.differenceMethod} />
              ) : null}
            </div>
            <Cautions />
          </>
        )}
      </div>
    </section>
  );
}

/** Local storage when the browser offers it (some refuse it outright in private windows). */
function browserStorage(): Storage | undefined {
  try {
    return window.localStorage;
  } catch {
    return undefined;
  }
}
