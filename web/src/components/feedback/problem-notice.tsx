import type { Problem } from '@ratewarden/shared/domain';
import type { ReactNode } from 'react';

/** The API's problem `{ code, message }`, worded for people, with the code for whoever they ask. */
export function ProblemNotice({ title, problem, children }: { title: string; problem: Problem; children?: ReactNode }) {
  return (
    <div role="alert" className="note note-alarm px-5 py-4">
      <h2 className="text-lg font-semibold">{title}</h2>
      <p className="mt-1">{problem.message}</p>
      <p className="mt-1 text-sm text-ink-soft">
        Problem code: <code className="font-mono">{problem.code}</code>
      </p>
      {children}
    </div>
  );
}
