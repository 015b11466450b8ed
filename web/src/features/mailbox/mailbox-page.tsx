import { useState } from 'react';
import { QueryState } from '../../components/feedback/query-state';
import { ResultTable } from '../../components/table/result-table';
import { formatWhen } from '../../lib/dates';
import { useMailbox, useMailboxMessage } from './api/get-mailbox';

/** What the development mail server received: threshold notices as their recipients would read them. */
export function MailboxPage() {
  const { data: messages } = useMailbox();
  const [open, setOpen] = useState<string | null>(null);
  const message = useMailboxMessage(open);
  return (
    <section>
      <h1 className="text-3xl font-bold tracking-tight">Development mailbox</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">The local mail server keeps every message the worker sends, so threshold notices can be read without a real mail system. It does not exist in production.</p>
      <ResultTable
        caption={`Messages (${messages.length}, newest first)`}
        columns={['Received', 'To', 'Subject', '']}
        exportName="mailbox"
        rows={messages.map((m) => ({
          key: m.id,
          cells: [
            formatWhen(m.receivedAt),
            m.to.join(', '),
            m.subject ?? '(no subject)',
            <button type="button" className="text-moss underline" aria-expanded={open === m.id} onClick={() => setOpen(open === m.id ? null : m.id)}>
              {open === m.id ? 'Close' : 'Read'}<span className="sr-only"> {m.subject}</span>
            </button>,
          ],
          csv: [m.receivedAt, m.to.join('; '), m.subject, ''],
        }))}
      />
      {open && (
        <article aria-label="Message" className="mt-6 border border-rule bg-panel p-4">
          <QueryState query={message} label="message">
            {(m) => (
              <>
                <h2 className="text-lg font-semibold">{m.subject}</h2>
                <p className="text-sm text-ink-soft">From {m.from ?? 'unknown'} to {m.to.join(', ')}, {formatWhen(m.receivedAt)}</p>
                <pre className="mt-3 whitespace-pre-wrap font-sans text-sm">{m.text ?? m.raw}</pre>
              </>
            )}
          </QueryState>
        </article>
      )}
    </section>
  );
}
