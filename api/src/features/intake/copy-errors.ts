import { AppError } from '../../lib/app-error';

/** The rejection of a file whose rows cannot be read at all: one problem, with its line. */
export function unreadable(reason: string, line: number | null, column: string | null = null): AppError {
  return new AppError('validation_failed', `the file cannot be read: ${reason}`, { problems: [{ line, column, value: null, reason }] });
}

/** A PostgreSQL error as node-postgres hands it over (`where` names the COPY line and column). */
interface PgError {
  code: string;
  message?: string;
  where?: string;
}

export function isPgError(err: unknown): err is PgError {
  return typeof err === 'object' && err !== null && typeof (err as { code?: unknown }).code === 'string' && /^[0-9A-Z]{5}$/.test((err as PgError).code);
}

/** Class 22 (data exception): a value PostgreSQL cannot take, such as year 0000 or a number out of range. */
export function isPgDataError(err: unknown): err is PgError {
  return isPgError(err) && err.code.startsWith('22');
}

/**
 * PostgreSQL's COPY complaints, reworded; its line numbers count data rows, ours count the header
 * too. Any other data exception becomes a problem of the line and column COPY names (or of the
 * file, when it names none), never a server error.
 */
export function translateCopyError(err: unknown): unknown {
  if (err instanceof AppError) return err;
  if (!isPgError(err)) return err;
  const m = /line (\d+)(?:, column (\w+))?/.exec(err.where ?? '');
  const line = m ? Number(m[1]) + 1 : null;
  const column = m?.[2] ?? null;
  const at = line ? ` (line ${line})` : '';
  const msg = err.message ?? '';
  let reason: string;
  if (err.code === '22021') {
    reason = msg.includes('0x00')
      ? `the file holds binary data (a zero byte)${at}, not CSV text`
      : `the file is not UTF-8 text${at}; save it as CSV UTF-8 and upload it again`;
  } else if (err.code === '22P04' || err.code === '22P02') {
    if (/missing data for column/.test(msg)) reason = `the row has fewer fields than the header${at}; an empty line also counts`;
    else if (/extra data after last expected column/.test(msg))
      reason = `the row has more fields than the header${at}; is a value with a separator not in quotes?`;
    else if (/unterminated CSV quoted field/.test(msg)) reason = `a quoted value is never closed${at}`;
    else if (/carriage return|newline/.test(msg)) reason = `the line endings are mixed${at}; use either CRLF or LF throughout`;
    else reason = `the row cannot be read as CSV${at}`;
  } else if (err.code === '54000') {
    reason = `a row is too long to be a roster row${at}`;
  } else if (err.code.startsWith('22')) {
    reason = `a value${column ? ` in column ${column}` : ''} cannot be stored${at}: ${msg}`;
  } else {
    return err;
  }
  return unreadable(reason, line, column);
}

/**
 * A data exception raised by the checks or the apply step (outside COPY), as a problem of the file:
 * the intake is rejected with it instead of failing the request.
 */
export function dataErrorProblem(err: PgError): AppError {
  return unreadable(`a value in the file cannot be checked: ${err.message ?? err.code}`, null);
}
