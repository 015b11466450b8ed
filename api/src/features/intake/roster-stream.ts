import { isUtf8 } from 'node:buffer';
import { Transform, type TransformCallback } from 'node:stream';
import { NO_BOUNDS, type CellBounds } from '@ratewarden/shared/intake-cell';
import { rosterColumns } from '@ratewarden/shared/intake-columns';
import type { IntakeProblem } from '@ratewarden/shared/intake-schemas';
import { unreadable } from './copy-errors';
import { quotedRecord } from './csv-quoted-record';
import { PROBLEMS_LISTED } from './problems';
import {
  cachedVerdict,
  KEY_CACHE,
  NONE,
  NULL_CELL,
  own,
  slotJudge,
  VERDICT_CACHE,
  type CodeMap,
  type Entry,
  type Judged,
  type Slot,
} from './roster-cell-verdict';
import { DEFAULT_TALLY_LIMITS, RosterTallies, type TallyLimits } from './roster-tallies';

/** Columns of a roster's typed staging table, in the order the stream writes them. */
export const ROSTER_STAGE_COLUMNS = ['line_no', 'worker_key', 'site_id', 'group_id', 'month', 'hours', 'birth_year', 'sex', 'job_title'] as const;

/** A row longer than this is not a roster row (and would otherwise be held whole in memory). */
const MAX_ROW_CHARS = 1024 * 1024;

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
  /** Per worker and per site × month, for the set-wise checks (roster-tallies.ts). */
  readonly tallies: RosterTallies;
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
    limits: TallyLimits = DEFAULT_TALLY_LIMITS,
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
    this.tallies = new RosterTallies(limits, new Map([...codes.site.values()].map((s) => [s.id, s.code.toUpperCase()])));
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
      // The next chunk after the event loop's turn: chunks already buffered would otherwise be
      // parsed back to back in one go, and other requests would wait for all of them.
      setImmediate(done, null, this.pendingOut());
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
   * (the common case, no strings made but for the worker key); quoted ones go through `quotedRecord`.
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
        const rec = quotedRecord(text, 0, final, this.eol, this.delimiter);
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

  /** The verdict on field `slot.pos` of the current byte row (cached per column). */
  private byteJudged(slot: Slot, b: Buffer): Entry {
    return cachedVerdict(slot, b, this.starts[slot.pos]!, this.ends[slot.pos]!);
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
    const tallies = this.tallies;
    if (!tallies.overflow) {
      if (key.tally) tallies.tallyWorker(key.tally, month.j, by.j, sex.j);
      else key.tally = tallies.tally(key.j, site.j, month.j, hours.j, by.j, sex.j, true);
      if (!tallies.overflow) tallies.tallySlice(site.j, month.j, hours.j);
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
    if (!this.tallies.overflow) this.tallies.tally(key, j.site!, j.month!, j.hours!, j.birth_year!, j.sex!);
    if (!Number.isNaN(j.site!.num)) this.siteIds.add(j.site!.num);
    if (!Number.isNaN(j.exposure_group!.num)) this.groupIds.add(j.exposure_group!.num);
    this.putStr(
      `${line}\t${ROSTER_STAGE_COLUMNS.slice(1)
        .map((c) => j[c === 'site_id' ? 'site' : c === 'group_id' ? 'exposure_group' : c]!.cell)
        .join('\t')}\n`,
    );
  }
}
