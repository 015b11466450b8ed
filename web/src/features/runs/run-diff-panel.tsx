import type { Role } from '@ratewarden/shared/domain';
import type { RunDiff, RunSummary } from '@ratewarden/shared/runs';
import { useState } from 'react';
import { QueryState } from '../../components/feedback/query-state';
import { SelectField } from '../../components/form/select-field';
import { ResultTable } from '../../components/table/result-table';
import { formatMonth } from '../../lib/dates';
import { formatCount, formatEstimate } from '../../lib/format';
import { toNumber } from '../../lib/json-number';
import { showCount } from '../../lib/small-cells';
import { useGroups } from '../../api/get-groups';
import { useOutcomes } from '../../api/get-outcomes';
import { useRunDiff } from './api/get-run-diff';

/** One side of a changed cell; a suppressed count hides the rate and ratio computed from it too. */
function side(s: RunDiff['rows'][number]['before'], role: Role | null): string {
  if (!s) return '—';
  const c = showCount(s.cases, role);
  // The server withheld the count (small-cell suppression, or the complement of a small count elsewhere): only the hours are known.
  if (s.suppressed || s.cases === null)
    return `${s.withheld === 'earlier' ? 'earlier run: physician only' : s.withheld === 'small' ? 'suppressed' : 'withheld'} cases, ${formatEstimate(Number(s.hours))} h`;
  if (c.suppressed) return `${c.text} cases, ${formatEstimate(Number(s.hours))} h`;
  return `${formatCount(s.cases)} cases, ${formatEstimate(Number(s.hours))} h, rate ${formatEstimate(toNumber(s.rate))}, IRR ${formatEstimate(toNumber(s.irr))}`;
}

/** What changed between two runs, cell by cell (outcome × group × window × period). */
export function RunDiffPanel({ runs, role }: { runs: RunSummary[]; role: Role | null }) {
  const { data: groups } = useGroups();
  const { data: outcomes } = useOutcomes();
  const gName = (id: number) => groups.find((g) => g.id === id)?.name ?? `group ${id}`;
  const oName = (id: number) => outcomes.find((o) => o.id === id)?.name ?? `outcome ${id}`;
  const [from, setFrom] = useState(runs[1]?.id ?? '');
  const [to, setTo] = useState(runs[0]?.id ?? '');
  const pair = from && to && from !== to ? { from, to } : null;
  const diff = useRunDiff(pair);
  if (runs.length < 2) return <p className="mt-8 text-sm text-ink-soft">Two succeeded runs are needed to compare runs.</p>;
  const options = runs.map((r) => ({ value: r.id, label: `#${r.number} (${new Date(r.startedAt).toLocaleDateString('en-GB')})` }));
  return (
    <section aria-labelledby="diff-heading" className="mt-10">
      <h2 id="diff-heading" className="text-xl font-semibold">
        Difference between two runs
      </h2>
      <div className="no-print mt-3 flex flex-wrap gap-4">
        <SelectField label="Earlier run" value={from} onChange={(e) => setFrom(e.target.value)} options={options} />
        <SelectField label="Later run" value={to} onChange={(e) => setTo(e.target.value)} options={options} />
      </div>
      {pair ? (
        <QueryState query={diff} label="difference">
          {(d) => (
            <>
              <p className="mt-3" role="status">
                {formatCount(d.rows.length)} result cells differ, {formatCount(d.unchangedCount)} are the same.
                {d.settingsChanged && ' The settings or the code version differ between the two runs, so some differences may come from that.'}
              </p>
              <ResultTable
                caption={`Cells that differ between run #${d.from.number} and run #${d.to.number}`}
                columns={['Cell', 'Change', `Run #${d.from.number}`, `Run #${d.to.number}`]}
                exportName={`run-diff-${d.from.number}-${d.to.number}`}
                rows={d.rows.slice(0, 500).map((r) => ({
                  key: `${r.outcomeId}-${r.exposureGroupId}-${r.window}-${r.period}`,
                  cells: [
                    `${oName(r.outcomeId)}, ${gName(r.exposureGroupId)}, ${r.window === 'month' ? 'month' : '12 months to'} ${formatMonth(r.period)}`,
                    r.change,
                    side(r.before, role),
                    side(r.after, role),
                  ],
                  csv: [`${oName(r.outcomeId)} / ${gName(r.exposureGroupId)} / ${r.window} / ${r.period}`, r.change, side(r.before, role), side(r.after, role)],
                }))}
              />
            </>
          )}
        </QueryState>
      ) : (
        <p className="mt-3 text-sm">Choose two different runs.</p>
      )}
    </section>
  );
}
