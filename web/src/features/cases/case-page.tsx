import { Link } from 'react-router';
import { QueryState } from '../../components/feedback/query-state';
import { ScrollRegion } from '../../components/table/scroll-region';
import { paths } from '../../config/paths';
import { formatWhen } from '../../lib/dates';
import { useGroups } from '../../api/get-groups';
import { useSites } from '../../api/get-sites';
import { useCase } from './api/get-case';
import { CaseReviewForm } from './case-review-form';
import { attributionLabels, caseDecisionLabels, caseStatusLabels } from './case-labels';

/**
 * One case: where it stands, how the live run counted it, every version (from case lists and from
 * decisions, who, when and why), the intake it came from, and the physician's decision form.
 */
export function CasePage({ caseRef }: { caseRef: string }) {
  const found = useCase(caseRef);
  const { data: groups } = useGroups();
  const { data: sites } = useSites();
  return (
    <section>
      <p className="text-sm">
        <Link to={paths.cases} className="text-accent underline">
          ← Case register
        </Link>
      </p>
      <h1 className="mt-2 text-2xl font-bold tracking-tight">Case {caseRef}</h1>
      <p className="mt-1 max-w-3xl text-sm text-ink-soft">
        Confidential medical information, shown to the occupational physician only; every opening is recorded.
      </p>
      <QueryState query={found} label="case">
        {(c) => (
          <>
            <dl className="mt-4 grid max-w-3xl grid-cols-[auto_1fr] gap-x-6 gap-y-1">
              <dt className="font-medium">Status</dt>
              <dd>
                {caseStatusLabels[c.status]}
                {c.reviewed ? ' (your decision)' : ' (from the case list)'}
              </dd>
              <dt className="font-medium">Worker (pseudonym)</dt>
              <dd>{c.workerKey}</dd>
              <dt className="font-medium">Outcome and onset</dt>
              <dd>
                {c.outcomeCode}, {c.onsetDate}
              </dd>
              <dt className="font-medium">Exposure group and site</dt>
              <dd>
                {c.exposureGroupId === null
                  ? 'none: no roster row attributes it'
                  : `${groups.find((g) => g.id === c.exposureGroupId)?.name ?? c.exposureGroupId}, ${sites.find((s) => s.id === c.siteId)?.name ?? c.siteId}`}
              </dd>
              <dt className="font-medium">Live run</dt>
              <dd>
                {attributionLabels[c.attribution.state]}
                {c.attribution.reason ? `: ${c.attribution.reason.replaceAll('_', ' ')}` : ''}
              </dd>
              <dt className="font-medium">Came from</dt>
              <dd>
                <Link to={paths.intake(c.intakeId)} className="text-accent underline">
                  {c.intakeFileName}
                </Link>
              </dd>
            </dl>
            <CaseReviewForm detail={c} />
            <ScrollRegion label="Versions of the case">
              <table className="mt-8 w-full border-collapse bg-surface text-sm">
                <caption className="pb-2 text-left text-base font-semibold">Versions, oldest first ({c.history.length})</caption>
                <thead>
                  <tr className="border-b-2 border-ink text-left">
                    <th scope="col" className="px-2 py-1.5">
                      Recorded
                    </th>
                    <th scope="col" className="px-2 py-1.5">
                      Status
                    </th>
                    <th scope="col" className="px-2 py-1.5">
                      Source
                    </th>
                    <th scope="col" className="px-2 py-1.5">
                      Reason
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {c.history.map((v) => (
                    <tr key={v.id} className="border-b border-line align-top">
                      <th scope="row" className="px-2 py-1.5 text-left font-medium">
                        {formatWhen(v.review?.decidedAt ?? v.createdAt)}
                        {v.current ? ' (current)' : ''}
                      </th>
                      <td className="px-2 py-1.5">{caseStatusLabels[v.status]}</td>
                      <td className="px-2 py-1.5">
                        {v.review ? (
                          `${caseDecisionLabels[v.review.decision]}, by ${v.review.decidedBy}`
                        ) : (
                          <>
                            Case list{' '}
                            <Link to={paths.intake(v.intakeId)} className="text-accent underline">
                              {v.intakeFileName}
                            </Link>
                          </>
                        )}
                      </td>
                      <td className="px-2 py-1.5">{v.review?.reason ?? '—'}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollRegion>
          </>
        )}
      </QueryState>
    </section>
  );
}
