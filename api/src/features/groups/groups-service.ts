import type { DataSource, EntityManager } from 'typeorm';
import type {
  ConfigChange,
  ExposureGroupCreate,
  ExposureGroupDto,
  ExposureGroupUpdate,
  OutcomeCreate,
  OutcomeDto,
  OutcomeUpdate,
} from '@ratewarden/shared/groups';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordAudit } from '../../audit/audit-log';
import { AppError } from '../../lib/app-error';
import { changedFields } from '../../lib/changed-fields';

const groupCols = `id, code, name, hazard, exposure_level AS "exposureLevel", is_reference AS "isReference", description, updated_at AS "updatedAt"`;
const outcomeCols = `id, code, name, case_definition AS "caseDefinition", counting_rule AS "countingRule", lag_months AS "lagMonths",
  reference_group_id AS "referenceGroupId", updated_at AS "updatedAt"`;

type Row<T> = Omit<T, 'updatedAt'> & { updatedAt: Date | string };
const dto = <T extends { updatedAt: string }>(r: Row<T>): T => ({ ...r, updatedAt: new Date(r.updatedAt).toISOString() }) as T;

export async function listGroups(db: DataSource | EntityManager): Promise<ExposureGroupDto[]> {
  const rows: Row<ExposureGroupDto>[] = await db.query(`SELECT ${groupCols} FROM exposure_groups ORDER BY exposure_level NULLS LAST, code`);
  return rows.map(dto);
}

export async function listOutcomes(db: DataSource | EntityManager): Promise<OutcomeDto[]> {
  const rows: Row<OutcomeDto>[] = await db.query(`SELECT ${outcomeCols} FROM outcomes ORDER BY code`);
  return rows.map(dto);
}

async function groupById(em: EntityManager, id: number, lock = false): Promise<ExposureGroupDto> {
  const rows: Row<ExposureGroupDto>[] = await em.query(`SELECT ${groupCols} FROM exposure_groups WHERE id = $1${lock ? ' FOR UPDATE' : ''}`, [id]);
  if (!rows[0]) throw new AppError('not_found', 'no such exposure group');
  return dto(rows[0]);
}

async function outcomeById(em: EntityManager, id: number, lock = false): Promise<OutcomeDto> {
  const rows: Row<OutcomeDto>[] = await em.query(`SELECT ${outcomeCols} FROM outcomes WHERE id = $1${lock ? ' FOR UPDATE' : ''}`, [id]);
  if (!rows[0]) throw new AppError('not_found', 'no such outcome');
  return dto(rows[0]);
}

/** Without the timestamp, so the history shows only what someone changed. */
const plain = <T extends { updatedAt: string }>(x: T): Omit<T, 'updatedAt'> => {
  const { updatedAt: _u, ...rest } = x;
  return rest;
};

function uniqueViolation(err: unknown, what: string): never {
  if ((err as { code?: string }).code === '23505') throw new AppError('conflict', `${what} already exists`);
  throw err;
}

export async function createGroup(ds: DataSource, p: Principal, body: ExposureGroupCreate, ip?: string | null): Promise<ExposureGroupDto> {
  return ds.transaction(async (em) => {
    const [{ id }] = await em
      .query(`INSERT INTO exposure_groups (code, name, hazard, exposure_level, description) VALUES ($1, $2, $3, $4, $5) RETURNING id`, [
        body.code,
        body.name,
        body.hazard,
        body.exposureLevel,
        body.description,
      ])
      .catch((e: unknown) => uniqueViolation(e, `an exposure group with code ${body.code}`));
    const after = await groupById(em, id);
    await recordAudit(em, { actor: p, action: 'group.create', target: `exposure_group:${id}`, ip, detail: { before: null, after: plain(after) } });
    return after;
  });
}

export async function updateGroup(ds: DataSource, p: Principal, id: number, body: ExposureGroupUpdate, ip?: string | null): Promise<ExposureGroupDto> {
  return ds.transaction(async (em) => {
    const before = await groupById(em, id, true);
    // A PATCH that changes nothing is neither written nor audited.
    if (!changedFields(before, body).length) return before;
    const next = { ...before, ...body };
    await em.query(`UPDATE exposure_groups SET name = $2, hazard = $3, exposure_level = $4, description = $5, updated_at = now() WHERE id = $1`, [
      id,
      next.name,
      next.hazard,
      next.exposureLevel,
      next.description,
    ]);
    const after = await groupById(em, id);
    await recordAudit(em, { actor: p, action: 'group.update', target: `exposure_group:${id}`, ip, detail: { before: plain(before), after: plain(after) } });
    return after;
  });
}

