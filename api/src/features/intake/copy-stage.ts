import type { Readable, Transform, Writable } from 'node:stream';
import type { PoolClient } from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import type { ColumnDef } from '@ratewarden/shared/intake-columns';
import { AppError } from '../../lib/app-error';

/** Staging tables live in their own schema, one per intake; the name is derived from the id only. */
export function stagingTableName(intakeId: string): string {
  return `s_${intakeId.replace(/-/g, '')}`;
}

export function stagingRef(table: string): string {
  if (!/^s_[0-9a-f]{32}$/.test(table)) throw new Error(`not a staging table name: ${table}`);
  return `intake_staging.${table}`;
}

/** An all-text table: every cell lands as typed, line numbers come from the identity column. */
export async function createStagingTable(client: PoolClient, table: string, defs: readonly ColumnDef[]): Promise<void> {
  const cols = defs.map((d) => `${d.name} text`).join(', ');
  await client.query(`CREATE UNLOGGED TABLE ${stagingRef(table)} (line_no bigint GENERATED ALWAYS AS IDENTITY, ${cols})`);
}

/**
 * Pipes the data rows (everything after the header) into COPY without parsing them in Node: the
 * bytes go as they come, PostgreSQL's CSV reader splits rows and fields. `head` is the part already
 * read while looking for the header's line ending. (Case lists; rosters go through roster-stream.)
 */
export async function copyRows(client: PoolClient, table: string, columns: string[], delimiter: ',' | ';', head: Buffer, rest: Readable): Promise<number> {
  const sql = `COPY ${stagingRef(table)} (${columns.join(', ')}) FROM STDIN WITH (FORMAT csv, DELIMITER '${delimiter}', ENCODING 'UTF8')`;
  return pumpCopy(client, sql, head, rest, null);
}

/**
 * Streams `head` then `rest` into the COPY statement `sql`, through `through` when given (a
 * transform that turns the upload into COPY text). Not stream.pipeline: when PostgreSQL or the
 * transform refuses a row, the upload must stay readable so the caller can read the rest for the
 * checksum; when the upload fails, COPY is cancelled (and the transaction rolls back).
 */
export async function pumpCopy(client: PoolClient, sql: string, head: Buffer, rest: Readable, through: Transform | null): Promise<number> {
  if (rest.errored) throw rest.errored;
  const copy = client.query(copyFrom(sql));
  const first: Writable = through ?? copy;
  try {
    await new Promise<void>((resolve, reject) => {
      let settled = false;
      const stop = (err: Error, cancelCopy: boolean) => {
        if (settled) return;
        settled = true;
        rest.off('error', onRestError);
        rest.unpipe(first);
        rest.pause();
        if (through) {
          through.unpipe(copy);
          through.destroy();
        }
        if (cancelCopy) copy.destroy(err);
        reject(err);
      };
      const onRestError = (err: Error) => stop(err, true);
      copy.on('finish', () => {
        if (settled) return;
        settled = true;
        rest.off('error', onRestError);
        resolve();
      });
      copy.on('error', (err) => stop(err, false));
      through?.on('error', (err) => stop(err, true));
      rest.on('error', onRestError);
      if (through) through.pipe(copy);
      if (head.length) first.write(head);
      rest.pipe(first);
    });
  } catch (err) {
    throw translateCopyError(err);
  }
  return Number(copy.rowCount);
}

/** The rejection of a file whose rows cannot be read at all: one problem, with its line. */
export function unreadable(reason: string, line: number | null, column: string | null = null): AppError {
  return new AppError('validation_failed', `the file cannot be read: ${reason}`, { problems: [{ line, column, value: null, reason }] });
}

/** PostgreSQL's COPY complaints, reworded; its line numbers count data rows, ours count the header too. */
export function translateCopyError(err: unknown): unknown {
  if (err instanceof AppError) return err;
  const e = err as { code?: string; message?: string; where?: string };
  if (!e || typeof e.code !== 'string') return err;
  const m = /line (\d+)(?:, column (\w+))?/.exec(e.where ?? '');
  const line = m ? Number(m[1]) + 1 : null;
  const column = m?.[2] ?? null;
  const at = line ? ` (line ${line})` : '';
  const msg = e.message ?? '';
  let reason: string;
  if (e.code === '22021') {
    reason = msg.includes('0x00')
      ? `the file holds binary data (a zero byte)${at}, not CSV text`
      : `the file is not UTF-8 text${at}; save it as CSV UTF-8 and upload it again`;
  } else if (e.code === '22P04' || e.code === '22P02') {
    if (/missing data for column/.test(msg)) reason = `the row has fewer fields than the header${at}; an empty line also counts`;
    else if (/extra data after last expected column/.test(msg)) reason = `the row has more fields than the header${at}; is a value with a separator not in quotes?`;
    else if (/unterminated CSV quoted field/.test(msg)) reason = `a quoted value is never closed${at}`;
    else if (/carriage return|newline/.test(msg)) reason = `the line endings are mixed${at}; use either CRLF or LF throughout`;
    else reason = `the row cannot be read as CSV${at}`;
  } else if (e.code === '54000') {
    reason = `a row is too long to be a roster row${at}`;
  } else {
    return err;
  }
  return unreadable(reason, line, column);
}
