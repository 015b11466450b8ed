import { isUtf8 } from 'node:buffer';
import { Transform, type TransformCallback } from 'node:stream';
import { cellJudge, NO_BOUNDS, type CellBounds } from '@ratewarden/shared/intake-cell';
import { reasons, rosterColumns, type ColumnDef } from '@ratewarden/shared/intake-columns';
import type { IntakeProblem } from '@ratewarden/shared/intake-schemas';
import { monthIndex } from '@ratewarden/shared/months';
import { unreadable } from './copy-errors';
import { PROBLEMS_LISTED } from './problems';

/** Columns of a roster's typed staging table, in the order the stream writes them. */
export const ROSTER_STAGE_COLUMNS = ['line_no', 'worker_key', 'site_id', 'group_id', 'month', 'hours', 'birth_year', 'sex', 'job_title'] as const;

/** Known codes, upper case, with their ids and stored spelling. */
export type CodeMap = Map<string, { id: number; code: string }>;

export interface WorkerTally {
  byMin: number;
  byMax: number;
  sexMin: string;
  sexMax: string;
  last: number;
}
export interface SliceTally {
  siteId: number;
  siteCode: string;
  month: string;
  n: number;
  cents: number;
}

/**
 * Beyond these many distinct workers (or site × months) the stream stops keeping its tallies and
 * the SQL fallback computes them from the staged rows, so memory stays bounded whatever the file.
 */
export const WORKER_TALLY_LIMIT = 300_000;
export const SLICE_TALLY_LIMIT = 50_000;

/** The limits of the in-memory tallies (tests lower them to reach the SQL fallback with a few rows). */
export interface TallyLimits {
  workers: number;
  slices: number;
}
export const DEFAULT_TALLY_LIMITS: TallyLimits = { workers: WORKER_TALLY_LIMIT, slices: SLICE_TALLY_LIMIT };
/** A row longer than this is not a roster row (and would otherwise be held whole in memory). */
const MAX_ROW_CHARS = 1024 * 1024;
/** Distinct values remembered per low-variety column (codes, months, hours, years, sex). */
const VERDICT_CACHE = 8192;
/** Worker keys: a roster sorted by worker meets each key in a run of rows; one sorted by month, every key each month. */
const KEY_CACHE = 65536;

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
  /** Direct-mapped cache of verdicts by a hash of the raw bytes (FNV-1a), checked byte for byte on a hit. */
  cache: Array<Entry | undefined>;
  mask: number;
}

const NONE: Judged = { reason: null, cell: '\\N', num: NaN };
const NULL_CELL = Buffer.from('\\N');

/** A cached verdict, with the raw bytes it was given and its COPY text as bytes. */
interface Entry {
  raw: Buffer;
  text: string;
  j: Judged;
  out: Buffer;
  /** For worker keys: the worker's tally, once looked up. */
  tally: WorkerTally | null;
}

/** COPY text format: backslash, tab, newline and carriage return are written as escapes. */
function copyText(s: string): string {
  return /[\\\t\n\r]/.test(s) ? s.replace(/[\\\t\n\r]/g, (c) => (c === '\\' ? '\\\\' : c === '\t' ? '\\t' : c === '\n' ? '\\n' : '\\r')) : s;
}

/** A copy that does not keep the chunk it was sliced from alive (V8 sliced strings do). */
const own = (s: string) => Buffer.from(s, 'utf8').toString('utf8');

