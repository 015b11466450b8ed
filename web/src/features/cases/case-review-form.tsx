import type { CaseDecision, CaseDetail } from '@ratewarden/shared/cases';
import { useId, useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { useReviewCase } from './api/review-case';
import { caseDecisionLabels, caseStatusLabels, decisionsFor } from './case-labels';

/**
 * The physician's decision on a case: confirm, rule out or reopen, always with a reason. The
 * decision becomes the case's next version and asks for a run; the server checks the role.
 */
export function CaseReviewForm({ detail }: { detail: CaseDetail }) {
  const review = useReviewCase(detail.caseRef);
  const choices = decisionsFor(detail.status);
  const [decision, setDecision] = useState<CaseDecision | null>(null);
  const [reason, setReason] = useState('');
  const [tried, setTried] = useState(false);
  const [done, setDone] = useState<string | null>(null);
  const reasonId = useId();
  const errorId = useId();
  const missing = tried && (decision === null || reason.trim().length < 3);
  return (
    <section aria-labelledby="review-heading" className="no-print mt-8 card p-4">
      <h2 id="review-heading" className="text-xl font-semibold">
        Your decision
      </h2>
      <p className="mt-1 text-sm text-ink-soft">
        Now {caseStatusLabels[detail.status].toLowerCase()}. A decision is kept as a new version of the case, with your name, the time and your reason; a run is
        requested so the figures follow it.
      </p>
      <div aria-live="polite">
        {done && (
          <p role="status" className="mt-3 note note-ok px-4 py-2">
            {done}
          </p>
        )}
      </div>
      {review.isError && (
        <div className="mt-3">
          <ProblemNotice title="The decision was not saved" problem={problemOf(review.error).problem} />
        </div>
      )}
      <form
        className="mt-3"
        onSubmit={(e) => {
          e.preventDefault();
          setTried(true);
          if (decision === null || reason.trim().length < 3) return;
          review.mutate(
            { decision, reason: reason.trim() },
            {
              onSuccess: (r) => {
                setDone(`Saved: the case is now ${caseStatusLabels[r.case.status].toLowerCase()}. A run is requested; the next run counts it so.`);
                setDecision(null);
                setReason('');
                setTried(false);
              },
            },
          );
        }}
      >
        <fieldset>
          <legend className="font-medium">Decision</legend>
          <div className="mt-2 flex flex-wrap gap-3">
            {choices.map((d) => (
              <label key={d} className={`flex cursor-pointer gap-2 border p-2 ${decision === d ? 'border-ink border-l-4' : 'border-line'}`}>
                <input type="radio" name="decision" value={d} checked={decision === d} onChange={() => setDecision(d)} />
                {caseDecisionLabels[d]}
              </label>
            ))}
          </div>
        </fieldset>
        <div className="mt-3 flex flex-col gap-1">
          <label htmlFor={reasonId} className="text-sm font-medium">
            Reason (kept with the case, seen by physicians only)
          </label>
          <textarea
            id={reasonId}
            value={reason}
            onChange={(e) => setReason(e.target.value)}
            rows={3}
            maxLength={2000}
            aria-invalid={missing ? true : undefined}
            aria-describedby={missing ? errorId : undefined}
            className="field px-2 py-1.5"
          />
        </div>
        {missing && (
          <p id={errorId} role="alert" className="mt-2 text-sm text-alarm">
            <span aria-hidden="true">⚠ </span>Choose a decision and give a reason of a few words.
          </p>
        )}
        <button type="submit" disabled={review.isPending} className="btn btn-primary mt-3 px-4 py-2">
          {review.isPending ? 'Saving …' : 'Save the decision'}
        </button>
      </form>
    </section>
  );
}
