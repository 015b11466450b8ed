import { randomUUID } from 'node:crypto';
import type { Readable } from 'node:stream';
import type { PoolClient } from 'pg';
import type { DataSource, EntityManager } from 'typeorm';
import type { IntakeKind } from '@ratewarden/shared/intake';
import { monthOf, type CellBounds } from '@ratewarden/shared/intake-cell';
import { intakeColumns, reasons } from '@ratewarden/shared/intake-columns';
import type { IntakeDetail, IntakeProblem, IntakeUploadResponse } from '@ratewarden/shared/intake-schemas';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordCaseReporting } from './case-reporting';
import { recordAudit } from '../../audit/audit-log';
import { assertSites } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import { ByteMeter } from '../../lib/byte-meter';
import { dataErrorProblem, isPgDataError } from './copy-errors';
import { copyRows, createStagingTable, stagingRef, stagingTableName } from './copy-stage';
import { detectDelimiter, matchHeader, readHead } from './csv-header';
import { applyChecked, lockIntakes, runChecks, type CheckOutcome } from './intake-check';
import { DEFAULT_EXPIRY_HOURS, expireIntake } from './intake-expiry';
import { loadIntake } from './intake-queries';
import { withTransaction } from './intake-transaction';
import { stageRoster, type RosterStaged } from './roster-stage';
import { DEFAULT_TALLY_LIMITS } from './roster-stream';
import { dropStaging } from './staging-drop';
import { restoreCases } from './case-intake';
import { hasOpenConflicts, leaveKeptCases, recordCaseConflicts, restoreWouldOverrule } from './case-conflicts';
import { restoreRoster } from './roster-apply';

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

/** The month bound of the cell rules: the current month, unless months still to come are allowed. */
export function intakeBounds(allowFutureMonths = false, now = new Date()): CellBounds {
  return { latestMonth: allowFutureMonths ? null : monthOf(now) };
}

/** The rejection of a file that cannot even be staged: header, encoding or CSV-structure problems. */
class Unreadable extends Error {
  constructor(readonly problems: IntakeProblem[]) {
    super(problems[0]?.reason ?? 'the file cannot be read');
  }
}

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
 * (checksum) changes nothing and answers with the intake that already holds it.
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
  try {
    return await withTransaction(ds, async (client, em) => {
      const head = await readHead(meter);
      if (head.problem || head.header === null) {
        await drain(meter);
        throw new Unreadable([{ line: 1, column: null, value: null, reason: head.problem ?? 'the file is empty' }]);
      }
      delimiter = detectDelimiter(head.header);
      const match = matchHeader(head.header, delimiter, defs);
      columns = match.columns;
      if (match.problems.length) {
        await drain(meter);
        throw new Unreadable(match.problems);
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
      if (dup.rows[0]) throw new Duplicate(dup.rows[0].id, checksum);
      if (rowCount === 0) throw new Unreadable([{ line: 2, column: null, value: null, reason: 'the file has a header row but no data rows' }]);

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
      return { intake: await loadIntake(em, id), duplicate: false };
    });
  } catch (thrown) {
    // A value PostgreSQL cannot take, met by the checks: a problem of the file, not of the server.
    const err = isPgDataError(thrown) ? dataErrorProblem(thrown) : thrown;
    if (err instanceof Duplicate) {
      await recordAudit(ds, {
        actor: input.principal,
        action: 'intake.duplicate',
        target: `intake:${err.existingId}`,
        ip: input.ip,
        detail: { fileName: input.fileName, checksum: err.checksum },
      });
      return { intake: await loadIntake(ds, err.existingId), duplicate: true };
    }
    if (err instanceof AppError && err.code === 'validation_failed' && isProblemList(err.details)) {
      return recordUnreadable(ds, input, id, meter, err.details.problems, columns, delimiter);
    }
    if (err instanceof Unreadable) return recordUnreadable(ds, input, id, meter, err.problems, columns, delimiter);
    throw err;
  }
}

