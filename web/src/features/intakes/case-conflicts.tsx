import type { IntakeDetail } from '@ratewarden/shared/intake-schemas';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { QueryState } from '../../components/feedback/query-state';
import { problemOf } from '../../components/feedback/route-error';
import { ScrollRegion } from '../../components/table/scroll-region';
import { formatWhen } from '../../lib/dates';
import { useCaseConflicts, useResolveConflict } from './api/case-conflicts';

const statusWords = { suspected: 'suspected', confirmed: 'confirmed', ruled_out: 'ruled out' } as const;

/**
 * The physician's view of a case list's conflicts with their decisions: for each case, the
 * decision (who, when, why) against the list's status, and the choice to keep the decision or
 * accept the list. The list can be applied once each is decided.
 */
export function CaseConflicts({ intake }: { intake: IntakeDetail }) {
  const conflicts = useCaseConflicts(intake.id);
  const resolve = useResolveConflict(intake.id);
  const open = intake.state === 'checked';
  return (
    <section aria-labelledby="conflicts-heading" className="mt-8 note note-alarm p-4">
      <h2 id="conflicts-heading" className="text-xl font-semibold">
        Conflicts with physicians' decisions
      </h2>
      <p className="mt-1 text-sm text-ink-soft">
        Cases this list gives another status than a physician decided. Nothing is overwritten until you decide each one. Confidential: shown to physicians only,
        and recorded.
      </p>
      {resolve.isError && (
        <div className="mt-3">
          <ProblemNotice title="The choice was not saved" problem={problemOf(resolve.error).problem} />
        </div>
      )}
      <QueryState query={conflicts} label="conflicts">
        {(list) =>
          list.length === 0 ? (
            <p className="mt-2">No case of this list contradicts a decision.</p>
          ) : (
            <ScrollRegion label="Conflicts with decisions">
              <table className="w-full border-collapse bg-surface text-sm">
                <caption className="pb-2 text-left text-base font-semibold">Conflicts ({list.length})</caption>
                <thead>
                  <tr className="border-b-2 border-ink text-left">
                    <th scope="col" className="px-2 py-1.5">
                      Case
                    </th>
                    <th scope="col" className="px-2 py-1.5">
                      Decision
                    </th>
                    <th scope="col" className="px-2 py-1.5">
                      The list says
                    </th>
                    <th scope="col" className="px-2 py-1.5">
                      Your choice
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {list.map((k) => (
                    <tr key={k.caseRef} className="border-b border-line align-top">
                      <th scope="row" className="px-2 py-1.5 text-left font-medium">
                        {k.caseRef}
                        <span className="block text-xs font-normal text-ink-soft">
                          {k.workerKey}, onset {k.onsetDate}
                        </span>
                      </th>
                      <td className="px-2 py-1.5">
                        {statusWords[k.decidedStatus]}
                        <span className="block text-xs text-ink-soft">
                          {k.decision.decidedBy}, {formatWhen(k.decision.decidedAt)}: {k.decision.reason}
                        </span>
                      </td>
                      <td className="px-2 py-1.5">{statusWords[k.listStatus]}</td>
                      <td className="px-2 py-1.5">
                        {k.resolution && <p className="font-medium">{k.resolution === 'keep' ? 'Decision kept' : "List's status accepted"}</p>}
                        {open && (
                          <span className="no-print mt-1 flex flex-wrap gap-2">
                            <button
                              type="button"
                              disabled={resolve.isPending || k.resolution === 'keep'}
                              onClick={() => resolve.mutate({ caseRef: k.caseRef, resolution: 'keep' })}
                              className="btn btn-primary btn-small"
                            >
                              Keep the decision<span className="sr-only"> on {k.caseRef}</span>
                            </button>
                            <button
                              type="button"
                              disabled={resolve.isPending || k.resolution === 'accept'}
                              onClick={() => resolve.mutate({ caseRef: k.caseRef, resolution: 'accept' })}
                              className="btn btn-quiet btn-small"
                            >
                              Accept the list<span className="sr-only"> on {k.caseRef}</span>
                            </button>
                          </span>
                        )}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollRegion>
          )
        }
      </QueryState>
    </section>
  );
}
