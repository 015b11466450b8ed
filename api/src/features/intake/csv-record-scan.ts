import { Transform, type TransformCallback } from 'node:stream';
import { unreadable } from './copy-errors';

const QUOTE = 0x22;
const LF = 0x0a;
const CR = 0x0d;
const BACKSLASH = 0x5c;
const DOT = 0x2e;
const NONE = Buffer.alloc(0);

/**
 * Watches a case list's data rows on their way into COPY (FORMAT csv) the way PostgreSQL's line
 * reader sees them: every quote character toggles quoting, a line end outside quotes ends a record
 * (CRLF counting once). It counts the records, so the caller can hold COPY's row count against
 * them, and refuses a line that holds only `\.`: COPY takes that for its end-of-data marker, even
 * inside a quoted value, and would drop every row after it without a word.
 */
export class CsvRecordScan extends Transform {
  /** Records seen so far; complete once the stream has ended. */
  records = 0;
  private inQuote = false;
  /** True at the first byte of a physical line. */
  private lineStart = true;
  /** True while the current record has no byte yet (a line end right here would be an empty record). */
  private recordStart = true;
  private lastCr = false;
  private line: number;
  /** Up to two bytes at a line start, held back until the next chunk shows whether they are `\.` alone. */
  private held: Buffer = NONE;

  constructor(
    firstLine = 2,
    private readonly refuseEndMarker = true,
  ) {
    super();
    this.line = firstLine;
  }

  override _transform(chunk: Buffer, _enc: BufferEncoding, done: TransformCallback): void {
    const buf = this.held.length ? Buffer.concat([this.held, chunk]) : chunk;
    this.held = NONE;
    try {
      const stop = this.scan(buf, false);
      if (stop < buf.length) this.held = Buffer.from(buf.subarray(stop));
      done(null, stop > 0 ? buf.subarray(0, stop) : undefined);
    } catch (err) {
      done(err as Error);
    }
  }

  override _flush(done: TransformCallback): void {
    try {
      const buf = this.held;
      this.held = NONE;
      this.scan(buf, true);
      if (!this.recordStart) this.records++;
      done(null, buf.length ? buf : undefined);
    } catch (err) {
      done(err as Error);
    }
  }

  /** Scans `b`; returns where it stopped (before bytes held back at a line start). */
  private scan(b: Buffer, final: boolean): number {
    for (let i = 0; i < b.length; i++) {
      const c = b[i]!;
      if (this.lineStart && c === BACKSLASH && this.refuseEndMarker) {
        if (i + 1 >= b.length || (b[i + 1] === DOT && i + 2 >= b.length)) {
          if (!final) return i;
          if (i + 1 < b.length) this.endMarker();
        } else if (b[i + 1] === DOT && (b[i + 2] === LF || b[i + 2] === CR)) {
          this.endMarker();
        }
      }
      if (c === LF || c === CR) {
        const crlfTail = c === LF && this.lastCr;
        this.lastCr = c === CR;
        this.lineStart = true;
        if (crlfTail) continue;
        this.line++;
        if (!this.inQuote) {
          this.records++;
          this.recordStart = true;
        }
        continue;
      }
      if (c === QUOTE) this.inQuote = !this.inQuote;
      this.lastCr = false;
      this.lineStart = false;
      this.recordStart = false;
    }
    return b.length;
  }

  private endMarker(): never {
    throw unreadable(
      `line ${this.line} holds only \\. , which the database would take for the end of the data and drop every row after it; remove the line`,
      this.line,
    );
  }
}

/**
 * The check that no row vanished between the file and the staging table: every row read from the
 * upload must have been staged, or the intake is refused.
 */
export function assertAllRowsStaged(seen: number, staged: number): void {
  if (seen === staged) return;
  throw unreadable(`the file holds ${seen} data rows but ${staged} reached the staging table; nothing was taken in, so that no row is dropped silently`, null);
}
