import type { CaseSummary } from '@ratewarden/shared/cases';
import { caseStatusSchema } from '@ratewarden/shared/intake';
import { createColumnHelper } from '@tanstack/react-table';
import { useState, type FormEvent } from 'react';
import { Link, useSearchParams } from 'react-router';
import { QueryState } from '../../components/feedback/query-state';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { SelectField } from '../../components/form/select-field';
import { TextField } from '../../components/form/text-field';
import { DataTable } from '../../components/table/data-table';
import { paths } from '../../config/paths';
import { toCsv } from '@ratewarden/shared/csv';
import { downloadCsv } from '../../lib/csv';
import { useGroups } from '../../api/get-groups';
import { useOutcomes } from '../../api/get-outcomes';
import { useSites } from '../../api/get-sites';
import { exportCases } from './api/export-cases';
import type { CaseFilters } from './api/case-keys';
import { useCases } from './api/get-cases';
import { attributionLabels, caseStatusLabels } from './case-labels';

type Row = CaseSummary & { outcome: string; group: string; site: string; statusText: string; counted: string };
const col = createColumnHelper<Row>();
const columns = [
  col.accessor('caseRef', {
    header: 'Case',
    cell: (c) => (
      <Link to={paths.case(c.getValue())} className="text-accent underline">
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor('workerKey', { header: 'Worker (pseudonym)' }),
  col.accessor('outcome', { header: 'Outcome' }),
  col.accessor('onsetDate', { header: 'Onset' }),
  col.accessor('statusText', { header: 'Status', cell: (c) => `${c.getValue()}${c.row.original.reviewed ? ' (physician)' : ''}` }),
  col.accessor('group', { header: 'Exposure group' }),
  col.accessor('site', { header: 'Site' }),
  col.accessor('counted', { header: 'Live run' }),
  col.accessor('versions', { header: 'Versions', meta: { numeric: true } }),
  col.accessor('intakeFileName', {
    header: 'From intake',
    cell: (c) => (
      <Link to={paths.intake(c.row.original.intakeId)} className="text-accent underline">
        {c.getValue()}
      </Link>
    ),
  }),
];

const FILTER_KEYS = ['q', 'outcomeId', 'exposureGroupId', 'siteId', 'status', 'from', 'to'] as const;

/**
 * The physician's case register: every current case with its outcome, exposure group, site,
 * status, versions, the intake it came from and how the live run counted it; filtered through
 * the URL, searchable by case reference or worker key. Every read and export is recorded.
 */
export function CasesPage() {
  const [params, setParams] = useSearchParams();
  const filters: CaseFilters = Object.fromEntries(FILTER_KEYS.map((k) => [k, params.get(k) ?? undefined]).filter(([, v]) => v)) as CaseFilters;
  const cases = useCases(filters);
  const { data: outcomes } = useOutcomes();
  const { data: groups } = useGroups();
  const { data: sites } = useSites();
  const [draft, setDraft] = useState<Record<string, string>>(() => Object.fromEntries(FILTER_KEYS.map((k) => [k, params.get(k) ?? ''])));
  const [exportError, setExportError] = useState<unknown>(null);
  const set = (k: string) => (e: { target: { value: string } }) => setDraft((d) => ({ ...d, [k]: e.target.value }));
  const apply = (e: FormEvent) => {
    e.preventDefault();
    setParams(
      new URLSearchParams(
        Object.entries(draft)
          .filter(([, v]) => v.trim() !== '')
          .map(([k, v]) => [k, v.trim()]),
      ),
    );
  };
  const toRows = (list: CaseSummary[]): Row[] =>
    list.map((c) => ({
      ...c,
      outcome: outcomes.find((o) => o.id === c.outcomeId)?.name ?? c.outcomeCode,
      group: c.exposureGroupId === null ? '—' : (groups.find((g) => g.id === c.exposureGroupId)?.name ?? String(c.exposureGroupId)),
      site: c.siteId === null ? '—' : (sites.find((s) => s.id === c.siteId)?.name ?? String(c.siteId)),
      statusText: caseStatusLabels[c.status],
      counted: attributionLabels[c.attribution.state],
    }));
  const onExport = async () => {
    setExportError(null);
    try {
      const rows = toRows(await exportCases(filters));
      downloadCsv(
        'ratewarden-cases',
        toCsv(
          ['case', 'worker', 'outcome', 'onset', 'status', 'decided by physician', 'exposure group', 'site', 'live run', 'versions', 'intake'],
          rows.map((r) => [
            r.caseRef,
            r.workerKey,
            r.outcomeCode,
            r.onsetDate,
            r.status,
            r.reviewed ? 'yes' : 'no',
            r.group,
            r.site,
            r.attribution.state,
            r.versions,
            r.intakeFileName,
          ]),
        ),
      );
    } catch (e) {
      setExportError(e);
    }
  };
  const option = (list: Array<{ id: number; name: string }>, all: string) => [
    { value: '', label: all },
    ...list.map((x) => ({ value: String(x.id), label: x.name })),
  ];
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Case register</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        Every case as it stands: the latest case list's status or your decision, the exposure group and site it is attributed to (the worker's roster in the
        onset month, moved back by the outcome's lag), and whether the live run counted it. Open a case to see its versions and to confirm, rule out or reopen
        it.
      </p>
      <p className="mt-1 max-w-3xl text-sm text-ink-soft">
        Confidential medical information, shown to the occupational physician only; every opening and export of this register is recorded.
      </p>
      <form onSubmit={apply} className="no-print mt-4 grid gap-3 sm:grid-cols-4" aria-label="Filter the cases">
        <TextField label="Case reference or worker key" value={draft.q} onChange={set('q')} maxLength={100} />
        <SelectField label="Outcome" value={draft.outcomeId} onChange={set('outcomeId')} options={option(outcomes, 'All outcomes')} />
        <SelectField label="Exposure group" value={draft.exposureGroupId} onChange={set('exposureGroupId')} options={option(groups, 'All groups')} />
        <SelectField label="Site" value={draft.siteId} onChange={set('siteId')} options={option(sites, 'All sites')} />
        <SelectField
          label="Status"
          value={draft.status}
          onChange={set('status')}
          options={[{ value: '', label: 'Any status' }, ...caseStatusSchema.options.map((s) => ({ value: s, label: caseStatusLabels[s] }))]}
        />
        <TextField label="Onset from (month)" type="month" value={draft.from} onChange={set('from')} />
        <TextField label="Onset to (month)" type="month" value={draft.to} onChange={set('to')} />
        <div className="flex items-end">
          <button type="submit" className="btn btn-primary px-4 py-2">
            Show cases
          </button>
        </div>
      </form>
      {exportError !== null && (
        <div className="mt-3">
          <ProblemNotice title="The export failed" problem={problemOf(exportError).problem} />
        </div>
      )}
      <QueryState query={cases} label="cases">
        {(data) => (
          <DataTable
            caption={`Cases (${data.length})`}
            columns={columns}
            data={toRows(data)}
            exportName="ratewarden-cases"
            rowHeader="caseRef"
            onExport={() => void onExport()}
          />
        )}
      </QueryState>
    </section>
  );
}
