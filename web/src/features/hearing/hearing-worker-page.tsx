import { Link } from 'react-router';
import { Cautions } from '../../components/cautions/cautions';
import { paths } from '../../config/paths';
import { useHearingWorker } from './api/get-hearing-worker';
import { AudiogramChart } from './audiogram-chart';
import { hearingCautions } from './hearing-cautions';
import { ShiftSteps } from './shift-steps';

/**
 * The physician's page of one worker's hearing: the audiograms over time per ear as a chart (and
 * table), the baseline in use, and each comparison with its computation; the suspected cases the
 * shifts became. The server answers the physician only and records each opening.
 */
export function HearingWorkerPage({ workerKey }: { workerKey: string }) {
  const { data } = useHearingWorker(workerKey);
  return (
    <section>
      <p className="text-sm">
        <Link to={paths.hearing} className="text-accent underline">
          ← Workers with audiograms
        </Link>
      </p>
      <h1 className="mt-2 text-2xl font-bold tracking-tight">Audiograms of {data.workerKey}</h1>
      <p className="mt-1 text-sm text-ink-soft">
        Sex {data.sex ?? 'not recorded'}, born {data.birthYear ?? 'year not recorded'}. Age correction (29 CFR 1910.95 Appendix F) is{' '}
        {data.settings.ageCorrection ? 'on' : 'off'} in the settings. Confidential medical information, shown to the occupational physician only; every opening
        of this page is recorded.
      </p>
      {data.ears.map((h) => {
        const tests = data.audiograms.filter((a) => a.ear === h.ear);
        const baseline = tests.find((t) => t.id === h.baselineId);
        return (
          <section key={h.ear} aria-labelledby={`ear-${h.ear}`} className="mt-6">
            <h2 id={`ear-${h.ear}`} className="text-xl font-semibold">
              {h.ear === 'left' ? 'Left ear' : 'Right ear'}
            </h2>
            <p className="mt-1">
              Baseline in use: {baseline ? `${baseline.testDate} (${baseline.testType})` : 'none yet'}. Shifts found: {h.shifts.length}.
            </p>
            {tests.length > 0 && <AudiogramChart ear={h.ear} tests={tests} baselineId={h.baselineId} />}
            <h3 className="mt-4 font-semibold">How each test was read</h3>
            <ShiftSteps history={h} />
          </section>
        );
      })}
      <section aria-labelledby="sts-cases" className="mt-6">
        <h2 id="sts-cases" className="text-xl font-semibold">
          Cases from these shifts
        </h2>
        {data.cases.length === 0 ? (
          <p className="mt-1">None.</p>
        ) : (
          <ul className="mt-1 list-disc pl-6">
            {data.cases.map((c) => (
              <li key={c.caseRef}>
                {c.caseRef}, onset {c.onsetDate}: {c.status}
              </li>
            ))}
          </ul>
        )}
      </section>
      <Cautions extra={hearingCautions} />
    </section>
  );
}
