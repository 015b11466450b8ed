import { cellJudge, type CellBounds } from '@ratewarden/shared/intake-cell';
import { reasons, type ColumnDef } from '@ratewarden/shared/intake-columns';
import { monthIndex } from '@ratewarden/shared/months';
import type { WorkerTally } from './roster-tallies';

/** Known codes, upper case, with their ids and stored spelling. */
export type CodeMap = Map<string, { id: number; code: string }>;

/** Distinct values remembered per low-variety column (codes, months, hours, years, sex). */
export const VERDICT_CACHE = 8192;
/** Worker keys: a roster sorted by worker meets each key in a run of rows; one sorted by month, every key each month. */
export const KEY_CACHE = 65536;

export interface Judged {
  reason: string | null;
  /** The cell in COPY text format (`\N` for none). */
  cell: string;
  /** Code id, month index (year × 12 + month), hours in hundredths or year; NaN when none. */
  num: number;
}

export interface Slot {
  def: ColumnDef;
  /** Field position in the file, -1 when the column is absent (optional columns only). */
  pos: number;
  judge: (raw: string) => Judged;
  /** Direct-mapped cache of verdicts by a hash of the raw bytes (FNV-1a), checked byte for byte on a hit. */
  cache: Array<Entry | undefined>;
  mask: number;
}

export const NONE: Judged = { reason: null, cell: '\\N', num: NaN };
export const NULL_CELL = Buffer.from('\\N');

/** A cached verdict, with the raw bytes it was given and its COPY text as bytes. */
export interface Entry {
  raw: Buffer;
  text: string;
  j: Judged;
  out: Buffer;
  /** For worker keys: the worker's tally, once looked up. */
  tally: WorkerTally | null;
}

/** COPY text format: backslash, tab, newline and carriage return are written as escapes. */
export function copyText(s: string): string {
  return /[\\\t\n\r]/.test(s) ? s.replace(/[\\\t\n\r]/g, (c) => (c === '\\' ? '\\\\' : c === '\t' ? '\\t' : c === '\n' ? '\\n' : '\\r')) : s;
}

/** A copy that does not keep the chunk it was sliced from alive (V8 sliced strings do). */
export const own = (s: string) => Buffer.from(s, 'utf8').toString('utf8');

export function slotJudge(def: ColumnDef, codes: { site: CodeMap; exposure_group: CodeMap }, bounds: CellBounds): (raw: string) => Judged {
  const judge = cellJudge(def, bounds);
  const rule = def.rule;
  return (raw) => {
    const v = judge(raw);
    if (v.reason) return { reason: v.reason, cell: '\\N', num: NaN };
    if (v.text === null) return NONE;
    switch (rule.type) {
      case 'code': {
        const known = rule.ref === 'outcome' ? undefined : codes[rule.ref].get(v.text);
        if (!known) return { reason: reasons.unknownCode(def.name, rule.ref), cell: '\\N', num: NaN };
        return { reason: null, cell: String(known.id), num: known.id };
      }
      case 'month':
        return { reason: null, cell: `${v.text}-01`, num: monthIndex(v.text) };
      case 'decimal':
        return { reason: null, cell: v.text, num: Math.round((v.value as number) * 100) };
      case 'integer':
        return { reason: null, cell: v.text, num: v.value as number };
      case 'key':
        // The key's pattern admits no character that COPY text would need escaped.
        return { reason: null, cell: v.text, num: NaN };
      default:
        return { reason: null, cell: copyText(v.text), num: NaN };
    }
  };
}

/** The verdict on the field `b[s, e)` of a slot's column, from the column's cache when seen before. */
export function cachedVerdict(slot: Slot, b: Buffer, s: number, e: number): Entry {
  let h = 0x811c9dc5;
  for (let i = s; i < e; i++) h = Math.imul(h ^ b[i]!, 16777619);
  const cache = slot.cache;
  const at = h & slot.mask;
  const hit = cache[at];
  if (hit !== undefined && hit.raw.length === e - s) {
    let same = true;
    for (let i = s, k = 0; i < e; i++, k++) {
      if (hit.raw[k] !== b[i]) {
        same = false;
        break;
      }
    }
    if (same) return hit;
  }
  const text = b.toString('utf8', s, e);
  const j = slot.judge(text);
  const entry: Entry = { raw: Buffer.from(b.subarray(s, e)), text, j, out: Buffer.from(j.cell), tally: null };
  cache[at] = entry;
  return entry;
}
