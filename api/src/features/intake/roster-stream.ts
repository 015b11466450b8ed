import { isUtf8 } from 'node:buffer';
import { Transform, type TransformCallback } from 'node:stream';
import { cellJudge } from '@ratewarden/shared/intake-cell';
import { reasons, rosterColumns, type ColumnDef } from '@ratewarden/shared/intake-columns';
import type { IntakeProblem } from '@ratewarden/shared/intake-schemas';
import { unreadable } from './copy-stage';
import { PROBLEMS_LISTED } from './problems';

/** Columns of a roster's typed staging table, in the order the stream writes them. */
export const ROSTER_STAGE_COLUMNS = ['line_no', 'worker_key', 'site_id', 'group_id', 'month', 'hours', 'birth_year', 'sex', 'job_title'] as const;

/** Known codes, upper case, with their ids and stored spelling. */
export type CodeMap = Map<string, { id: number; code: string }>;

export interface WorkerTally { byMin: number; byMax: number; sexMin: string; sexMax: string; last: number }
export interface SliceTally { siteId: number; siteCode: string; month: string; n: number; cents: number }

/**
 * Beyond these many distinct workers (or site × months) the stream stops keeping its tallies and
 * the SQL fallback computes them from the staged rows, so memory stays bounded whatever the file.
 */
export const WORKER_TALLY_LIMIT = 300_000;
export const SLICE_TALLY_LIMIT = 50_000;
/** A row longer than this is not a roster row (and would otherwise be held whole in memory). */
const MAX_ROW_CHARS = 1024 * 1024;
/** Distinct values remembered per low-variety column (codes, months, hours, years, sex). */
const VERDICT_CACHE = 8192;

interface Judged {
  reason: string | null;
  /** The cell in COPY text format (`\N` for none). */
  cell: string;
  /** Code id, month index (year × 12 + month), hours in hundredths or year; NaN when none. */
  num: number;
}

interface Slot {
  def: ColumnDef;
  /** Field position in the file, -1 when the column is absent (optional columns only). */
  pos: number;
  judge: (raw: string) => Judged;
  cache: Map<string, Judged> | null;
}

const NONE: Judged = { reason: null, cell: '\\N', num: NaN };

/** COPY text format: backslash, tab, newline and carriage return are written as escapes. */
function copyText(s: string): string {
  return /[\\\t\n\r]/.test(s) ? s.replace(/[\\\t\n\r]/g, (c) => (c === '\\' ? '\\\\' : c === '\t' ? '\\t' : c === '\n' ? '\\n' : '\\r')) : s;
}

/** A copy that does not keep the chunk it was sliced from alive (V8 sliced strings do). */
const own = (s: string) => Buffer.from(s, 'utf8').toString('utf8');