function slotJudge(def: ColumnDef, codes: { site: CodeMap; exposure_group: CodeMap }, bounds: CellBounds): (raw: string) => Judged {
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
  /** Slot of each field position in the file. */
  private readonly byPos: Slot[];
  private readonly ncols: number;
  private readonly eolByte: number;
  private readonly delimByte: number;
  private carry: Buffer = Buffer.alloc(0);
  private line: number;
  private readonly sitesById: Map<number, string>;
  private readonly starts: Int32Array;
  private readonly ends: Int32Array;
  private out = Buffer.allocUnsafe(0);
  private len = 0;

  constructor(
    columns: string[],
    private readonly delimiter: ',' | ';',
    private readonly eol: '\n' | '\r',
    codes: { site: CodeMap; exposure_group: CodeMap },
    firstLine = 2,
    private readonly limits: TallyLimits = DEFAULT_TALLY_LIMITS,
    bounds: CellBounds = NO_BOUNDS,
  ) {
    super();
    this.ncols = columns.length;
    this.eolByte = eol.charCodeAt(0);
    this.delimByte = delimiter.charCodeAt(0);
    this.line = firstLine;
    this.slots = rosterColumns.map((def) => {
      const size = def.name === 'worker_key' ? KEY_CACHE : VERDICT_CACHE;
      return { def, pos: columns.indexOf(def.name), judge: slotJudge(def, codes, bounds), cache: new Array<Entry | undefined>(size), mask: size - 1 };
    });
    this.at = Object.fromEntries(this.slots.map((s) => [s.def.name, s]));
    this.byPos = columns.map((c) => this.at[c]!);
    this.sitesById = new Map([...codes.site.values()].map((s) => [s.id, s.code.toUpperCase()]));
    this.starts = new Int32Array(this.ncols + 1);
    this.ends = new Int32Array(this.ncols + 1);
  }

  override _transform(chunk: Buffer, _enc: BufferEncoding, done: TransformCallback): void {
    try {
      const buf = this.carry.length ? Buffer.concat([this.carry, chunk]) : chunk;
      const cut = buf.lastIndexOf(this.eolByte);
      if (cut < 0) {
        this.carry = buf;
        if (buf.length > MAX_ROW_CHARS) throw unreadable(`a row is too long to be a roster row (line ${this.line})`, this.line);
        done();
        return;
      }
      this.check(buf.subarray(0, cut + 1));
      const stop = this.parse(buf, cut + 1, false);
      // What is left: the bytes after the last line end, or a quoted record not closed yet.
      this.carry = Buffer.from(buf.subarray(stop));
      if (this.carry.length > MAX_ROW_CHARS) throw unreadable(`a row is too long to be a roster row (line ${this.line})`, this.line);
      done(null, this.pendingOut());
    } catch (err) {
      done(err as Error);
    }
  }

  override _flush(done: TransformCallback): void {
    try {
      const buf = this.carry;
      this.check(buf);
      this.parse(buf, buf.length, true);
      done(null, this.pendingOut());
    } catch (err) {
      done(err as Error);
    }
  }

  /** The COPY text written since the last call (undefined when none). */
  private pendingOut(): Buffer | undefined {
    if (this.len === 0) return undefined;
    const b = this.out.subarray(0, this.len);
    this.out = Buffer.allocUnsafe(0);
    this.len = 0;
    return b;
  }

  private room(n: number): void {
    if (this.len + n <= this.out.length) return;
    const next = Buffer.allocUnsafe(Math.max(this.out.length * 2, this.len + n, 256 * 1024));
    this.out.copy(next, 0, 0, this.len);
    this.out = next;
  }

  private put(src: Buffer, s: number, e: number): void {
    const out = this.out;
    let o = this.len;
    if (e - s > 32) {
      src.copy(out, o, s, e);
      this.len = o + e - s;
      return;
    }
    for (let i = s; i < e; i++) out[o++] = src[i]!;
    this.len = o;
  }

  private putInt(n: number): void {
    const out = this.out;
    let o = this.len;
    if (n >= 10) {
      const digits = Math.floor(Math.log10(n)) + 1;
      let k = o + digits;
      this.len = k;
      for (; n > 0; n = Math.floor(n / 10)) out[--k] = 48 + (n % 10);
      return;
    }
    out[o++] = 48 + n;
    this.len = o;
  }

  private putStr(str: string): void {
    this.room(Buffer.byteLength(str) + 1);
    this.len += this.out.write(str, this.len);
  }

  /** Whole lines must be UTF-8 text without zero bytes; a breach names its line. */
  private check(bytes: Buffer): void {
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
        if (!isUtf8(bytes.subarray(from, end)) || end >= bytes.length) break;
        from = end;
        line++;
      }
      throw unreadable(`the file is not UTF-8 text (line ${line}); save it as CSV UTF-8 and upload it again`, line);
    }
  }

  private lineOf(bytes: Buffer, index: number): number {
    let line = this.line;
    for (let i = bytes.indexOf(this.eolByte); i >= 0 && i < index; i = bytes.indexOf(this.eolByte, i + 1)) line++;
    return line;
  }

  /**
   * Handles the records in `b[0, limit)`; returns where it stopped: `limit`, or the start of a
   * quoted record that continues beyond it. Records without a quote are split byte by byte
   * (the common case, no strings made but for the worker key); quoted ones go through `quoted`.
   */
  private parse(b: Buffer, limit: number, final: boolean): number {
    const eolByte = this.eolByte;
    const d = this.delimByte;
    const crlf = this.eol === '\n';
    const starts = this.starts;
    const ends = this.ends;
    const ncols = this.ncols;
    let quote = b.indexOf(34);
    let pos = 0;
    while (pos < limit) {
      let end = b.indexOf(eolByte, pos);
      if (end < 0 || end > limit) end = limit;
      const next = end + 1;
      if (quote >= 0 && quote < end) {
        const text = b.toString('utf8', pos, final ? limit : b.length);
        const rec = this.quoted(text, 0, final);
        if (!rec) {
          if (final) throw unreadable(`a quoted value is never closed (line ${this.line})`, this.line);
          return pos;
        }
        this.room(Buffer.byteLength(text.slice(0, rec.next)) * 2 + 64);
        this.fieldsRow(rec.fields, this.line);
        this.line += rec.lines;
        pos += Buffer.byteLength(text.slice(0, rec.next));
        quote = b.indexOf(34, pos);
        continue;
      }
      let e = end;
      if (crlf && e > pos && b[e - 1] === 13) e--;
      let n = 0;
      starts[0] = pos;
      for (let i = pos; i < e; i++) {
        if (b[i] === d) {
          if (n >= ncols) break;
          ends[n++] = i;
          starts[n] = i + 1;
        }
      }
      ends[n++] = e;
      if (n !== ncols) this.fieldCount(n, this.line);
      this.room((e - pos) * 2 + 64);
      this.bytesRow(b, this.line);
      this.line++;
      pos = next;
    }
    return limit;
  }

  private fieldCount(n: number, line: number): never {
    throw unreadable(
      n < this.ncols
        ? `the row has fewer fields than the header (line ${line}); an empty line also counts`
        : `the row has more fields than the header (line ${line}); is a value with a separator not in quotes?`,
      line,
    );
  }

  /** The verdict on field `f` of the current byte row, from the column's cache when seen before. */
  private byteJudged(slot: Slot, b: Buffer): Entry {
    const s = this.starts[slot.pos]!;
    const e = this.ends[slot.pos]!;
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

  private problemAt(line: number, column: string, raw: string, reason: string): void {
    this.problemCount++;
    if (this.problems.length < PROBLEMS_LISTED) this.problems.push({ line, column, value: raw === '' ? null : own(raw.slice(0, 200)), reason });
  }

  /** One unquoted data row, fields located in `starts`/`ends`: judged, tallied, written as COPY text. */
  private bytesRow(b: Buffer, line: number): void {
    this.rows++;
    const a = this.at;
    const key = this.byteJudged(a.worker_key!, b);
    const site = this.byteJudged(a.site!, b);
    const group = this.byteJudged(a.exposure_group!, b);
    const month = this.byteJudged(a.month!, b);
    const hours = this.byteJudged(a.hours!, b);
    const by = this.byteJudged(a.birth_year!, b);
    const sex = this.byteJudged(a.sex!, b);
    const job = a.job_title!.pos < 0 ? null : this.byteJudged(a.job_title!, b);
    if (key.j.reason || site.j.reason || group.j.reason || month.j.reason || hours.j.reason || by.j.reason || sex.j.reason || job?.j.reason) {
      const all: Array<[string, Entry | null]> = [
        ['worker_key', key],
        ['site', site],
        ['exposure_group', group],
        ['month', month],
        ['hours', hours],
        ['birth_year', by],
        ['sex', sex],
        ['job_title', job],
      ];
      for (const [column, x] of all) if (x?.j.reason) this.problemAt(line, column, x.text, x.j.reason);
    }
    if (!this.overflow) {
      if (key.tally) this.tallyWorker(key.tally, month.j, by.j, sex.j);
      else key.tally = this.tally(key.j, site.j, month.j, hours.j, by.j, sex.j, true);
      if (!this.overflow) this.tallySlice(site.j, month.j, hours.j);
    }
    if (site.j.num === site.j.num) this.siteIds.add(site.j.num);
    if (group.j.num === group.j.num) this.groupIds.add(group.j.num);

    this.putInt(line);
    const out = this.out;
    out[this.len++] = 9;
    this.put(key.out, 0, key.out.length);
    out[this.len++] = 9;
    this.put(site.out, 0, site.out.length);
    out[this.len++] = 9;
    this.put(group.out, 0, group.out.length);
    out[this.len++] = 9;
    this.put(month.out, 0, month.out.length);
    out[this.len++] = 9;
    this.put(hours.out, 0, hours.out.length);
    out[this.len++] = 9;
    this.put(by.out, 0, by.out.length);
    out[this.len++] = 9;
    this.put(sex.out, 0, sex.out.length);
    out[this.len++] = 9;
    if (job) this.put(job.out, 0, job.out.length);
    else this.put(NULL_CELL, 0, 2);
    out[this.len++] = 10;
  }

  /** One quoted record, as strings: the same judging and output as `bytesRow`. */
  private fieldsRow(fields: string[], line: number): void {
    if (fields.length !== this.ncols) this.fieldCount(fields.length, line);
    this.rows++;
    const j: Record<string, Judged> = {};
    for (const slot of this.slots) {
      const raw = slot.pos < 0 ? null : fields[slot.pos]!;
      const v = raw === null ? NONE : slot.judge(raw);
      if (raw !== null && v.reason) this.problemAt(line, slot.def.name, raw, v.reason);
      j[slot.def.name] = v;
    }
    const key = j.worker_key!;
    if (!this.overflow) this.tally(key, j.site!, j.month!, j.hours!, j.birth_year!, j.sex!);
    if (!Number.isNaN(j.site!.num)) this.siteIds.add(j.site!.num);
    if (!Number.isNaN(j.exposure_group!.num)) this.groupIds.add(j.exposure_group!.num);
    this.putStr(
      `${line}\t${ROSTER_STAGE_COLUMNS.slice(1)
        .map((c) => j[c === 'site_id' ? 'site' : c === 'group_id' ? 'exposure_group' : c]!.cell)
        .join('\t')}\n`,
    );
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
      return { fields, next: Math.min(j + 1, s.length), lines };
    }
  }

  /** Tallies a row for its worker and its site × month; returns the worker's tally (null when none). */
  private tally(key: Judged, site: Judged, month: Judged, hours: Judged, by: Judged, sex: Judged, workerOnly = false): WorkerTally | null {
    let t: WorkerTally | null = null;
    if (key.cell !== '\\N') {
      t = this.workers.get(key.cell) ?? null;
      if (t) this.tallyWorker(t, month, by, sex);
      else if (this.workers.size >= this.limits.workers) {
        this.giveUpTallies();
        return null;
      } else {
        const year = by.num;
        const sx = sex.cell === '\\N' ? '' : sex.cell;
        t = { byMin: year, byMax: year, sexMin: sx, sexMax: sx, last: Number.isNaN(month.num) ? -1 : month.num };
        this.workers.set(own(key.cell), t);
      }
    }
    if (!workerOnly) this.tallySlice(site, month, hours);
    return t;
  }

  private tallyWorker(t: WorkerTally, month: Judged, by: Judged, sex: Judged): void {
    const year = by.num;
    if (year === year) {
      if (!(t.byMin <= year)) t.byMin = year;
      if (!(t.byMax >= year)) t.byMax = year;
    }
    const sx = sex.cell;
    if (sx !== '\\N') {
      if (!t.sexMin || sx < t.sexMin) t.sexMin = sx;
      if (!t.sexMax || sx > t.sexMax) t.sexMax = sx;
    }
    const m = month.num;
    if (m === m) {
      if (m <= t.last) this.monthsIncrease = false;
      else t.last = m;
    }
  }

  private tallySlice(site: Judged, month: Judged, hours: Judged): void {
    if (Number.isNaN(site.num) || Number.isNaN(month.num)) return;
    const k = site.num * 200_000 + month.num;
    const sl = this.slices.get(k);
    if (sl) {
      sl.n++;
      if (hours.num === hours.num) sl.cents += hours.num;
    } else if (this.slices.size >= this.limits.slices) {
      this.giveUpTallies();
    } else {
      this.slices.set(k, {
        siteId: site.num,
        siteCode: this.sitesById.get(site.num)!,
        month: month.cell.slice(0, 7),
        n: 1,
        cents: Number.isNaN(hours.num) ? 0 : hours.num,
      });
    }
  }

  private giveUpTallies(): void {
    this.overflow = true;
    this.workers.clear();
    this.slices.clear();
  }
}
