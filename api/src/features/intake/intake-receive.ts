import { randomUUID } from 'node:crypto';
import type { Readable } from 'node:stream';
import type { DataSource } from 'typeorm';
import { pgClientOf } from '@ratewarden/db/sql';
import type { IntakeKind } from '@ratewarden/shared/intake';
import { intakeColumns } from '@ratewarden/shared/intake-columns';
import type { IntakeProblem, IntakeUploadResponse } from '@ratewarden/shared/intake-schemas';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordAudit } from '../../audit/audit-log';
import { assertSites } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import { ByteMeter } from '../../lib/byte-meter';
import { recordCaseReporting } from './case-reporting';
import { dataErrorProblem, isPgDataError } from './copy-errors';
import { copyRows, createStagingTable, stagingTableName } from './copy-stage';
import { detectDelimiter, matchHeader, readHead } from './csv-header';
import { lockIntakes, runChecks } from './intake-check';
import { intakeBounds } from './intake-bounds';
import { settleChecked } from './intake-settle';
import { loadIntake } from './intake-queries';
import { stageRoster, type RosterStaged } from './roster-stage';
import { DEFAULT_TALLY_LIMITS } from './roster-tallies';
import { dropStaging } from './staging-drop';

/** 512 MiB: a roster of several million rows; larger exports are split by site or year. */
export const DEFAULT_MAX_BYTES = 512 * 1024 * 1024;

export interface ReceiveInput {
  kind: IntakeKind;
  mode: 'check' | 'apply';
  fileName: string;
  /** The file's bytes as they arrive; read once, never buffered whole. */
  stream: Readable;
  principal: Principal;
  maxBytes?: number;
  ip?: string | null;
  /** Whether months after the current one are taken in (INTAKE_ALLOW_FUTURE_MONTHS); default no. */
  allowFutureMonths?: boolean;
  /** The clock, for the current month. */
  now?: Date;
  /** Case lists: the last month the list reports (first day, YYYY-MM-DD); by default worked out (case-reporting.ts). */
  reportsThrough?: string | null;
}

/**
 * What the receiving transaction ends with: the intake it stored, the intake that already holds
 * the same file, or the problems of a file that cannot be staged. The last two leave nothing in
 * the database (their staging table is dropped before commit) and are recorded after it.
 */
type Received = { kind: 'stored' } | { kind: 'duplicate'; existingId: string; checksum: string } | { kind: 'unreadable'; problems: IntakeProblem[] };

const submitter = (p: Principal) => (p.kind === 'user' ? [p.id, null] : [null, p.clientId]);

/** Lets the rest of an upload flow past (discarded), so the checksum covers the whole file. */
function drain(src: Readable): Promise<void> {
  if (src.errored) return Promise.reject(src.errored);
  if (src.readableEnded) return Promise.resolve();
  return new Promise((resolve, reject) => {
    src.on('end', resolve).on('error', reject).resume();
  });
}

/**
 * Takes in one uploaded file: stages it by COPY, checks it set-wise and, when asked and clean,
 * applies it — all in one transaction, so an interrupted or failed intake leaves nothing behind.
 * Content problems give a rejected intake (kept, with its problems); the same file twice
 * (checksum) changes nothing and answers with the intake that already holds it. A file the
 * stream or COPY cannot read throws AppError('validation_failed', …, { problems }) from deep
 * inside (copy-errors.ts): the transaction rolls back and the file is recorded as rejected.
 */
