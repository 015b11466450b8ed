import { createHash } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { OutcomeEntity, ReferenceRateTableEntity } from '@ratewarden/db/entities/index';
import { requestRun } from '@ratewarden/db/run-requests';
import type { Principal } from '@ratewarden/shared/permissions';
import type { ReferenceRateRow, ReferenceTable } from '@ratewarden/shared/reference-rates';
import { recordAudit } from '../../audit/audit-log';
import { AppError } from '../../lib/app-error';
import { checkReferenceFile } from './reference-rates-check';

type Row = Record<string, any>;

const tableCols = `t.id, t.state, t.file_name, t.row_count, t.problem_count, t.problems, t.sources, t.created_at, t.superseded_at, u.name AS uploaded_by,
  (SELECT coalesce(array_agg(DISTINCT o.code ORDER BY o.code), '{}') FROM reference_rates r JOIN outcomes o ON o.id = r.outcome_id WHERE r.table_id = t.id) AS outcome_codes,
  (SELECT min(year) FROM reference_rates r WHERE r.table_id = t.id) AS year_from,
  (SELECT max(year) FROM reference_rates r WHERE r.table_id = t.id) AS year_to`;
const tableFrom = `reference_rate_tables t LEFT JOIN users u ON u.id = t.uploaded_by`;

const iso = (d: Date | string | null) => (d === null ? null : new Date(d).toISOString());

function tableOf(r: Row): ReferenceTable {
  return {
    id: r.id,
    version: r.id,
    state: r.state,
    fileName: r.file_name,
    rowCount: r.row_count,
    problemCount: r.problem_count,
    problems: r.problems,
    sources: r.sources,
    outcomeCodes: r.outcome_codes,
    yearFrom: r.year_from,
    yearTo: r.year_to,
    uploadedBy: r.uploaded_by,
    createdAt: iso(r.created_at)!,
    supersededAt: iso(r.superseded_at),
  };
}

async function tableById(ds: DataSource, id: number): Promise<ReferenceTable> {
  const [row]: Row[] = await ds.query(`SELECT ${tableCols} FROM ${tableFrom} WHERE t.id = $1`, [id]);
  if (!row) throw new AppError('not_found', 'no such reference-rate version');
  return tableOf(row);
}

export interface ReferenceUpload {
  fileName: string;
  bytes: Buffer;
  principal: Principal;
  ip?: string;
}

/**
 * Takes in a reference-rate file whole or not at all. A file with problems is recorded as a
 * rejected version (with its problems, no rows) and answered 422; a good one becomes the applied
 * version in one transaction that supersedes the previous one (kept with its rows), audits the
 * upload and asks for a run. The same bytes as the applied version change nothing.
 */
export async function receiveReferenceTable(ds: DataSource, up: ReferenceUpload): Promise<{ table: ReferenceTable; duplicate: boolean }> {
  const checksum = createHash('sha256').update(up.bytes).digest('hex');
  const uploadedBy = up.principal.kind === 'user' ? up.principal.id : null;
  const same = await ds.getRepository(ReferenceRateTableEntity).findOne({ select: { id: true }, where: { state: 'applied', checksum } });
  if (same) return { table: await tableById(ds, same.id), duplicate: true };

  const outcomes = await ds.getRepository(OutcomeEntity).find({ select: { id: true, code: true } });
  const checked = checkReferenceFile(up.bytes.toString('utf8'), new Map(outcomes.map((o) => [o.code.toUpperCase(), o.id])));
  if (checked.problems.length) {
    const id = await ds.transaction(async (em) => {
      const [row]: Row[] = await em.query(
        `INSERT INTO reference_rate_tables (state, file_name, checksum, problem_count, problems, uploaded_by) VALUES ('rejected', $1, $2, $3, $4, $5) RETURNING id`,
        [up.fileName, checksum, checked.problems.length, JSON.stringify(checked.problems.slice(0, 1000)), uploadedBy],
      );
      await recordAudit(em, {
        actor: up.principal,
        action: 'reference.reject',
        target: `reference_rates:${row!.id}`,
        detail: { fileName: up.fileName, problems: checked.problems.length },
        ip: up.ip,
      });
      return row!.id as number;
    });
    const table = await tableById(ds, id);
    const more = table.problemCount > 1 ? ` (and ${table.problemCount - 1} more problems)` : '';
    throw new AppError('validation_failed', `the file was rejected: ${checked.problems[0]!.reason}${more}`, { table });
  }

  const rows = checked.rows;
  const sources = [...new Set(rows.map((r) => r.source))].sort();
  const id = await ds.transaction(async (em) => {
    // Serializes concurrent uploads: the second waits, then supersedes the first.
    await em.query(`LOCK TABLE reference_rate_tables IN SHARE ROW EXCLUSIVE MODE`);
    await em.query(`UPDATE reference_rate_tables SET state = 'superseded', superseded_at = now() WHERE state = 'applied'`);
    const [row]: Row[] = await em.query(
      `INSERT INTO reference_rate_tables (state, file_name, checksum, row_count, sources, uploaded_by) VALUES ('applied', $1, $2, $3, $4, $5) RETURNING id`,
      [up.fileName, checksum, rows.length, sources, uploadedBy],
    );
    const tableId = row!.id as number;
    await em.query(
      `INSERT INTO reference_rates (table_id, outcome_id, sex, age_from, age_to, year, rate, source)
       SELECT $1, * FROM unnest($2::int[], $3::text[], $4::int[], $5::int[], $6::int[], $7::float8[], $8::text[])`,
      [
        tableId,
        rows.map((r) => r.outcomeId),
        rows.map((r) => r.sex),
        rows.map((r) => r.ageFrom),
        rows.map((r) => r.ageTo),
        rows.map((r) => r.year),
        rows.map((r) => r.rate),
        rows.map((r) => r.source),
      ],
    );
    await recordAudit(em, {
      actor: up.principal,
      action: 'reference.apply',
      target: `reference_rates:${tableId}`,
      detail: { fileName: up.fileName, rows: rows.length, sources },
      ip: up.ip,
    });
    await requestRun(em, `reference rates version ${tableId} uploaded`);
    return tableId;
  });
  return { table: await tableById(ds, id), duplicate: false };
}

/** Every version, newest first. */
export async function listReferenceTables(ds: DataSource): Promise<ReferenceTable[]> {
  const rows: Row[] = await ds.query(`SELECT ${tableCols} FROM ${tableFrom} ORDER BY t.id DESC`);
  return rows.map(tableOf);
}

/** The rows of one version (the applied one by default). */
export async function referenceRatesOf(ds: DataSource, version: number | undefined): Promise<{ table: ReferenceTable; rates: ReferenceRateRow[] }> {
  let id = version;
  if (id === undefined) {
    const applied = await ds.getRepository(ReferenceRateTableEntity).findOne({ select: { id: true }, where: { state: 'applied' } });
    if (!applied) throw new AppError('not_found', 'no reference rates have been uploaded yet');
    id = applied.id;
  }
  const table = await tableById(ds, id);
  const rows: Row[] = await ds.query(
    `SELECT o.code, r.sex, r.age_from, r.age_to, r.year, r.rate, r.source FROM reference_rates r JOIN outcomes o ON o.id = r.outcome_id
     WHERE r.table_id = $1 ORDER BY o.code, r.year, r.sex, r.age_from`,
    [id],
  );
  return {
    table,
    rates: rows.map((r) => ({ outcomeCode: r.code, sex: r.sex, ageFrom: r.age_from, ageTo: r.age_to, year: r.year, rate: r.rate, source: r.source })),
  };
}