class Duplicate extends Error {
  constructor(
    readonly existingId: string,
    readonly checksum: string,
  ) {
    super('duplicate');
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

/** Records the checks' verdict; applies when asked and the file is clean ('if-clear': and no case contradicts a physician's decision). */
async function settleChecked(
  client: PoolClient,
  em: EntityManager,
  id: string,
  kind: IntakeKind,
  table: string,
  outcome: CheckOutcome,
  apply: boolean | 'if-clear',
  principal: Principal,
  ip?: string | null,
): Promise<void> {
  const rejected = outcome.problemCount > 0;
  await client.query(
    `UPDATE intakes SET state = $2, problem_count = $3, problems = $4, diff = $5, site_ids = $6, month_from = $7, month_to = $8, checked_at = now() WHERE id = $1`,
    [
      id,
      rejected ? 'rejected' : 'checked',
      outcome.problemCount,
      JSON.stringify(outcome.problems),
      outcome.diff ? JSON.stringify(outcome.diff) : null,
      outcome.scope.siteIds,
      outcome.scope.monthFrom,
      outcome.scope.monthTo,
    ],
  );
  if (rejected) {
    await dropStaging(client, id, table);
    await recordAudit(em, { actor: principal, action: 'intake.reject', target: `intake:${id}`, ip, detail: { problems: outcome.problemCount } });
    return;
  }
  if (kind === 'cases') await recordCaseConflicts(client, id);
  if (!apply) return;
  // A case list that contradicts a physician's decision waits for the physician (case-conflicts.ts):
  // an upload asking to apply stays checked; an apply asked for later is refused.
  if (kind === 'cases' && (await hasOpenConflicts(client, id))) {
    if (apply === 'if-clear') return;
    throw new AppError(
      'conflict',
      "this case list contradicts a physician's decision on some cases; a physician decides each (keep the decision or accept the list) before it is applied",
    );
  }
  await applyNow(client, em, id, kind, table, principal, ip);
}

async function requestRun(client: PoolClient, id: string, reason: string): Promise<void> {
  await client.query(`INSERT INTO run_requests (reason, intake_id) VALUES ($1, $2)`, [reason, id]);
}

async function applyNow(
  client: PoolClient,
  em: EntityManager,
  id: string,
  kind: IntakeKind,
  table: string,
  principal: Principal,
  ip?: string | null,
): Promise<void> {
  if (kind === 'cases') await leaveKeptCases(client, id);
  const { superseded } = await applyChecked(client, kind, table, id);
  await client.query(`UPDATE intakes SET state = 'applied', applied_at = now() WHERE id = $1`, [id]);
  await dropStaging(client, id, table);
  await requestRun(client, id, `${kind === 'roster' ? 'roster' : 'case list'} intake applied`);
  await recordAudit(em, { actor: principal, action: 'intake.apply', target: `intake:${id}`, ip, detail: { kind, superseded } });
}

interface LockedIntake {
  id: string;
  kind: IntakeKind;
  state: string;
  staging_table: string | null;
  row_count: number;
  site_ids: number[];
  /** Checked longer ago than the expiry allows. */
  expired: boolean;
  /** The first problem's reason (why a rejected intake was rejected). */
  reason: string | null;
}

async function lockIntake(client: PoolClient, id: string, expiryHours = DEFAULT_EXPIRY_HOURS): Promise<LockedIntake> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) throw new AppError('not_found', 'no such intake');
  await lockIntakes(client);
  const { rows } = await client.query<LockedIntake>(
    `SELECT id, kind, state, staging_table, row_count, site_ids, coalesce(checked_at < now() - $2 * interval '1 hour', false) AS expired,
            problems->0->>'reason' AS reason
     FROM intakes WHERE id = $1 FOR UPDATE`,
    [id, expiryHours],
  );
  if (!rows[0]) throw new AppError('not_found', 'no such intake');
  return rows[0];
}

function notApplicable(state: string, reason: string | null): AppError {
  return new AppError('conflict', `only a checked intake can be applied; this one is ${state}${state === 'rejected' && reason ? `: ${reason}` : ''}`);
}

export interface ApplyOptions {
  /** Hours a checked intake may wait for apply (INTAKE_EXPIRY_HOURS). */
  expiryHours?: number;
  allowFutureMonths?: boolean;
  now?: Date;
}

