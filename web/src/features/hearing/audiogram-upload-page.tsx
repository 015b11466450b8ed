import { AUDIOGRAM_COLUMNS } from '@ratewarden/shared/hearing/audiogram-rows';
import { useId, useState } from 'react';
import { z } from 'zod';
import { isApiError } from '../../lib/api-error';
import { formatCount } from '../../lib/format';
import { Cautions } from '../../components/cautions/cautions';
import { useUploadAudiograms } from './api/upload-audiograms';
import { hearingCautions } from './hearing-cautions';

const problemsSchema = z.object({
  problems: z.array(z.object({ line: z.number(), column: z.string().nullable(), value: z.string().nullable(), reason: z.string() })),
  problemCount: z.number(),
});

/**
 * The hygienist's audiogram upload: a CSV or .xlsx in Ratewarden's format, checked whole and
 * stored whole, or refused with every problem by line and column. The answer says how many rows
 * were stored, never what the audiograms show (that is the physician's).
 */
export function AudiogramUploadPage() {
  const [file, setFile] = useState<File | null>(null);
  const [progress, setProgress] = useState(0);
  const upload = useUploadAudiograms();
  const ids = useId();
  const rejected = upload.error && isApiError(upload.error) ? problemsSchema.safeParse(upload.error.problem.details) : null;
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Audiogram upload</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        One row per test and ear. Columns: <code>{AUDIOGRAM_COLUMNS.join(', ')}</code>. Dates as YYYY-MM-DD; ear left or right; test type baseline, annual or
        retest (a retest within 30 days replaces the annual result); hearing levels in dB HL from −10 to 120 in steps of 5, 8000 Hz may be left empty. Workers
        must be known from a roster.{' '}
        <a className="text-accent underline" href="/api/audiograms/template.csv">
          Download a template
        </a>
        .
      </p>
      <p className="mt-1 max-w-3xl text-sm text-ink-soft">
        Standard threshold shifts are derived on upload and go to the occupational physician as suspected cases; they are not shown here.
      </p>
      <form
        className="card mt-4 p-4"
        onSubmit={(e) => {
          e.preventDefault();
          if (!file) return;
          setProgress(0);
          upload.mutate({ file, onProgress: setProgress });
        }}
      >
        <label htmlFor={`${ids}-file`} className="block text-sm font-medium">
          Audiogram file (.csv or .xlsx)
        </label>
        <input
          id={`${ids}-file`}
          type="file"
          accept=".csv,text/csv,.xlsx,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
          className="mt-1"
          onChange={(e) => {
            setFile(e.target.files?.[0] ?? null);
            upload.reset();
          }}
        />
        <div className="mt-4 flex flex-wrap items-center gap-4">
          <button type="submit" disabled={!file || upload.isPending} className="btn btn-primary px-5 py-2">
            {upload.isPending ? 'Uploading …' : 'Upload'}
          </button>
          {upload.isPending && <progress aria-label="Upload progress" max={1} value={progress} className="h-3 w-64" />}
        </div>
      </form>
      <div aria-live="polite">
        {upload.data && (
          <p role="status" className="mt-4 note note-ok px-4 py-3">
            Stored {formatCount(upload.data.rows)} audiogram rows of {formatCount(upload.data.workers)} workers. A run will follow.
          </p>
        )}
        {upload.error && (
          <div role="alert" className="mt-4 note note-alarm px-4 py-3">
            <p>{isApiError(upload.error) ? upload.error.problem.message : String(upload.error)}</p>
            {rejected?.success && (
              <table className="mt-2 text-sm">
                <caption className="text-left">Problems ({formatCount(rejected.data.problemCount)}), by line and column</caption>
                <thead>
                  <tr>
                    <th scope="col" className="pr-4 text-left">
                      Line
                    </th>
                    <th scope="col" className="pr-4 text-left">
                      Column
                    </th>
                    <th scope="col" className="pr-4 text-left">
                      Value
                    </th>
                    <th scope="col" className="text-left">
                      Problem
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {rejected.data.problems.slice(0, 200).map((p, i) => (
                    <tr key={i}>
                      <td className="pr-4 tabular-nums">{p.line}</td>
                      <td className="pr-4">{p.column ?? '—'}</td>
                      <td className="pr-4">{p.value ?? '—'}</td>
                      <td>{p.reason}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            )}
          </div>
        )}
      </div>
      <Cautions extra={hearingCautions} />
    </section>
  );
}
