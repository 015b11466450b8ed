import { closeReasonSchema, type CloseReason, type FlagDetail } from '@ratewarden/shared/flags';
import { useId, useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { useDecideFlag } from './api/decide-flag';
import { closeReasonHints, closeReasonLabels } from './flag-labels';

/**
 * The safety manager's review: start it (with an optional note), then close the flag with one of
 * the three reasons and a comment saying what was found or done. The server checks the role.
 */
export function FlagDecisionForm({ flag }: { flag: FlagDetail }) {
  const decide = useDecideFlag(flag.id);
  const [note, setNote] = useState('');
  const [reason, setReason] = useState<CloseReason | null>(null);
  const [comment, setComment] = useState('');
  const [tried, setTried] = useState(false);
  const noteId = useId();
  const commentId = useId();
  if (flag.state === 'closed') return null;
  const missing = tried && (reason === null || comment.trim() === '');
  return (
    <section aria-labelledby="decide-heading" className="no-print mt-8 card p-4">
      <h2 id="decide-heading" className="text-xl font-semibold">
        Review and close
      </h2>
      {decide.isError && (
        <div className="mt-3">
          <ProblemNotice title="The decision was not saved" problem={problemOf(decide.error).problem} />
        </div>
      )}
      {flag.state === 'raised' && (
        <div className="mt-3 flex flex-wrap items-end gap-3">
          <div className="flex min-w-72 flex-1 flex-col gap-1">
            <label htmlFor={noteId} className="text-sm font-medium">
              Note for the review (optional)
            </label>
            <input id={noteId} value={note} onChange={(e) => setNote(e.target.value)} maxLength={2000} className="field px-2 py-1.5" />
          </div>
          <button
            type="button"
            disabled={decide.isPending}
            onClick={() => decide.mutate({ kind: 'review', comment: note.trim() || undefined })}
            className="btn btn-primary px-4 py-2"
          >
            Start the review
          </button>
        </div>
      )}
      <form
        className="mt-5"
        onSubmit={(e) => {
          e.preventDefault();
          setTried(true);
          if (reason === null || comment.trim() === '') return;
          decide.mutate({ kind: 'close', reason, comment: comment.trim() });
        }}
      >
        <fieldset>
          <legend className="font-medium">Reason for closing</legend>
          <div className="mt-2 grid gap-2 sm:grid-cols-3">
            {closeReasonSchema.options.map((r) => (
              <label key={r} className={`flex cursor-pointer gap-2 border p-2 ${reason === r ? 'border-ink border-l-4' : 'border-line'}`}>
                <input type="radio" name="reason" value={r} checked={reason === r} onChange={() => setReason(r)} className="mt-1" />
                <span>
                  <span className="font-semibold">{closeReasonLabels[r]}</span>
                  <span className="block text-xs text-ink-soft">{closeReasonHints[r]}</span>
                </span>
              </label>
            ))}
          </div>
        </fieldset>
        <div className="mt-3 flex flex-col gap-1">
          <label htmlFor={commentId} className="text-sm font-medium">
            Comment (what was found or done)
          </label>
          <textarea
            id={commentId}
            value={comment}
            onChange={(e) => setComment(e.target.value)}
            rows={3}
            maxLength={4000}
            aria-invalid={missing && comment.trim() === '' ? true : undefined}
            className="field px-2 py-1.5"
          />
        </div>
        {missing && (
          <p role="alert" className="mt-2 text-sm text-alarm">
            <span aria-hidden="true">⚠ </span>Choose a reason and write a comment before closing.
          </p>
        )}
        <button type="submit" disabled={decide.isPending} className="btn btn-primary mt-3 px-4 py-2">
          {decide.isPending ? 'Saving …' : 'Close the flag'}
        </button>
      </form>
    </section>
  );
}
