import type { ReactNode } from 'react';
import { StatusShape, toneShape, type Tone } from '../../components/status/status-shape';

/**
 * One card of the overview's summary: a count that says what it means. A count of zero is a
 * sentence in the calm tone ("No flags waiting"), never a large alarming 0; a count above zero is
 * the number with its words and its tone's shape. Sits in a <dl>; `children` are further <dd>s.
 */
export interface SummaryCount {
  count: number | undefined;
  failed: boolean;
  /** "No flags waiting for review" */
  none: string;
  /** (n) => "3 flags waiting for review" */
  some: (n: number) => string;
  tone: Tone;
}

export function summaryWords(c: SummaryCount): { text: string; tone: Tone; big: boolean } {
  if (c.failed) return { text: 'Not available just now', tone: 'neutral', big: false };
  if (c.count === undefined) return { text: 'Counting…', tone: 'neutral', big: false };
  if (c.count === 0) return { text: c.none, tone: 'good', big: false };
  return { text: c.some(c.count), tone: c.tone, big: true };
}

export function SummaryCard({ title, summary, children }: { title: string; summary: SummaryCount; children?: ReactNode }) {
  const w = summaryWords(summary);
  return (
    <div className="card px-4 py-3">
      <dt className="text-sm text-ink-soft">{title}</dt>
      <dd className="mt-1 flex items-center gap-2">
        <StatusShape shape={toneShape[w.tone]} tone={w.tone} className="h-3.5 w-3.5" />
        {w.big ? (
          <span>
            <span className="text-2xl font-bold tabular-nums">{summary.count}</span> <span className="font-semibold">{w.text.replace(/^\d+\s*/, '')}</span>
          </span>
        ) : (
          <span className="text-lg font-semibold">{w.text}</span>
        )}
      </dd>
      {children}
    </div>
  );
}
