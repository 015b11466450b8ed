import { formatCount } from '../../lib/format';
import { formatWhen } from '../../lib/dates';
import { useReferenceTables } from './api/get-reference-tables';

/** Every reference-rate version, newest first: applied, superseded (kept) or rejected. */
export function ReferenceHistory() {
  const { data } = useReferenceTables();
  if (!data?.length) return null;
  return (
    <section aria-labelledby="reference-history-h" className="mt-6">
      <h2 id="reference-history-h" className="text-lg font-semibold">
        Reference-rate versions
      </h2>
      <table className="mt-2 text-sm">
        <thead>
          <tr className="border-b border-ink text-left">
            <th scope="col" className="px-2 py-1">
              Version
            </th>
            <th scope="col" className="px-2 py-1">
              State
            </th>
            <th scope="col" className="px-2 py-1">
              File
            </th>
            <th scope="col" className="px-2 py-1">
              Rates
            </th>
            <th scope="col" className="px-2 py-1">
              Years
            </th>
            <th scope="col" className="px-2 py-1">
              Source
            </th>
            <th scope="col" className="px-2 py-1">
              Uploaded
            </th>
          </tr>
        </thead>
        <tbody>
          {data.map((t) => (
            <tr key={t.id} className="border-b border-line">
              <th scope="row" className="px-2 py-1 text-left font-medium">
                {t.version}
              </th>
              <td className="px-2 py-1">
                {t.state}
                {t.state === 'rejected' ? ` (${formatCount(t.problemCount)} problems)` : ''}
              </td>
              <td className="px-2 py-1">{t.fileName}</td>
              <td className="px-2 py-1 tabular-nums">{formatCount(t.rowCount)}</td>
              <td className="px-2 py-1 tabular-nums">{t.yearFrom === null ? '—' : t.yearFrom === t.yearTo ? t.yearFrom : `${t.yearFrom}–${t.yearTo}`}</td>
              <td className="px-2 py-1">{t.sources.join('; ') || '—'}</td>
              <td className="px-2 py-1">
                {formatWhen(t.createdAt)}
                {t.uploadedBy ? ` by ${t.uploadedBy}` : ''}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