/** Makes one group the global reference (the one other groups are compared with); the old one stops being it. */
export async function setReferenceGroup(ds: DataSource, p: Principal, id: number, ip?: string | null): Promise<ExposureGroupDto[]> {
  return ds.transaction(async (em) => {
    const target = await groupById(em, id, true);
    const previous: Array<{ id: number }> = await em.query(`SELECT id FROM exposure_groups WHERE is_reference FOR UPDATE`);
    await em.query(`UPDATE exposure_groups SET is_reference = false, updated_at = now() WHERE is_reference AND id <> $1`, [id]);
    await em.query(`UPDATE exposure_groups SET is_reference = true, updated_at = now() WHERE id = $1`, [id]);
    for (const prev of previous.filter((r) => r.id !== id)) {
      await recordAudit(em, {
        actor: p,
        action: 'group.update',
        target: `exposure_group:${prev.id}`,
        ip,
        detail: { before: { isReference: true }, after: { isReference: false } },
      });
    }
    await recordAudit(em, {
      actor: p,
      action: 'group.set_reference',
      target: `exposure_group:${id}`,
      ip,
      detail: { before: { isReference: target.isReference }, after: { isReference: true } },
    });
    return listGroups(em);
  });
}

/** Sets the ordinal levels of several groups in one change (e.g. after re-ranking them). */
export async function setExposureLevels(
  ds: DataSource,
  p: Principal,
  levels: Array<{ id: number; exposureLevel: number | null }>,
  ip?: string | null,
): Promise<ExposureGroupDto[]> {
  return ds.transaction(async (em) => {
    for (const l of levels) {
      const before = await groupById(em, l.id, true);
      if (before.exposureLevel === l.exposureLevel) continue;
      await em.query(`UPDATE exposure_groups SET exposure_level = $2, updated_at = now() WHERE id = $1`, [l.id, l.exposureLevel]);
      await recordAudit(em, {
        actor: p,
        action: 'group.update',
        target: `exposure_group:${l.id}`,
        ip,
        detail: { before: { exposureLevel: before.exposureLevel }, after: { exposureLevel: l.exposureLevel } },
      });
    }
    return listGroups(em);
  });
}

async function assertGroupExists(em: EntityManager, id: number | null | undefined): Promise<void> {
  if (id == null) return;
  const rows: unknown[] = await em.query(`SELECT 1 FROM exposure_groups WHERE id = $1`, [id]);
  if (!rows.length)
    throw new AppError('validation_failed', 'the reference group does not exist', [{ path: 'referenceGroupId', message: 'no such exposure group' }]);
}

export async function createOutcome(ds: DataSource, p: Principal, body: OutcomeCreate, ip?: string | null): Promise<OutcomeDto> {
  return ds.transaction(async (em) => {
    await assertGroupExists(em, body.referenceGroupId);
    const [{ id }] = await em
      .query(`INSERT INTO outcomes (code, name, case_definition, counting_rule, lag_months, reference_group_id) VALUES ($1, $2, $3, $4, $5, $6) RETURNING id`, [
        body.code,
        body.name,
        body.caseDefinition,
        body.countingRule,
        body.lagMonths,
        body.referenceGroupId,
      ])
      .catch((e: unknown) => uniqueViolation(e, `an outcome with code ${body.code}`));
    const after = await outcomeById(em, id);
    await recordAudit(em, { actor: p, action: 'outcome.create', target: `outcome:${id}`, ip, detail: { before: null, after: plain(after) } });
    return after;
  });
}

export async function updateOutcome(ds: DataSource, p: Principal, id: number, body: OutcomeUpdate, ip?: string | null): Promise<OutcomeDto> {
  return ds.transaction(async (em) => {
    const before = await outcomeById(em, id, true);
    if (!changedFields(before, body).length) return before;
    await assertGroupExists(em, body.referenceGroupId);
    const next = { ...before, ...body };
    await em.query(
      `UPDATE outcomes SET name = $2, case_definition = $3, counting_rule = $4, lag_months = $5, reference_group_id = $6, updated_at = now() WHERE id = $1`,
      [id, next.name, next.caseDefinition, next.countingRule, next.lagMonths, next.referenceGroupId],
    );
    const after = await outcomeById(em, id);
    await recordAudit(em, { actor: p, action: 'outcome.update', target: `outcome:${id}`, ip, detail: { before: plain(before), after: plain(after) } });
    return after;
  });
}

/** The kept history of one group or outcome, newest first. */
export async function configHistory(ds: DataSource, kind: 'exposure_group' | 'outcome', id: number): Promise<ConfigChange[]> {
  const rows: Array<{
    at: Date;
    actor_label: string;
    action: string;
    detail: { before?: Record<string, unknown> | null; after?: Record<string, unknown> | null };
  }> = await ds.query(`SELECT at, actor_label, action, detail FROM audit_events WHERE target = $1 ORDER BY at DESC, id DESC LIMIT 500`, [`${kind}:${id}`]);
  return rows.map((r) => ({
    at: new Date(r.at).toISOString(),
    actor: r.actor_label,
    action: r.action,
    before: r.detail.before ?? null,
    after: r.detail.after ?? null,
  }));
}
