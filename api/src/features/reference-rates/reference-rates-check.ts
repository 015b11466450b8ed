import { parse } from 'csv-parse/sync';
import { cellJudge } from '@ratewarden/shared/intake-cell';
import { reasons } from '@ratewarden/shared/intake-columns';
import type { IntakeProblem } from '@ratewarden/shared/intake-schemas';
import { referenceRateColumns, referenceReasons, type ReferenceRateColumn } from '@ratewarden/shared/reference-rates';

/** A row of the reference-rate file that passed its checks. */
export interface CheckedRate {
  outcomeId: number;
  sex: 'F' | 'M';
  ageFrom: number;
  ageTo: number;
  year: number;
  rate: number;
  source: string;
}

export interface CheckedFile {
  rows: CheckedRate[];
  problems: IntakeProblem[];
}

/**
 * Checks a whole reference-rate file (small: a few thousand rows, read in memory): the header,
 * each cell by its column's rule (the intake's own cell judge and words), outcome codes against
 * the outcomes set up, then the table's own rules: age_to ≥ age_from, and no two bands of one
 * outcome × sex × year overlapping. Lines are the file's, the header being line 1. The file is
 * taken whole or not at all: any problem rejects it.
 */
export function checkReferenceFile(text: string, outcomeIds: ReadonlyMap<string, number>): CheckedFile {
  const problems: IntakeProblem[] = [];
  let records: Array<{ record: string[]; info: { lines: number } }>;
  try {
    records = parse(text, { bom: true, skip_empty_lines: true, relax_column_count: true, info: true, trim: false }) as unknown as Array<{
      record: string[];
      info: { lines: number };
    }>;
  } catch (err) {
    const line = (err as { lines?: number }).lines ?? null;
    return { rows: [], problems: [{ line, column: null, value: null, reason: `the file is not readable CSV: ${(err as Error).message}` }] };
  }
  const head = records.shift();
  if (!head) return { rows: [], problems: [{ line: null, column: null, value: null, reason: referenceReasons.noRows }] };
  const header = head.record.map((h) => h.trim().toLowerCase());
  const index = new Map<string, number>();
  header.forEach((h, i) => {
    if (!referenceRateColumns.some((c) => c.name === h))
      problems.push({ line: 1, column: h, value: null, reason: `unknown column ${h}; the columns are ${referenceRateColumns.map((c) => c.name).join(', ')}` });
    else if (index.has(h)) problems.push({ line: 1, column: h, value: null, reason: `column ${h} appears twice` });
    else index.set(h, i);
  });
  for (const c of referenceRateColumns) if (!index.has(c.name)) problems.push({ line: 1, column: c.name, value: null, reason: `column ${c.name} is missing` });
  if (problems.length) return { rows: [], problems };
  if (records.length === 0) return { rows: [], problems: [{ line: null, column: null, value: null, reason: referenceReasons.noRows }] };

  const judges = referenceRateColumns.map((c) => [c.name, cellJudge(c)] as const);
  const rows: Array<CheckedRate & { line: number }> = [];
  for (const { record, info } of records) {
    const line = info.lines;
    const v = {} as Record<ReferenceRateColumn, string | number | null>;
    let ok = true;
    for (const [name, judge] of judges) {
      const raw = record[index.get(name)!] ?? '';
      const verdict = judge(raw);
      if (verdict.reason) {
        problems.push({ line, column: name, value: raw, reason: verdict.reason });
        ok = false;
      }
      v[name] = verdict.value;
    }
    if (!ok) continue;
    const outcomeId = outcomeIds.get(String(v.outcome));
    if (outcomeId === undefined) {
      problems.push({ line, column: 'outcome', value: String(v.outcome), reason: reasons.unknownCode('outcome', 'outcome') });
      continue;
    }
    if ((v.age_to as number) < (v.age_from as number)) {
      problems.push({ line, column: 'age_to', value: String(v.age_to), reason: referenceReasons.bandReversed });
      continue;
    }
    rows.push({
      line,
      outcomeId,
      sex: v.sex as 'F' | 'M',
      ageFrom: v.age_from as number,
      ageTo: v.age_to as number,
      year: v.year as number,
      rate: v.rate_per_person_year as number,
      source: String(v.source),
    });
  }
  problems.push(...overlaps(rows));
  problems.sort((a, b) => (a.line ?? 0) - (b.line ?? 0));
  return { rows: problems.length ? [] : rows.map(({ line: _line, ...r }) => r), problems };
}

/** Bands of one outcome × sex × year that overlap (a band repeated included): the later line is named. */
function overlaps(rows: Array<CheckedRate & { line: number }>): IntakeProblem[] {
  const groups = new Map<string, Array<CheckedRate & { line: number }>>();
  for (const r of rows) {
    const key = `${r.outcomeId}:${r.sex}:${r.year}`;
    const g = groups.get(key);
    if (g) g.push(r);
    else groups.set(key, [r]);
  }
  const problems: IntakeProblem[] = [];
  const named = new Set<number>();
  for (const g of groups.values()) {
    g.sort((a, b) => a.ageFrom - b.ageFrom || a.line - b.line);
    // `reach`: the band reaching highest so far; a band starting at or below its top overlaps it.
    let reach = g[0]!;
    for (const cur of g.slice(1)) {
      if (cur.ageFrom <= reach.ageTo) {
        const later = cur.line > reach.line ? cur : reach;
        if (!named.has(later.line)) problems.push({ line: later.line, column: 'age_from', value: String(later.ageFrom), reason: referenceReasons.bandOverlap });
        named.add(later.line);
      }
      if (cur.ageTo > reach.ageTo) reach = cur;
    }
  }
  return problems;
}
