/** The settings behind every figure on a page, always next to the figures. */
export interface UnitsSettings {
  /** How person-time was counted, e.g. "person-years (2,000 h worked = 1 person-year)". */
  basis: string;
  /** e.g. "per 1,000 person-years" or "per 200,000 hours worked". */
  multiplier: string;
  /** 0.95 → "95%". */
  confidence: number;
  /** Names of the interval methods in use. */
  intervalMethod: string;
  /** The version of the analysis settings the run used (null: a run before versions; absent: not a run's figures). */
  settingsVersion?: number | null;
}

export function UnitsStrip({ settings }: { settings: UnitsSettings }) {
  const items: [string, string][] = [
    ['Person-time', settings.basis],
    ['Rates', settings.multiplier],
    ['Confidence level', `${formatConfidence(settings.confidence)}`],
    ['Intervals', settings.intervalMethod],
    ...(settings.settingsVersion === undefined
      ? []
      : [['Analysis settings', settings.settingsVersion === null ? 'before versions' : `version ${settings.settingsVersion}`] as [string, string]]),
  ];
  return (
    <dl aria-label="Units and settings" className="units-strip flex flex-wrap gap-x-6 gap-y-1 border-y border-line bg-surface px-3 py-2 text-sm">
      {items.map(([k, v]) => (
        <div key={k} className="flex gap-1.5">
          <dt className="text-ink-soft">{k}:</dt>
          <dd className="font-medium">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

export function formatConfidence(c: number): string {
  return `${Number((c * 100).toFixed(2))}%`;
}
