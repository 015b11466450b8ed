import { useId, useState } from 'react';
import { z } from 'zod';
import { referenceRateColumns, referenceTableSchema } from '@ratewarden/shared/reference-rates';
import { isApiError } from '../../lib/api-error';
import { formatCount } from '../../lib/format';
import { useUploadReferenceRates } from './api/upload-reference-rates';

const rejectedDetails = z.object({ table: referenceTableSchema });

/**
 * The hygienist's upload of a reference-rate table: the format and its template beside the file
 * choice; a rejected file lists its problems by line and column (nothing of it is kept).
 */
export function ReferenceUploadPanel() {
  const [file, setFile] = useState<File | null>(null);
  const [progress, setProgress] = useState(0);
  const upload = useUploadReferenceRates();
  const ids = useId();
  const rejected = upload.error && isApiError(upload.error) ? rejectedDetails.safeParse(upload.error.problem.details) : null;
  return (
    <section aria-labelledby={`${ids}-h`} className="no-print card mt-6 p-4">
      <h2 id={`${ids}-h`} className="text-lg font-semibold">
        Upload reference rates
      </h2>
      <p className="mt-1 max-w-3xl text-sm text-ink-soft">
        A CSV file, one row per outcome, sex, age band and calendar year, with the rate in cases per person-year and its source. The whole table is checked and
        replaces the current one (which is kept in the history); a file with any problem is refused whole. The next run uses it.{' '}
        <a className="text-accent underline" href="/api/reference-rates/template.csv" download>
          Download the template
        </a>
      </p>
      <details className="mt-2 text-sm">
        <summary className="cursor-pointer text-accent underline">Format rules</summary>
        <dl className="mt-2 grid max-w-3xl grid-cols-[max-content_1fr] gap-x-4 gap-y-1">
          {referenceRateColumns.map((c) => (
            <div key={c.name} className="contents">
              <dt className="font-mono">{c.name}</dt>
              <dd>{c.description}</dd>
            </div>
          ))}
        </dl>
      </details>
      <form
        className="mt-3 flex flex-wrap items-end gap-4"
        onSubmit={(e) => {
          e.preventDefault();
          if (!file) return;
          setProgress(0);
          upload.mutate({ file, onProgress: setProgress });
        }}
      >
        <div className="flex flex-col gap-1">
          <label htmlFor={`${ids}-file`} className="text-sm font-medium">
            Reference-rate file (CSV)
          </label>
          <input
            id={`${ids}-file`}
            type="file"
            accept=".csv,text/csv"
            onChange={(e) => {
              setFile(e.target.files?.[0] ?? null);
              upload.reset();
            }}
          />
        </div>
        <button type="submit" disabled={!file || upload.isPending} className="btn btn-primary px-5 py-2">
          {upload.isPending ? 'Uploading …' : 'Upload reference rates'}
        </button>
        {upload.isPending && <progress aria-label="Upload progress" max={1} value={progress} className="h-3 w-48" />}
      </form>
      <div aria-live="polite">
        {upload.data && (
          <p role="status" className="mt-4 note note-ok px-4 py-3">
            {upload.data.duplicate ? 'This table is already the current one; nothing changed. ' : 'Reference rates applied: '}
            version <strong>{upload.data.table.version}</strong>, {formatCount(upload.data.table.rowCount)} rates. The next run computes the SIRs with them.
          </p>
        )}
        {upload.error && (
          <div role="alert" className="mt-4 note note-alarm px-4 py-3">
            <p>{isApiError(upload.error) ? upload.error.problem.message : String(upload.error)}</p>
            {rejected?.success && rejected.data.table.problems.length > 0 && (
              <table className="mt-2 text-sm">
                <caption className="text-left font-medium">Problems by line and column</caption>
                <thead>
                  <tr>
                    <th scope="col" className="px-2 text-left">
                      Line
                    </th>
                    <th scope="col" className="px-2 text-left">
                      Column
                    </th>
                    <th scope="col" className="px-2 text-left">
                      Value
                    </th>
                    <th scope="col" className="px-2 text-left">
                      Problem
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {rejected.data.table.problems.slice(0, 50).map((p, i) => (
                    <tr key={i}>
                      <td className="px-2 tabular-nums">{p.line ?? '—'}</td>
                      <td className="px-2">{p.column ?? '—'}</td>
                      <td className="px-2">{p.value ?? ''}</td>
                      <td className="px-2">{p.reason}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            )}
          </div>
        )}
      </div>
    </section>
  );
}
