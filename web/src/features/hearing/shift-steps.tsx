import { STS_FREQUENCIES } from '@ratewarden/shared/hearing/audiogram';
import type { EarHistory, HistoryStep } from '@ratewarden/shared/hearing/audiometric-history';
import { RECORDABLE_HEARING_LEVEL_DB, STS_AVERAGE_CHANGE_DB } from '@ratewarden/shared/hearing/standard-threshold-shift';

const dB = (v: number) => `${Number.isInteger(v) ? v : v.toFixed(1)} dB`;

const outcomeWords = {
  shift: 'Standard threshold shift: a suspected case for your review',
  'persistent-shift': 'The shift is seen again: persistent; this test becomes the baseline (1910.95(g)(9)(i))',
  'no-shift': 'No standard threshold shift',
  improvement: 'Markedly better than the baseline: this test becomes the baseline (1910.95(g)(9)(ii); 5 dB average, common practice)',
} as const;

function Step({ step }: { step: HistoryStep }) {
  switch (step.kind) {
    case 'baseline':
      return (
        <p>
          {step.testDate}: baseline test, taken as the baseline ({step.reason}).
        </p>
      );
    case 'no-baseline':
      return <p>{step.testDate}: no baseline test before it; not compared.</p>;
    case 'retest-replaces':
      return <p>{step.testDate}: retest within 30 days, taken as the annual test it follows (1910.95(g)(7)(ii)).</p>;
    case 'retest-unused':
      return <p>{step.testDate}: retest with no annual test in the 30 days before it; not used.</p>;
    case 'baseline-revised':
      return (
        <p>
          {step.testDate}: baseline revised to this test ({step.reason}).
        </p>
      );
    case 'compared': {
      const c = step.computation;
      return (
        <div>
          <p className="font-medium">
            {step.testDate} against the baseline of {step.baselineDate}: {outcomeWords[step.outcome]}
          </p>
          <table className="mt-1 text-sm">
            <caption className="sr-only">
              Computation of {step.testDate} against {step.baselineDate}
            </caption>
            <thead>
              <tr>
                <th scope="col" className="pr-4 text-left">
                  Hz
                </th>
                <th scope="col" className="pr-4 text-right">
                  Baseline
                </th>
                <th scope="col" className="pr-4 text-right">
                  This test
                </th>
                <th scope="col" className="pr-4 text-right">
                  Age correction
                </th>
                <th scope="col" className="text-right">
                  Change
                </th>
              </tr>
            </thead>
            <tbody>
              {STS_FREQUENCIES.map((f) => (
                <tr key={f}>
                  <th scope="row" className="pr-4 text-left font-normal">
                    {f}
                  </th>
                  <td className="pr-4 text-right tabular-nums">{c.baseline[f]}</td>
                  <td className="pr-4 text-right tabular-nums">{c.recent[f]}</td>
                  <td className="pr-4 text-right tabular-nums">{c.correction[f]}</td>
                  <td className="text-right tabular-nums">{c.change[f]}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="text-sm">
            Average change {dB(c.averageChange)} (a shift at {STS_AVERAGE_CHANGE_DB} dB or more). Average hearing level of this test, as measured,{' '}
            {dB(c.recentAverage)}:{' '}
            {c.recordable
              ? `recordable (${RECORDABLE_HEARING_LEVEL_DB} dB or more in the same ear, 29 CFR 1904.10)`
              : c.shift
                ? `below ${RECORDABLE_HEARING_LEVEL_DB} dB: not recordable under 1904.10`
                : 'no shift'}
            .
          </p>
          <p className="text-sm text-ink-soft">
            {step.ageCorrection.applied
              ? `Age correction of Appendix F, Table ${step.ageCorrection.table}, ages ${step.ageCorrection.baselineAge} and ${step.ageCorrection.recentAge}.`
              : `No age correction: ${step.ageCorrection.reason}.`}
          </p>
        </div>
      );
    }
  }
}

/** Every step of one ear's reading, in order, with the figures behind each verdict. */
export function ShiftSteps({ history }: { history: EarHistory }) {
  return (
    <ol className="mt-2 space-y-3">
      {history.steps.map((s, i) => (
        <li key={i} className="card p-3">
          <Step step={s} />
        </li>
      ))}
    </ol>
  );
}
