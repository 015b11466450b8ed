import { ResultTable } from '../../components/table/result-table';
import { formatWhen } from '../../lib/dates';
import { useMailbox } from './api/get-mailbox';

/**
 * What the development mail server received, headers only: the administrator checks here that
 * notices go out; their text (counts for the physician) is for their recipients.
 */
export function MailboxPage() {
  const { data: messages } = useMailbox();
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Development mailbox</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        The local mail server keeps every message the worker sends, so delivery can be checked without a real mail system. It shows who was written to, when and
        about what; the text of a threshold notice is for its recipient only. It does not exist in production.
      </p>
      <ResultTable
        caption={`Messages (${messages.length}, newest first)`}
        columns={['Received', 'From', 'To', 'Subject']}
        exportName="mailbox"
        rows={messages.map((m) => ({
          key: m.id,
          cells: [formatWhen(m.receivedAt), m.from ?? 'unknown', m.to.join(', '), m.subject ?? '(no subject)'],
          csv: [m.receivedAt, m.from, m.to.join('; '), m.subject],
        }))}
      />
    </section>
  );
}
