import type { Role } from '@ratewarden/shared/domain';
import type { OutcomeDto } from '@ratewarden/shared/groups';
import { roleMay } from '@ratewarden/shared/permissions';
import type { RunDetail } from '@ratewarden/shared/runs';
import type { SplitWithheld } from '@ratewarden/shared/small-cells';
import { unattributedReasonText } from '@ratewarden/shared/unattributed';
import { Link } from 'react-router';
import { paths } from '../../config/paths';
import { showCount } from '../../lib/small-cells';

const countText = (c: { count: number | null; withheld: SplitWithheld | null }, role: Role | null) => showCount(c.count, role, undefined, c.withheld).text;

/**
 * The counted cases of the live run that no roster row attributes, by outcome, with the reasons
 * in words: the run page shows every outcome, a results page its own. Counts come as the API
 * sends them (small ones withheld for everyone but the physician, who gets a link to the cases).
 * Nothing when every case is attributed, or when the reader may not see the company-wide count.
 */
export function UnattributedNote({ run, outcomes, role, outcomeId }: { run: RunDetail | null; outcomes: OutcomeDto[]; role: Role | null; outcomeId?: number }) {
  const items = (run?.unattributed ?? []).filter((u) => (outcomeId === undefined || u.outcomeId === outcomeId) && u.count !== 0);
  if (!run || items.length === 0) return null;
  const name = (id: number) => outcomes.find((o) => o.id === id)?.name ?? `outcome ${id}`;
  return (
    <section aria-label="Cases not attributed" className="mt-3 max-w-3xl note note-watch px-4 py-2 text-sm">
      <ul className="space-y-1">
        {items.map((u) => {
          const reasons = u.reasons.filter((r) => r.count !== 0);
          return (
            <li key={u.outcomeId}>
              <strong>
                {u.withheld && u.withheld !== 'small'
                  ? 'Cases not attributed (count withheld)'
                  : `${countText(u, role)} ${u.count === 1 ? 'case' : 'cases'} not attributed`}
              </strong>
              {outcomeId === undefined && <> ({name(u.outcomeId)})</>}: counted by run #{run.number}, but no roster row attributes{' '}
              {u.count === 1 ? 'it' : 'them'} to an exposure group, so no group's figures include {u.count === 1 ? 'it' : 'them'}.{' '}
              {reasons.some((r) => r.withheld === 'total') ? (
                'Their reasons are withheld with the count.'
              ) : (
                <>
                  Why:{' '}
                  {reasons.map((r, i) => (
                    <span key={r.reason}>
                      {i > 0 && '; '}
                      {unattributedReasonText[r.reason]} ({countText(r, role)})
                    </span>
                  ))}
                  .
                </>
              )}
            </li>
          );
        })}
      </ul>
      {roleMay(role, 'cases:read') && (
        <p className="mt-1">
          <Link className="text-accent underline" to={paths.unattributed}>
            See the unattributed cases
          </Link>
        </p>
      )}
    </section>
  );
}