/**
 * Applies an intake that was checked earlier. The checks that depend on the store run again
 * first, in the same transaction, because the store may have moved since; new problems reject
 * the intake and store nothing. The in-file checks of a roster are not repeated: its staged rows
 * are intact (same count) and only this code writes them. An intake checked longer ago than the
 * expiry allows is expired here (kept so) and the apply refused.
 */
export async function applyIntake(ds: DataSource, p: Principal, id: string, ip?: string | null, opts: ApplyOptions = {}): Promise<IntakeDetail> {
  const hours = opts.expiryHours ?? DEFAULT_EXPIRY_HOURS;
  const detail = await withTransaction(ds, async (client, em) => {
    const it = await lockIntake(client, id, hours);
    assertSites(p, it.site_ids);
    if (it.state === 'checked' && it.expired) {
      // Committed on return, so the intake stays expired; the refusal follows outside the transaction.
      await expireIntake(client, em, id, it.staging_table, hours);
      return null;
    }
    if (it.state !== 'checked') throw notApplicable(it.state, it.reason);
    const staged = it.staging_table ? await client.query<{ n: string }>(`SELECT count(*) AS n FROM ${stagingRef(it.staging_table)}`).catch(() => null) : null;
    if (!staged || Number(staged.rows[0]!.n) !== it.row_count) {
      throw new AppError('conflict', 'the staged rows of this intake are gone (the database restarted since the check); upload the file again');
    }
    try {
      const outcome = await runChecks(client, it.kind, it.staging_table!, intakeBounds(opts.allowFutureMonths, opts.now));
      assertSites(p, outcome.scope.siteIds);
      await settleChecked(client, em, id, it.kind, it.staging_table!, outcome, true, p, ip);
    } catch (err) {
      if (isPgDataError(err)) throw new AppError('validation_failed', `the intake cannot be applied: a value cannot be stored (${err.message ?? err.code})`);
      throw err;
    }
    return loadIntake(em, id);
  });
  if (!detail) throw notApplicable('rejected', reasons.intakeExpired(hours));
  return detail;
}

/** Throws the checked intake away: staged rows dropped, the intake kept as rejected (discarded). */
export async function discardIntake(ds: DataSource, p: Principal, id: string, ip?: string | null): Promise<IntakeDetail> {
  return withTransaction(ds, async (client, em) => {
    const it = await lockIntake(client, id);
    assertSites(p, it.site_ids);
    if (it.state !== 'checked') throw new AppError('conflict', `only a checked intake can be discarded; this one is ${it.state}`);
    await client.query(`UPDATE intakes SET state = 'rejected', discarded_at = now() WHERE id = $1`, [id]);
    if (it.staging_table) await dropStaging(client, id, it.staging_table);
    await recordAudit(em, { actor: p, action: 'intake.discard', target: `intake:${id}`, ip });
    return loadIntake(em, id);
  });
}

/** Brings a superseded version back: it becomes current again and what replaced it is superseded. */
export async function restoreIntake(ds: DataSource, p: Principal, id: string, ip?: string | null): Promise<IntakeDetail> {
  return withTransaction(ds, async (client, em) => {
    const it = await lockIntake(client, id);
    assertSites(p, it.site_ids);
    if (it.state !== 'superseded') throw new AppError('conflict', `only a superseded intake can be restored; this one is ${it.state}`);
    let superseded: string[];
    if (it.kind === 'roster') {
      const r = await restoreRoster(client, id);
      if (r.clashes > 0) {
        throw new AppError(
          'conflict',
          `restoring this version would put ${r.clashes} worker-months on two sites at once; restore or correct the other site's roster first`,
        );
      }
      superseded = r.superseded;
    } else {
      if (await restoreWouldOverrule(client, id)) {
        throw new AppError(
          'conflict',
          "restoring this version would overrule a physician's decision on some cases; send the cases as a new case list instead, so the physician decides each conflict",
        );
      }
      superseded = (await restoreCases(client, id)).superseded;
    }
    await client.query(`UPDATE intakes SET state = 'applied', superseded_at = NULL, restored_at = now() WHERE id = $1`, [id]);
    await requestRun(client, id, `${it.kind === 'roster' ? 'roster' : 'case list'} intake restored`);
    await recordAudit(em, { actor: p, action: 'intake.restore', target: `intake:${id}`, ip, detail: { superseded } });
    return loadIntake(em, id);
  });
}
