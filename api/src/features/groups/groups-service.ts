import { Not, type DataSource, type EntityManager } from 'typeorm';
import { AuditEventEntity, ExposureGroupEntity, OutcomeEntity, type ExposureGroup, type Outcome } from '@ratewarden/db';
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

/** An exposure group as the API answers it. */
const groupDto = (g: ExposureGroup): ExposureGroupDto => ({
  id: g.id,
  code: g.code,
  name: g.name,
  hazard: g.hazard,
  exposureLevel: g.exposureLevel,
  isReference: g.isReference,
  description: g.description,
  updatedAt: g.updatedAt.toISOString(),
});

/** An outcome as the API answers it. */
const outcomeDto = (o: Outcome): OutcomeDto => ({
  id: o.id,
  code: o.code,
  name: o.name,
  caseDefinition: o.caseDefinition,
  countingRule: o.countingRule,
  lagMonths: o.lagMonths,
  referenceGroupId: o.referenceGroupId,
  updatedAt: o.updatedAt.toISOString(),
});

const forUpdate = (lock: boolean) => (lock ? { lock: { mode: 'pessimistic_write' as const } } : {});

export async function listGroups(db: DataSource | EntityManager): Promise<ExposureGroupDto[]> {
  const groups = await db.getRepository(ExposureGroupEntity).find({ order: { exposureLevel: { direction: 'ASC', nulls: 'LAST' }, code: 'ASC' } });
  return groups.map(groupDto);
}

export async function listOutcomes(db: DataSource | EntityManager): Promise<OutcomeDto[]> {
  return (await db.getRepository(OutcomeEntity).find({ order: { code: 'ASC' } })).map(outcomeDto);
}

async function groupById(em: EntityManager, id: number, lock = false): Promise<ExposureGroupDto> {
  const group = await em.getRepository(ExposureGroupEntity).findOne({ where: { id }, ...forUpdate(lock) });
  if (!group) throw new AppError('not_found', 'no such exposure group');
  return groupDto(group);
}

async function outcomeById(em: EntityManager, id: number, lock = false): Promise<OutcomeDto> {
  const outcome = await em.getRepository(OutcomeEntity).findOne({ where: { id }, ...forUpdate(lock) });
  if (!outcome) throw new AppError('not_found', 'no such outcome');
  return outcomeDto(outcome);
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
    const { id } = await em
      .getRepository(ExposureGroupEntity)
      .save({ code: body.code, name: body.name, hazard: body.hazard, exposureLevel: body.exposureLevel, description: body.description })
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
    await em
      .getRepository(ExposureGroupEntity)
      .update(id, { name: next.name, hazard: next.hazard, exposureLevel: next.exposureLevel, description: next.description });
    const after = await groupById(em, id);
    await recordAudit(em, { actor: p, action: 'group.update', target: `exposure_group:${id}`, ip, detail: { before: plain(before), after: plain(after) } });
    return after;
  });
}

/** Makes one group the global reference (the one other groups are compared with); the old one stops being it. */
export async function setReferenceGroup(ds: DataSource, p: Principal, id: number, ip?: string | null): Promise<ExposureGroupDto[]> {
  return ds.transaction(async (em) => {
    const target = await groupById(em, id, true);
    const groups = em.getRepository(ExposureGroupEntity);
    const previous = await groups.find({ select: { id: true }, where: { isReference: true }, lock: { mode: 'pessimistic_write' } });
    // The old reference first: one group at a time holds it (unique index exposure_groups_one_reference).
    await groups.update({ isReference: true, id: Not(id) }, { isReference: false });
    await groups.update(id, { isReference: true });
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
      await em.getRepository(ExposureGroupEntity).update(l.id, { exposureLevel: l.exposureLevel });
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
  if (!(await em.getRepository(ExposureGroupEntity).existsBy({ id })))
    throw new AppError('validation_failed', 'the reference group does not exist', [{ path: 'referenceGroupId', message: 'no such exposure group' }]);
}

export async function createOutcome(ds: DataSource, p: Principal, body: OutcomeCreate, ip?: string | null): Promise<OutcomeDto> {
  return ds.transaction(async (em) => {
    await assertGroupExists(em, body.referenceGroupId);
    const { id } = await em
      .getRepository(OutcomeEntity)
      .save({
        code: body.code,
        name: body.name,
        caseDefinition: body.caseDefinition,
        countingRule: body.countingRule,
        lagMonths: body.lagMonths,
        referenceGroupId: body.referenceGroupId,
      })
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
    await em.getRepository(OutcomeEntity).update(id, {
      name: next.name,
      caseDefinition: next.caseDefinition,
      countingRule: next.countingRule,
      lagMonths: next.lagMonths,
      referenceGroupId: next.referenceGroupId,
    });
    const after = await outcomeById(em, id);
    await recordAudit(em, { actor: p, action: 'outcome.update', target: `outcome:${id}`, ip, detail: { before: plain(before), after: plain(after) } });
    return after;
  });
}

/** The kept history of one group or outcome, newest first. */
export async function configHistory(ds: DataSource, kind: 'exposure_group' | 'outcome', id: number): Promise<ConfigChange[]> {
  const events = await ds.getRepository(AuditEventEntity).find({
    select: { at: true, actorLabel: true, action: true, detail: true },
    where: { target: `${kind}:${id}` },
    order: { at: 'DESC', id: 'DESC' },
    take: 500,
  });
  return events.map((e) => {
    const detail = e.detail as { before?: Record<string, unknown> | null; after?: Record<string, unknown> | null };
    return { at: e.at.toISOString(), actor: e.actorLabel, action: e.action, before: detail.before ?? null, after: detail.after ?? null };
  });
}
