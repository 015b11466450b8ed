import type { IntakeKind } from '@ratewarden/shared/intake';
import { hasRoster } from '@ratewarden/shared/periods';
import { intakeDetailSchema } from '@ratewarden/shared/intake-schemas';
import { useId, useRef, useState, type DragEvent } from 'react';
import { Link } from 'react-router';
import { z } from 'zod';
import { paths } from '../../config/paths';
import { isApiError } from '../../lib/api-error';
import { formatCount } from '../../lib/format';
import { formatMonth } from '../../lib/dates';
import { usePeriodCalendar } from '../../api/get-period-calendar';
import { useUploadIntake } from './api/upload-intake';

const rejectedDetails = z.object({ intake: intakeDetailSchema });

/** Drop a CSV or pick one; the bar shows the bytes sent, then the server's verdict. */
export function UploadPanel() {
  const [kind, setKind] = useState<IntakeKind>('roster');
  const [mode, setMode] = useState<'check' | 'apply'>('check');
  const [file, setFile] = useState<File | null>(null);
  const [progress, setProgress] = useState(0);
  const [dragging, setDragging] = useState(false);
  const input = useRef<HTMLInputElement>(null);
  const [reportsThrough, setReportsThrough] = useState('');
  const upload = useUploadIntake();
  const ids = useId();
  const latestRostered = useLatestRosteredMonth(kind === 'cases');

  function choose(f: File | undefined) {
    if (!f) return;
    setFile(f);
    setProgress(0);
    upload.reset();
  }
  function onDrop(e: DragEvent) {
    e.preventDefault();
    setDragging(false);
    choose(e.dataTransfer.files[0]);
  }
  function send() {
    if (!file) return;
    setProgress(0);
    upload.mutate({ file, kind, mode, reportsThrough: reportsThrough || undefined, onProgress: setProgress });
  }

  const rejected = upload.error && isApiError(upload.error) ? rejectedDetails.safeParse(upload.error.problem.details) : null;
  return (
    <section aria-labelledby={`${ids}-h`} className="card p-4">
      <h2 id={`${ids}-h`} className="text-lg font-semibold">
        New intake
      </h2>
      <div className="mt-3 flex flex-wrap gap-6">
        <fieldset>
          <legend className="text-sm font-medium">File holds</legend>
          {(['roster', 'cases'] as const).map((k) => (
            <label key={k} className="mr-4 inline-flex items-center gap-1.5">
              <input type="radio" name={`${ids}-kind`} checked={kind === k} onChange={() => setKind(k)} />
              {k === 'roster' ? 'a roster (hours per worker and month)' : 'a case list'}
            </label>
          ))}
        </fieldset>
        <fieldset>
          <legend className="text-sm font-medium">After checking</legend>
          <label className="mr-4 inline-flex items-center gap-1.5">
            <input type="radio" name={`${ids}-mode`} checked={mode === 'check'} onChange={() => setMode('check')} />
            let me review the changes first
          </label>
          <label className="inline-flex items-center gap-1.5">
            <input type="radio" name={`${ids}-mode`} checked={mode === 'apply'} onChange={() => setMode('apply')} />
            apply at once if it has no problems
          </label>
        </fieldset>
        {kind === 'cases' && (
          <div className="flex max-w-md flex-col gap-1">
            <label htmlFor={`${ids}-through`} className="text-sm font-medium">
              Reports cases through (month)
            </label>
            <input
              id={`${ids}-through`}
              type="month"
              value={reportsThrough}
              onChange={(e) => setReportsThrough(e.target.value)}
              aria-describedby={`${ids}-through-hint`}
              className="w-48 field px-2 py-1"
            />
            <p id={`${ids}-through-hint`} className="text-xs text-ink-soft">
              Every case of your sites up to the end of this month is in the list. Left empty: the later of the list's last onset month and the latest month
              with hours in for your sites
              {latestRostered ? ` (now ${formatMonth(latestRostered)})` : ''}.
            </p>
          </div>
        )}
      </div>
      <div
        onDragOver={(e) => {
          e.preventDefault();
          setDragging(true);
        }}
        onDragLeave={() => setDragging(false)}
        onDrop={onDrop}
        className={`mt-4 border-2 border-dashed px-4 py-6 text-center ${dragging ? 'border-ok bg-accent-soft' : 'border-line'}`}
      >
        <p>
          {file ? (
            <>
              Selected: <strong>{file.name}</strong> ({formatCount(file.size)} bytes)
            </>
          ) : (
            'Drop a CSV file here, or'
          )}
        </p>
        <label className="mt-2 inline-block cursor-pointer text-accent underline">
          {file ? 'choose another file' : 'choose a file'}
          <input ref={input} type="file" accept=".csv,text/csv" className="sr-only" onChange={(e) => choose(e.target.files?.[0])} />
        </label>
      </div>
      <div className="mt-4 flex flex-wrap items-center gap-4">
        <button type="button" disabled={!file || upload.isPending} onClick={send} className="btn btn-primary px-5 py-2">
          {upload.isPending ? 'Uploading …' : 'Upload and check'}
        </button>
        {(upload.isPending || progress > 0) && (
          <div className="flex min-w-64 flex-1 items-center gap-2">
            <progress aria-label="Upload progress" max={1} value={progress} className="h-3 flex-1" />
            <span className="text-sm tabular-nums">{progress >= 1 && upload.isPending ? 'sent; checking …' : `${Math.round(progress * 100)}%`}</span>
          </div>
        )}
      </div>
      <div aria-live="polite">
        {upload.data && (
          <p role="status" className="mt-4 note note-ok px-4 py-3">
            {upload.data.duplicate ? 'This file was taken in before; nothing changed. ' : ''}
            Intake <strong>{upload.data.intake.fileName}</strong> is <strong>{upload.data.intake.state}</strong> ({formatCount(upload.data.intake.rowCount)}{' '}
            rows).{' '}
            <Link className="text-accent underline" to={paths.intake(upload.data.intake.id)}>
              Open the intake
            </Link>
          </p>
        )}
        {upload.error && (
          <div role="alert" className="mt-4 note note-alarm px-4 py-3">
            <p>{isApiError(upload.error) ? upload.error.problem.message : String(upload.error)}</p>
            {rejected?.success && (
              <p className="mt-1">
                <Link className="text-accent underline" to={paths.intake(rejected.data.intake.id)}>
                  See all {formatCount(rejected.data.intake.problemCount)} problems, by line and column
                </Link>
              </p>
            )}
          </div>
        )}
      </div>
    </section>
  );
}

/** The latest month with hours in for the reader's sites (the default month a case list reports through, with its onsets). */
function useLatestRosteredMonth(enabled: boolean): string | null {
  const calendar = usePeriodCalendar({}, enabled);
  const withHours = calendar.data?.periods.filter((p) => hasRoster(p.state)) ?? [];
  return withHours.reduce<string | null>((m, p) => (m === null || p.month > m ? p.month : m), null);
}