export async function receiveIntake(ds: DataSource, input: ReceiveInput): Promise<IntakeUploadResponse> {
  const defs = intakeColumns[input.kind];
  const bounds = intakeBounds(input.allowFutureMonths, input.now);
  const meter = new ByteMeter(input.maxBytes ?? DEFAULT_MAX_BYTES);
  // Failures are read from `meter.errored` by whoever reads next; this keeps them from going unhandled.
  meter.on('error', () => undefined);
  // The upload may have failed before it reached us (a multipart body cut short): its error event is gone.
  if (input.stream.errored) meter.destroy(input.stream.errored);
  else {
    input.stream.on('error', (err) => meter.destroy(err));
    input.stream.pipe(meter);
  }
  const id = randomUUID();
  const table = stagingTableName(id);
  let columns: string[] = [];
  let delimiter: ',' | ';' = ',';
  let received: Received;
  try {
    received = await ds.transaction(async (em): Promise<Received> => {
      const client = await pgClientOf(em);
      const head = await readHead(meter);
      if (head.problem || head.header === null) {
        await drain(meter);
        return { kind: 'unreadable', problems: [{ line: 1, column: null, value: null, reason: head.problem ?? 'the file is empty' }] };
      }
      delimiter = detectDelimiter(head.header);
      const match = matchHeader(head.header, delimiter, defs);
      columns = match.columns;
      if (match.problems.length) {
        await drain(meter);
        return { kind: 'unreadable', problems: match.problems };
      }
      let staged: RosterStaged | null = null;
      let rowCount: number;
      if (input.kind === 'roster') {
        // Rosters are large: judged cell by cell while streaming, staged typed (roster-stream.ts).
        staged = await stageRoster(client, table, columns, delimiter, head.eol, head.rest, head.ended ? null : meter, DEFAULT_TALLY_LIMITS, bounds);
        rowCount = staged.rowCount;
      } else {
        await createStagingTable(client, table, defs);
        rowCount = head.ended ? 0 : await copyRows(client, table, columns, delimiter, head.rest, meter);
      }
      const checksum = meter.digest();

      await lockIntakes(client);
      const dup = await client.query<{ id: string }>(
        `SELECT id FROM intakes WHERE kind = $1 AND checksum = $2 AND state IN ('checked', 'applied', 'superseded') ORDER BY created_at DESC LIMIT 1`,
        [input.kind, checksum],
      );
      if (dup.rows[0]) {
        await dropStaging(client, id, table);
        return { kind: 'duplicate', existingId: dup.rows[0].id, checksum };
      }
      if (rowCount === 0) {
        await dropStaging(client, id, table);
        return { kind: 'unreadable', problems: [{ line: 2, column: null, value: null, reason: 'the file has a header row but no data rows' }] };
      }

      const [submittedBy, submittedByClient] = submitter(input.principal);
      await client.query(
        `INSERT INTO intakes (id, kind, state, file_name, checksum, size_bytes, row_count, submitted_by, submitted_by_client, staging_table, columns, delimiter)
         VALUES ($1, $2, 'received', $3, $4, $5, $6, $7, $8, $9, $10, $11)`,
        [id, input.kind, input.fileName, checksum, meter.bytes, rowCount, submittedBy, submittedByClient, table, columns, delimiter],
      );
      const outcome = await runChecks(client, input.kind, table, bounds, staged);
      assertSites(input.principal, outcome.scope.siteIds);
      await recordAudit(em, {
        actor: input.principal,
        action: 'intake.receive',
        target: `intake:${id}`,
        ip: input.ip,
        detail: { kind: input.kind, fileName: input.fileName, rows: rowCount, checksum, problems: outcome.problemCount },
      });
      if (input.kind === 'cases') await recordCaseReporting(client, id, input.principal, input.reportsThrough ?? null);
      await settleChecked(client, em, id, input.kind, table, outcome, input.mode === 'apply' && 'if-clear', input.principal, input.ip);
      return { kind: 'stored' };
    });
  } catch (thrown) {
    // A value PostgreSQL cannot take, met by the checks: a problem of the file, not of the server.
    const err = isPgDataError(thrown) ? dataErrorProblem(thrown) : thrown;
    if (err instanceof AppError && err.code === 'validation_failed' && isProblemList(err.details)) {
      received = { kind: 'unreadable', problems: err.details.problems };
    } else throw err;
  }
  switch (received.kind) {
    case 'stored':
      return { intake: await loadIntake(ds, id), duplicate: false };
    case 'duplicate':
      await recordAudit(ds, {
        actor: input.principal,
        action: 'intake.duplicate',
        target: `intake:${received.existingId}`,
        ip: input.ip,
        detail: { fileName: input.fileName, checksum: received.checksum },
      });
      return { intake: await loadIntake(ds, received.existingId), duplicate: true };
    case 'unreadable':
      return recordUnreadable(ds, input, id, meter, received.problems, columns, delimiter);
  }
}

function isProblemList(d: unknown): d is { problems: IntakeProblem[] } {
  return typeof d === 'object' && d !== null && Array.isArray((d as { problems?: unknown }).problems);
}

/** A file that could not be staged is still recorded, rejected, with its problem, for the history. */
async function recordUnreadable(
  ds: DataSource,
  input: ReceiveInput,
  id: string,
  meter: ByteMeter,
  problems: IntakeProblem[],
  columns: string[],
  delimiter: string,
): Promise<IntakeUploadResponse> {
  // The rest of the upload is read (and thrown away) so the checksum and size describe the whole file.
  if (!meter.readableEnded && !meter.destroyed) await drain(meter).catch(() => undefined);
  const checksum = meter.destroyed ? '0'.repeat(64) : meter.digest();
  const [submittedBy, submittedByClient] = submitter(input.principal);
  await ds.transaction(async (em) => {
    await em.query(
      `INSERT INTO intakes (id, kind, state, file_name, checksum, size_bytes, row_count, problem_count, problems, submitted_by, submitted_by_client, checked_at, columns, delimiter)
       VALUES ($1, $2, 'rejected', $3, $4, $5, 0, $6, $7, $8, $9, now(), $10, $11)`,
      [id, input.kind, input.fileName, checksum, meter.bytes, problems.length, JSON.stringify(problems), submittedBy, submittedByClient, columns, delimiter],
    );
    await recordAudit(em, {
      actor: input.principal,
      action: 'intake.reject',
      target: `intake:${id}`,
      ip: input.ip,
      detail: { kind: input.kind, fileName: input.fileName, reason: problems[0]?.reason },
    });
  });
  return { intake: await loadIntake(ds, id), duplicate: false };
}
