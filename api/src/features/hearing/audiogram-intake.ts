import { createHash, randomUUID } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { rows as dbRows } from '@ratewarden/db';
import { IntakeEntity } from '@ratewarden/db/entities/intake';
import { OutcomeEntity } from '@ratewarden/db/entities/outcome';
import { WorkerEntity } from '@ratewarden/db/entities/worker';
import { requestRun } from '@ratewarden/db/run-requests';
import type { Principal } from '@ratewarden/shared/permissions';
import { duplicateRows, readAudiogramHeader, readAudiogramRow, type AudiogramProblem, type AudiogramRow } from '@ratewarden/shared/hearing/audiogram-rows';
import type { HearingSettings } from '@ratewarden/shared/hearing/audiometric-history';
import type { AudiogramUploadResponse } from '@ratewarden/shared/hearing/hearing-view';
import { recordAudit } from '../../audit/audit-log';
import { assertSites } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import { readSheet } from './audiogram-file';
import { deriveShiftCases } from './shift-cases';

export interface AudiogramIntakeInput {
  fileName: string;
  bytes: Buffer;
  principal: Principal;
  ip?: string | null;
  settings: HearingSettings & { outcomeCode: string };
  /** Today (YYYY-MM-DD) for the date check; the server's clock by default. */
  today?: string;
}

/** Problems kept in an answer; the count says how many there were. */
const PROBLEM_LIMIT = 1000;

function reject(problems: AudiogramProblem[]): never {
  problems.sort((a, b) => a.line - b.line);
  const more = problems.length > 1 ? ` (and ${problems.length - 1} more problems)` : '';
  const p = problems[0]!;
  throw new AppError('validation_failed', `the file was rejected: line ${p.line}${p.column ? `, ${p.column}` : ''}: ${p.reason}${more}`, {
    problems: problems.slice(0, PROBLEM_LIMIT),
    problemCount: problems.length,
  });
}

/**
 * Checks an audiogram file whole and stores it whole, or rejects it with every problem by line and
 * column: cell rules (shared/src/hearing/audiogram-rows.ts), known workers, tests already stored,
 * the uploader's sites. Stored, it derives the standard threshold shifts of the workers it touches
 * into suspected cases (shift-cases.ts) and asks for a run, in the same transaction.
 */