function slotJudge(def: ColumnDef, codes: { site: CodeMap; exposure_group: CodeMap }): (raw: string) => Judged {
  const judge = cellJudge(def);
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
        return { reason: null, cell: `${v.text}-01`, num: Number(v.text.slice(0, 4)) * 12 + Number(v.text.slice(5, 7)) - 1 };
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

/**
 * The roster's hot path: reads the upload's data rows (after the header) as they arrive, splits
 * them into fields (RFC 4180 quoting, comma or semicolon), judges every cell by the shared column
 * rules (`cellJudge`, the same as the zod schemas), resolves site and group codes to ids, and writes
 * typed rows in COPY text format for the staging table. Along the way it keeps what the set-wise
 * checks need (per worker: birth years, sexes, whether months only increase; per site × month: rows
 * and hours), so SQL only runs the checks that need stored data. A row that cannot be read at all
 * (encoding, field count, quotes) stops the stream with that line, as COPY would.
 */
export class RosterStream extends Transform {
  rows = 0;
  problemCount = 0;
  /** The first problems in file order; with `problemCount` all are counted. */
  readonly problems: IntakeProblem[] = [];
  readonly workers = new Map<string, WorkerTally>();
  readonly slices = new Map<number, SliceTally>();
  /** False once a worker's months do not strictly increase: the SQL duplicate check must run. */
  monthsIncrease = true;
  /** True once a tally outgrew its limit: the SQL fallback computes workers and slices. */
  overflow = false;
  readonly siteIds = new Set<number>();
  readonly groupIds = new Set<number>();

  private readonly slots: Slot[];
  private readonly at: Record<string, Slot>;
  private readonly ncols: number;
  private readonly eolByte: number;
  private carry: Buffer = Buffer.alloc(0);
  private pending = '';
  private line: number;
  private readonly sitesById: Map<number, string>;

  constructor(columns: string[], private readonly delimiter: ',' | ';', private readonly eol: '\n' | '\r', codes: { site: CodeMap; exposure_group: CodeMap }, firstLine = 2) {
    super();
    this.ncols = columns.length;
    this.eolByte = eol.charCodeAt(0);
    this.line = firstLine;
    const cached = new Set(['site', 'exposure_group', 'month', 'hours', 'birth_year', 'sex']);
    this.slots = rosterColumns.map((def) => ({ def, pos: columns.indexOf(def.name), judge: slotJudge(def, codes), cache: cached.has(def.name) ? new Map() : null }));
    this.at = Object.fromEntries(this.slots.map((s) => [s.def.name, s]));
    this.sitesById = new Map([...codes.site.values()].map((s) => [s.id, s.code.toUpperCase()]));
  }

  override _transform(chunk: Buffer, _enc: BufferEncoding, done: TransformCallback): void {
    try {
      const buf = this.carry.length ? Buffer.concat([this.carry, chunk]) : chunk;
      const cut = buf.lastIndexOf(this.eolByte);
      if (cut < 0) {
        this.carry = buf;
        if (buf.length + this.pending.length > MAX_ROW_CHARS) throw unreadable(`a row is too long to be a roster row (line ${this.line})`, this.line);
        done();
        return;
      }
      this.carry = Buffer.from(buf.subarray(cut + 1));
      const out = this.parse(this.decode(buf.subarray(0, cut + 1)), false);
      done(null, out || undefined);
    } catch (err) {
      done(err as Error);
    }
  }

  override _flush(done: TransformCallback): void {
    try {
      const out = this.parse(this.carry.length ? this.decode(this.carry) : '', true);
      done(null, out || undefined);
    } catch (err) {
      done(err as Error);
    }
  }

  /** UTF-8 text of whole lines; a zero byte or a broken sequence names its line. */
  private decode(bytes: Buffer): string {
    const zero = bytes.indexOf(0);
    if (zero >= 0) {
      const line = this.lineOf(bytes, zero);
      throw unreadable(`the file holds binary data (a zero byte) (line ${line}), not CSV text`, line);
    }
    if (!isUtf8(bytes)) {
      let from = 0;
      let line = this.line;
      for (;;) {
        const next = bytes.indexOf(this.eolByte, from);
        const end = next < 0 ? bytes.length : next + 1;
        if (!isUtf8(bytes.subarray(from, end))) break;
        from = end;
        line++;
      }
      throw unreadable(`the file is not UTF-8 text (line ${line}); save it as CSV UTF-8 and upload it again`, line);
    }
    return bytes.toString('utf8');
  }

  private lineOf(bytes: Buffer, index: number): number {
    let line = this.line;
    for (let i = bytes.indexOf(this.eolByte); i >= 0 && i < index; i = bytes.indexOf(this.eolByte, i + 1)) line++;
    return line;
  }

  /** Splits complete records off `text`; an unfinished quoted record waits for the next chunk. */
  private parse(text: string, final: boolean): string {
    const s = this.pending ? this.pending + text : text;
    this.pending = '';
    const out: string[] = [];
    const eol = this.eol;
    const d = this.delimiter;
    let pos = 0;
    while (pos < s.length) {
      const nl = s.indexOf(eol, pos);
      const end = nl < 0 ? s.length : nl;
      let line = s.slice(pos, end);
      if (line.indexOf('"') < 0) {
        if (eol === '\n' && line.charCodeAt(line.length - 1) === 13) line = line.slice(0, -1);
        out.push(this.row(line.split(d), this.line));
        this.line++;
        pos = end + 1;
        continue;
      }
      const rec = this.quoted(s, pos, final);
      if (!rec) {
        if (final) throw unreadable(`a quoted value is never closed (line ${this.line})`, this.line);
        this.pending = s.slice(pos);
        if (this.pending.length > MAX_ROW_CHARS) throw unreadable(`a row is too long to be a roster row (line ${this.line})`, this.line);
        break;
      }
      out.push(this.row(rec.fields, this.line));
      this.line += rec.lines;
      pos = rec.next;
    }
    return out.join('');
  }

  /** One record with quoted fields, starting at `pos`; null when it does not end within `s`. */
  private quoted(s: string, pos: number, final: boolean): { fields: string[]; next: number; lines: number } | null {
    const eol = this.eol;
    const d = this.delimiter;
    const fields: string[] = [];
    let lines = 1;
    let i = pos;
    for (;;) {
      let value = '';
      if (s[i] === '"') {
        i++;
        for (;;) {
          const q = s.indexOf('"', i);
          if (q < 0) return null;
          value += s.slice(i, q);
          if (s[q + 1] === '"') {
            value += '"';
            i = q + 2;
          } else {
            i = q + 1;
            break;
          }
        }
        for (let k = value.indexOf(eol); k >= 0; k = value.indexOf(eol, k + 1)) lines++;
      }
      // Unquoted text, or what follows a closing quote, up to the next separator or line end.
      let j = i;
      while (j < s.length && s[j] !== d && s[j] !== eol) j++;
      if (j === s.length && !final) return null;
      let tail = s.slice(i, j);
      if (s[j] !== d && eol === '\n' && tail.charCodeAt(tail.length - 1) === 13) tail = tail.slice(0, -1);
      fields.push(value + tail);
      if (s[j] === d) {
        i = j + 1;
        continue;
      }
      return { fields, next: j + 1, lines };
    }
  }

  private judged(slot: Slot, fields: string[]): Judged {
    if (slot.pos < 0) return NONE;
    const raw = fields[slot.pos]!;
    const cache = slot.cache;
    if (cache) {
      const hit = cache.get(raw);
      if (hit !== undefined) return hit;
      if (cache.size >= VERDICT_CACHE) return slot.judge(raw);
      // Judged from a private copy, so what the cache keeps refers to no chunk of the upload.
      const mine = own(raw);
      const j = slot.judge(mine);
      cache.set(mine, j);
      return j;
    }
    return slot.judge(raw);
  }

  private problem(line: number, slot: Slot, fields: string[], reason: string): void {
    this.problemCount++;
    if (this.problems.length < PROBLEMS_LISTED) {
      const raw = fields[slot.pos]!;
      this.problems.push({ line, column: slot.def.name, value: raw === '' ? null : own(raw.slice(0, 200)), reason });
    }
  }

  /** One data row: judged, tallied, and returned as a line of COPY text. */
  private row(fields: string[], line: number): string {
    if (fields.length !== this.ncols) {
      throw unreadable(
        fields.length < this.ncols
          ? `the row has fewer fields than the header (line ${line}); an empty line also counts`
          : `the row has more fields than the header (line ${line}); is a value with a separator not in quotes?`,
        line,
      );
    }
    this.rows++;
    const a = this.at;
    const key = this.judged(a.worker_key!, fields);
    const site = this.judged(a.site!, fields);
    const group = this.judged(a.exposure_group!, fields);
    const month = this.judged(a.month!, fields);
    const hours = this.judged(a.hours!, fields);
    const by = this.judged(a.birth_year!, fields);
    const sex = this.judged(a.sex!, fields);
    const job = this.judged(a.job_title!, fields);
    if (key.reason || site.reason || group.reason || month.reason || hours.reason || by.reason || sex.reason || job.reason) {
      const list: Array<[Slot, Judged]> = [[a.worker_key!, key], [a.site!, site], [a.exposure_group!, group], [a.month!, month], [a.hours!, hours], [a.birth_year!, by], [a.sex!, sex], [a.job_title!, job]];
      for (const [slot, j] of list) if (j.reason) this.problem(line, slot, fields, j.reason);
    }
    if (!this.overflow) this.tally(key, site, month, hours, by, sex);
    if (!Number.isNaN(site.num)) this.siteIds.add(site.num);
    if (!Number.isNaN(group.num)) this.groupIds.add(group.num);
    return `${line}\t${key.cell}\t${site.cell}\t${group.cell}\t${month.cell}\t${hours.cell}\t${by.cell}\t${sex.cell}\t${job.cell}\n`;
  }

  private tally(key: Judged, site: Judged, month: Judged, hours: Judged, by: Judged, sex: Judged): void {
    if (key.cell !== '\\N') {
      const t = this.workers.get(key.cell);
      const year = by.num;
      const sx = sex.cell === '\\N' ? '' : sex.cell;
      if (t) {
        if (!Number.isNaN(year)) {
          if (Number.isNaN(t.byMin) || year < t.byMin) t.byMin = year;
          if (Number.isNaN(t.byMax) || year > t.byMax) t.byMax = year;
        }
        if (sx) {
          if (!t.sexMin || sx < t.sexMin) t.sexMin = sx;
          if (!t.sexMax || sx > t.sexMax) t.sexMax = sx;
        }
        if (!Number.isNaN(month.num)) {
          if (month.num <= t.last) this.monthsIncrease = false;
          else t.last = month.num;
        }
      } else if (this.workers.size >= WORKER_TALLY_LIMIT) {
        this.giveUpTallies();
        return;
      } else {
        this.workers.set(own(key.cell), { byMin: year, byMax: year, sexMin: sx, sexMax: sx, last: Number.isNaN(month.num) ? -1 : month.num });
      }
    }
    if (!Number.isNaN(site.num) && !Number.isNaN(month.num)) {
      const k = site.num * 200_000 + month.num;
      const sl = this.slices.get(k);
      if (sl) {
        sl.n++;
        if (!Number.isNaN(hours.num)) sl.cents += hours.num;
      } else if (this.slices.size >= SLICE_TALLY_LIMIT) {
        this.giveUpTallies();
      } else {
        this.slices.set(k, { siteId: site.num, siteCode: this.sitesById.get(site.num)!, month: month.cell.slice(0, 7), n: 1, cents: Number.isNaN(hours.num) ? 0 : hours.num });
      }
    }
  }

  private giveUpTallies(): void {
    this.overflow = true;
    this.workers.clear();
    this.slices.clear();
  }
}
