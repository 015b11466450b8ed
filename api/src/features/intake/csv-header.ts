import type { Readable } from 'node:stream';
import { parse } from 'csv-parse/sync';
import type { ColumnDef } from '@ratewarden/shared/intake-columns';
import type { IntakeProblem } from '@ratewarden/shared/intake-schemas';

/** A header row longer than this is not a header of ours. */
const MAX_HEADER_BYTES = 64 * 1024;
const BOM = Buffer.from([0xef, 0xbb, 0xbf]);

export interface FileHead {
  /** The header line as text, without BOM and line ending; null for an empty file. */
  header: string | null;
  /** Bytes after the header's line ending: the start of the data rows. */
  rest: Buffer;
  /** True when the stream ended inside the head (file of at most one line). */
  ended: boolean;
  problem: string | null;
  /** The header's line ending, LF (CRLF included) or a lone CR: the data rows end the same way. */
  eol: '\n' | '\r';
}

/**
 * Reads from `src` only up to the end of the first line, then leaves `src` paused so the caller
 * can pipe the remainder onwards. The header is the one part of a roster looked at in Node.
 */
export function readHead(src: Readable): Promise<FileHead> {
  return new Promise((resolve, reject) => {
    // The upload may already have failed (size limit, broken connection) before we started reading.
    if (src.errored) {
      reject(src.errored);
      return;
    }
    const chunks: Buffer[] = [];
    let size = 0;
    const finish = (head: FileHead) => {
      src.off('data', onData);
      src.off('end', onEnd);
      src.off('error', onError);
      src.pause();
      resolve(head);
    };
    const onData = (chunk: Buffer) => {
      chunks.push(chunk);
      size += chunk.length;
      const all = chunks.length === 1 ? chunk : Buffer.concat(chunks);
      const nl = all.indexOf(0x0a);
      const cr = all.indexOf(0x0d);
      // A lone CR (old Mac line ending) also ends the header; CRLF counts as one ending.
      const end = nl >= 0 && (cr < 0 || cr >= nl - 1) ? nl : cr >= 0 && cr + 1 < all.length ? cr : -1;
      if (end >= 0) {
        const lineEnd = all[end] === 0x0a && end > 0 && all[end - 1] === 0x0d ? end - 1 : end;
        finish(decodeHead(all.subarray(0, lineEnd), all.subarray(end + 1), false, all[end] === 0x0a ? '\n' : '\r'));
      } else if (size > MAX_HEADER_BYTES) {
        finish({
          header: null,
          rest: Buffer.alloc(0),
          ended: false,
          eol: '\n',
          problem: 'the first line is not a header row (no line ending in the first 64 KiB); is this a CSV file?',
        });
      }
    };
    const onEnd = () => {
      const all = Buffer.concat(chunks);
      const trimmed = all.subarray(0, all.length - (all.at(-1) === 0x0d ? 1 : 0));
      finish(decodeHead(trimmed, Buffer.alloc(0), true, '\n'));
    };
    const onError = (err: Error) => reject(err);
    src.on('data', onData);
    src.on('end', onEnd);
    src.on('error', onError);
  });
}

function decodeHead(line: Buffer, rest: Buffer, ended: boolean, eol: '\n' | '\r'): FileHead {
  const body = line.subarray(0, 3).equals(BOM) ? line.subarray(3) : line;
  if (body.length === 0 && ended && rest.length === 0) return { header: null, rest, ended, eol, problem: 'the file is empty' };
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(body);
  } catch {
    return { header: null, rest, ended, eol, problem: 'the header row is not UTF-8 text; save the file as CSV UTF-8 and upload it again' };
  }
  // eslint-disable-next-line no-control-regex -- control characters are exactly what this looks for
  if (/[\u0000-\u0008\u000e-\u001f]/.test(text)) {
    return { header: null, rest, ended, eol, problem: 'the file holds binary data, not CSV text' };
  }
  return { header: text, rest, ended, eol, problem: null };
}

/** Semicolon when the header holds more semicolons than commas (outside quotes), else comma. */
export function detectDelimiter(header: string): ',' | ';' {
  let commas = 0;
  let semis = 0;
  let quoted = false;
  for (const ch of header) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && ch === ',') commas++;
    else if (!quoted && ch === ';') semis++;
  }
  return semis > commas ? ';' : ',';
}

export interface HeaderMatch {
  /** Our column names in the file's order. */
  columns: string[];
  problems: IntakeProblem[];
}

/** Matches header names (trimmed, case-insensitive) to the format's columns. */
export function matchHeader(header: string, delimiter: string, defs: readonly ColumnDef[]): HeaderMatch {
  let names: string[];
  try {
    names = (parse(header, { delimiter, relax_quotes: true }) as string[][])[0] ?? [];
  } catch {
    return { columns: [], problems: [{ line: 1, column: null, value: header.slice(0, 200), reason: 'the header row cannot be read as CSV' }] };
  }
  const known = new Map(defs.map((d) => [d.name, d]));
  const problems: IntakeProblem[] = [];
  const columns: string[] = [];
  const seen = new Set<string>();
  for (const raw of names) {
    const name = raw.trim().toLowerCase();
    if (!known.has(name)) {
      problems.push({ line: 1, column: raw, value: null, reason: `unknown column "${raw}"; the columns are ${defs.map((d) => d.name).join(', ')}` });
    } else if (seen.has(name)) {
      problems.push({ line: 1, column: name, value: null, reason: `column ${name} appears twice in the header` });
    }
    seen.add(name);
    columns.push(name);
  }
  for (const d of defs) {
    if (d.required && !seen.has(d.name))
      problems.push({ line: 1, column: d.name, value: null, reason: `required column ${d.name} is missing from the header` });
  }
  return { columns, problems };
}