export async function receiveAudiograms(ds: DataSource, input: AudiogramIntakeInput): Promise<AudiogramUploadResponse> {
  const { lines } = await readSheet(input.bytes);
  if (!lines.length) reject([{ line: 1, column: null, value: null, reason: 'the file is empty' }]);
  const header = readAudiogramHeader(lines[0]!.cells);
  if (header.problems.length) reject(header.problems);
  const today = input.today ?? new Date().toISOString().slice(0, 10);
  const problems: AudiogramProblem[] = [];
  const rows: AudiogramRow[] = [];
  for (const l of lines.slice(1)) {
    const r = readAudiogramRow(l.cells, l.line, header.index, today);
    problems.push(...r.problems);
    if (r.row) rows.push(r.row);
  }
  problems.push(...duplicateRows(rows));
  if (!rows.length && !problems.length) problems.push({ line: 2, column: null, value: null, reason: 'the file has a header row but no data rows' });
  if (problems.length) reject(problems);

  return ds.transaction(async (em) => {
    const outcome = await em
      .getRepository(OutcomeEntity)
      .createQueryBuilder('o')
      .select(['o.id'])
      .where('upper(o.code) = upper(:code)', { code: input.settings.outcomeCode })
      .getOne();
    if (!outcome)
      throw new AppError('conflict', `there is no outcome ${input.settings.outcomeCode} for the threshold shifts: create it first (HEARING_OUTCOME_CODE)`);

    const keys = [...new Set(rows.map((r) => r.workerKey))];
    // One array parameter, however many workers the file names.
    const workers = await em
      .getRepository(WorkerEntity)
      .createQueryBuilder('w')
      .select(['w.id', 'w.workerKey'])
      .where('w.workerKey = ANY(:keys)', { keys })
      .getMany();
    const known = new Map(workers.map((w) => [w.workerKey, w.id]));
    for (const r of rows)
      if (!known.has(r.workerKey))
        problems.push({
          line: r.line,
          column: 'worker_key',
          value: r.workerKey,
          reason: 'no worker with this key is known (send a roster with the worker first)',
        });
    const tests = await dbRows<{ k: string }>(
      em,
      `SELECT w.worker_key || '|' || to_char(a.test_date, 'YYYY-MM-DD') || '|' || a.ear || '|' || a.test_type AS k
       FROM audiograms a JOIN workers w ON w.id = a.worker_id WHERE w.worker_key = ANY($1::text[])`,
      [keys],
    );
    const stored = new Set(tests.map((r) => r.k));
    for (const r of rows) {
      if (stored.has(`${r.workerKey}|${r.testDate}|${r.ear}|${r.testType}`))
        problems.push({ line: r.line, column: 'test_date', value: r.testDate, reason: 'this test (worker, date, ear, type) is already stored' });
    }
    if (problems.length) reject(problems);

    const workerIds = [...new Set(known.values())];
    const sites = (
      await dbRows<{ site_id: number }>(
        em,
        `SELECT DISTINCT re.site_id FROM roster_entries re
       JOIN roster_slices rs ON rs.intake_id = re.intake_id AND rs.site_id = re.site_id AND rs.month = re.month
       WHERE re.worker_id = ANY($1::bigint[]) ORDER BY 1`,
        [workerIds],
      )
    ).map((r) => r.site_id);
    assertSites(input.principal, sites);

    const id = randomUUID();
    const checksum = createHash('sha256').update(input.bytes).digest('hex');
    const [submittedBy, submittedByClient] = input.principal.kind === 'user' ? [input.principal.id, null] : [null, input.principal.clientId];
    const dates = rows.map((r) => r.testDate).sort();
    // Checked and applied at once: the file was checked whole above. Months as their first day.
    const monthOf = (date: string) => `${date.slice(0, 7)}-01`;
    await em.getRepository(IntakeEntity).insert({
      id,
      kind: 'cases',
      state: 'applied',
      fileName: input.fileName,
      checksum,
      sizeBytes: String(input.bytes.length),
      rowCount: rows.length,
      submittedBy,
      submittedByClient,
      siteIds: sites,
      monthFrom: monthOf(dates[0]!),
      monthTo: monthOf(dates[dates.length - 1]!),
      checkedAt: () => 'now()',
      appliedAt: () => 'now()',
    });
    const col = <T>(f: (r: AudiogramRow) => T) => rows.map(f);
    await em.query(
      `INSERT INTO audiograms (intake_id, worker_id, test_date, ear, test_type, hl_500, hl_1000, hl_2000, hl_3000, hl_4000, hl_6000, hl_8000)
       SELECT $1, * FROM unnest($2::bigint[], $3::date[], $4::text[], $5::text[], $6::int[], $7::int[], $8::int[], $9::int[], $10::int[], $11::int[], $12::int[])`,
      [
        id,
        col((r) => known.get(r.workerKey)),
        col((r) => r.testDate),
        col((r) => r.ear),
        col((r) => r.testType),
        col((r) => r.thresholds[500]),
        col((r) => r.thresholds[1000]),
        col((r) => r.thresholds[2000]),
        col((r) => r.thresholds[3000]),
        col((r) => r.thresholds[4000]),
        col((r) => r.thresholds[6000]),
        col((r) => r.thresholds[8000] ?? null),
      ],
    );
    await deriveShiftCases(em, id, workerIds, outcome.id, input.settings);
    await requestRun(em, 'audiograms applied', { intakeId: id });
    // No count of derived shifts in the entry: the administrator reads the log, and shifts are case-level.
    await recordAudit(em, {
      actor: input.principal,
      action: 'audiograms.apply',
      target: `intake:${id}`,
      ip: input.ip,
      detail: { fileName: input.fileName, rows: rows.length, checksum },
    });
    return { intakeId: id, rows: rows.length, workers: workerIds.length };
  });
}
