import type { Readable, Transform, Writable } from 'node:stream';
import type { PoolClient } from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import type { ColumnDef } from '@ratewarden/shared/intake-columns';
import { translateCopyError } from './copy-errors';
import { assertAllRowsStaged, CsvRecordScan } from './csv-record-scan';

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
 * read while looking for the header's line ending. On the way `scan` counts the records and stops
 * a line that COPY would take for its end-of-data marker; the rows staged must be the rows counted.
 * (Case lists; rosters go through roster-stream.)
 */
export async function copyRows(
  client: PoolClient,
  table: string,
  columns: string[],
  delimiter: ',' | ';',
  head: Buffer,
  rest: Readable,
  scan = new CsvRecordScan(),
): Promise<number> {
  const sql = `COPY ${stagingRef(table)} (${columns.join(', ')}) FROM STDIN WITH (FORMAT csv, DELIMITER '${delimiter}', ENCODING 'UTF8')`;
  const staged = await pumpCopy(client, sql, head, rest, scan);
  assertAllRowsStaged(scan.records, staged);
  return staged;
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
