import { createHash } from 'node:crypto';
import { In, type DataSource, type FindOptionsWhere } from 'typeorm';
import { OutcomeEntity, ReferenceRateEntity, ReferenceRateTableEntity, UserEntity, type ReferenceRateTable } from '@ratewarden/db/entities/index';
import { rows as sqlRows } from '@ratewarden/db/sql';
import { requestRun } from '@ratewarden/db/run-requests';
import type { Principal } from '@ratewarden/shared/permissions';
import type { ReferenceRateRow, ReferenceTable } from '@ratewarden/shared/reference-rates';
import { recordAudit } from '../../audit/audit-log';
import { AppError } from '../../lib/app-error';
import { checkReferenceFile } from './reference-rates-check';

const iso = (d: Date | null) => (d === null ? null : d.toISOString());

/** What a version covers: its outcomes' codes and its years. */
interface Coverage {
  tableId: number;
  outcomeCodes: string[];
  yearFrom: number;
  yearTo: number;
}

/** The versions that match, newest first, with their uploader's name and what they cover. */
async function tablesWhere(ds: DataSource, where: FindOptionsWhere<ReferenceRateTable> = {}): Promise<ReferenceTable[]> {
  const tables = await ds.getRepository(ReferenceRateTableEntity).find({ where, order: { id: 'DESC' } });
  if (!tables.length) return [];
  const uploaderIds = [...new Set(tables.flatMap((t) => (t.uploadedBy === null ? [] : [t.uploadedBy])))];
  const uploaders = uploaderIds.length ? await ds.getRepository(UserEntity).find({ select: { id: true, name: true }, where: { id: In(uploaderIds) } }) : [];
  const nameOf = new Map(uploaders.map((u) => [u.id, u.name]));
  const coverage = await ds
    .getRepository(ReferenceRateEntity)
    .createQueryBuilder('r')
    .innerJoin(OutcomeEntity.options.name, 'o', 'o.id = r.outcomeId')
    .select('r.tableId', 'tableId')
    .addSelect('array_agg(DISTINCT o.code ORDER BY o.code)', 'outcomeCodes')
    .addSelect('min(r.year)', 'yearFrom')
    .addSelect('max(r.year)', 'yearTo')
    .where('r.tableId IN (:...ids)', { ids: tables.map((t) => t.id) })
    .groupBy('r.tableId')
    .getRawMany<Coverage>();
  const coverageOf = new Map(coverage.map((c) => [c.tableId, c]));
  return tables.map((t) => {
    const covers = coverageOf.get(t.id);
    return {
      id: t.id,
      version: t.id,
      state: t.state,
      fileName: t.fileName,
      rowCount: t.rowCount,
      problemCount: t.problemCount,
      problems: t.problems,
      sources: t.sources,
      outcomeCodes: covers?.outcomeCodes ?? [],
      yearFrom: covers?.yearFrom ?? null,
      yearTo: covers?.yearTo ?? null,
      uploadedBy: t.uploadedBy === null ? null : (nameOf.get(t.uploadedBy) ?? null),
      createdAt: iso(t.createdAt)!,
      supersededAt: iso(t.supersededAt),
    };
  });
}

async function tableById(ds: DataSource, id: number): Promise<ReferenceTable> {
  const [table] = await tablesWhere(ds, { id });
  if (!table) throw new AppError('not_found', 'no such reference-rate version');
  return table;
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
      const tables = em.getRepository(ReferenceRateTableEntity);
      const { id: rejectedId } = await tables.save(
        tables.create({
          state: 'rejected',
          fileName: up.fileName,
          checksum,
          problemCount: checked.problems.length,
          problems: checked.problems.slice(0, 1000),
          uploadedBy,
        }),
      );
      await recordAudit(em, {
        actor: up.principal,
        action: 'reference.reject',
        target: `reference_rates:${rejectedId}`,
        detail: { fileName: up.fileName, problems: checked.problems.length },
        ip: up.ip,
      });
      return rejectedId;
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
    const tables = em.getRepository(ReferenceRateTableEntity);
    await tables.update({ state: 'applied' }, { state: 'superseded', supersededAt: () => 'now()' });
    const { id: tableId } = await tables.save(tables.create({ state: 'applied', fileName: up.fileName, checksum, rowCount: rows.length, sources, uploadedBy }));
    // The rows in one set-wise statement (a table has thousands).
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
  return tablesWhere(ds);
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
  const rates = await sqlRows<ReferenceRateRow>(
    ds,
    `SELECT o.code AS "outcomeCode", r.sex, r.age_from AS "ageFrom", r.age_to AS "ageTo", r.year, r.rate, r.source
     FROM reference_rates r JOIN outcomes o ON o.id = r.outcome_id
     WHERE r.table_id = $1 ORDER BY o.code, r.year, r.sex, r.age_from`,
    [id],
  );
  return { table, rates };
}
