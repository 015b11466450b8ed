import type { IntakeColumn } from '@ratewarden/shared/intake-formats';
import { QueryState } from '../../components/feedback/query-state';
import { ResultTable } from '../../components/table/result-table';
import { useIntakeFormats } from './api/get-intake-formats';

const kinds = [
  { kind: 'roster', title: 'Roster', file: 'roster.csv' },
  { kind: 'cases', title: 'Case list', file: 'cases.csv' },
] as const;

/** The rule of a column in words, from the server's own definition (GET /api/intakes/formats). */
function ruleText(c: IntakeColumn): string {
  const r = c.rule as Record<string, unknown>;
  switch (r.type) {
    case 'key':
      return `key, at most ${String(r.maxLength)} characters`;
    case 'code':
      return `code of a ${String(r.ref).replace('_', ' ')}`;
    case 'month':
      return `month YYYY-MM, ${String(r.min)} to ${String(r.max)}`;
    case 'date':
      return `date YYYY-MM-DD, ${String(r.min)} to ${String(r.max)}`;
    case 'decimal':
      return `number ${String(r.min)} to ${String(r.max)}, at most ${String(r.decimals)} decimals`;
    case 'integer':
      return `whole number ${String(r.min)} to ${String(r.max)}`;
    case 'choice':
      return `one of ${(r.values as string[]).join(', ')}`;
    case 'text':
      return `text, at most ${String(r.maxLength)} characters`;
    default:
      return String(r.type);
  }
}

/** The two templates to download and each file's columns with their rules, as the server checks them. */
export function IntakeFormats() {
  const formats = useIntakeFormats();
  return (
    <section aria-labelledby="intake-formats" className="mt-8">
      <h2 id="intake-formats" className="text-xl font-semibold">
        Templates and format rules
      </h2>
      <p className="mt-2 max-w-3xl text-ink-soft">
        CSV files with a header row, one row per worker × month (roster) or per case (case list); headers in any case and order. Download a template:{' '}
        {kinds.map((k, i) => (
          <span key={k.kind}>
            {i > 0 && ' or '}
            <a className="text-accent underline" href={`/api/intakes/templates/${k.file}`} download>
              {k.title.toLowerCase()} template ({k.file})
            </a>
          </span>
        ))}
        .
      </p>
      <QueryState query={formats} label="format rules">
        {(data) => (
          <>
            {kinds.map((k) => (
              <div key={k.kind} className="mt-4">
                <ResultTable
                  caption={`${k.title} columns`}
                  columns={['Column', 'Required', 'Rule', 'Meaning', 'Example']}
                  exportName={`${k.kind}-format`}
                  rows={data[k.kind].map((c) => ({
                    key: c.name,
                    cells: [
                      <code className="font-mono">{c.name}</code>,
                      c.required ? 'required' : 'optional',
                      ruleText(c),
                      c.description,
                      <code className="font-mono">{c.example}</code>,
                    ],
                    csv: [c.name, c.required ? 'required' : 'optional', ruleText(c), c.description, c.example],
                  }))}
                />
              </div>
            ))}
          </>
        )}
      </QueryState>
    </section>
  );
}
