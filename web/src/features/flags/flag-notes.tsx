import { useId, useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { QueryState } from '../../components/feedback/query-state';
import { problemOf } from '../../components/feedback/route-error';
import { formatWhen } from '../../lib/dates';
import { useAddFlagNote, useFlagNotes } from './api/flag-notes';

/** The physicians' clinical notes on a flag, oldest first, kept as written, and a new one (the server checks the role). */
export function FlagNotes({ flagId }: { flagId: string }) {
  const notes = useFlagNotes(flagId);
  const add = useAddFlagNote(flagId);
  const [text, setText] = useState('');
  const [tried, setTried] = useState(false);
  const textId = useId();
  const errorId = useId();
  const missing = tried && text.trim() === '';
  return (
    <section aria-labelledby="notes-heading" className="mt-8 note note-alarm p-4">
      <h2 id="notes-heading" className="text-xl font-semibold">
        Clinical notes
      </h2>
      <p className="mt-1 text-sm text-ink-soft">Seen by physicians only and kept with the flag as written; every opening is recorded.</p>
      <QueryState query={notes} label="clinical notes">
        {(list) =>
          list.length === 0 ? (
            <p className="mt-2">No note yet.</p>
          ) : (
            <ol className="mt-2 space-y-2">
              {list.map((n) => (
                <li key={n.id} className="card p-2">
                  <p className="whitespace-pre-wrap">{n.text}</p>
                  <p className="mt-1 text-xs text-ink-soft">
                    {n.author}, {formatWhen(n.createdAt)}
                  </p>
                </li>
              ))}
            </ol>
          )
        }
      </QueryState>
      {add.isError && (
        <div className="mt-3">
          <ProblemNotice title="The note was not saved" problem={problemOf(add.error).problem} />
        </div>
      )}
      <form
        className="no-print mt-3"
        onSubmit={(e) => {
          e.preventDefault();
          setTried(true);
          if (text.trim() === '') return;
          add.mutate(text.trim(), {
            onSuccess: () => {
              setText('');
              setTried(false);
            },
          });
        }}
      >
        <label htmlFor={textId} className="text-sm font-medium">
          New note
        </label>
        <textarea
          id={textId}
          value={text}
          onChange={(e) => setText(e.target.value)}
          rows={3}
          maxLength={4000}
          aria-invalid={missing ? true : undefined}
          aria-describedby={missing ? errorId : undefined}
          className="field mt-1 block w-full px-2 py-1.5"
        />
        {missing && (
          <p id={errorId} role="alert" className="mt-1 text-sm text-alarm">
            <span aria-hidden="true">⚠ </span>Write the note first.
          </p>
        )}
        <button type="submit" disabled={add.isPending} className="btn btn-primary mt-2 px-4 py-2">
          {add.isPending ? 'Saving …' : 'Add the note'}
        </button>
      </form>
    </section>
  );
}
