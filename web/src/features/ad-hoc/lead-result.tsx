import { useId, type ReactNode } from 'react';

/**
 * The lead of the results: one measure by the preferred method, its estimate and interval in large
 * type, a small plot of them, and the plain-language reading. Everything else sits below or folds.
 */
export function LeadResult({
  measure,
  method,
  estimate,
  unit,
  interval,
  detail,
  plot,
  reading,
}: {
  measure: string;
  method: string;
  estimate: string;
  /** Words after the estimate, in smaller type ("percentage points"). */
  unit?: string;
  interval: string;
  detail?: string;
  plot: ReactNode;
  reading: string[];
}) {
  const id = useId();
  return (
    <section aria-labelledby={`${id}-lead`} className="card p-5">
      <h2 id={`${id}-lead`} className="text-lg font-semibold">
        {measure}
        <span className="block text-sm font-normal text-ink-soft">by the preferred method: {method}</span>
      </h2>
      <p className="mt-3 flex flex-wrap items-baseline gap-x-4 gap-y-1">
        <span>
          <span className="text-4xl font-bold tabular-nums" data-testid="lead-estimate">
            {estimate}
          </span>
          {unit && <span className="ml-1.5 text-lg font-semibold">{unit}</span>}
        </span>
        <span className="tabular-nums" data-testid="lead-interval">
          {interval}
        </span>
      </p>
      {detail && <p className="mt-1 text-sm text-ink-soft">{detail}</p>}
      {plot}
      <section aria-labelledby={`${id}-reading`} className="mt-4">
        <h3 id={`${id}-reading`} className="font-semibold">
          What the numbers say
        </h3>
        <ul className="mt-1 list-disc space-y-1 pl-5">
          {reading.map((t) => (
            <li key={t}>{t}</li>
          ))}
        </ul>
      </section>
    </section>
  );
}
