import { In, type DataSource, type EntityManager } from 'typeorm';
import { ExposureGroupEntity, FlagEntity, OutcomeEntity, SiteEntity, WatchRuleEntity, type WatchRuleRow } from '@ratewarden/db';
import type { Principal } from '@ratewarden/shared/permissions';
import { watchRuleCompleteSchema, watchRuleSchemas, type WatchRule, type WatchRuleInput, type WatchRulePatch } from '@ratewarden/shared/rules';
import { DEFAULT_SMALL_CELL_THRESHOLD } from '@ratewarden/shared/small-cells';
import { recordAudit } from '../../audit/audit-log';
import { readsEverySite } from '../../disclosure/run-frame';
import { siteScope } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import { changedFields } from '../../lib/changed-fields';

export interface RuleWriteOptions {
  ip?: string;
  /** The configured SMALL_CELL_THRESHOLD: a rule's minimum case count may not be below it. */
  smallCellThreshold?: number;
}

/** A watch rule as the API answers it (the entity's `windowKind` is the rule's `window`). */
const ruleDto = (r: WatchRuleRow): WatchRule => ({
  id: r.id,
  name: r.name,
  outcomeId: r.outcomeId,
  exposureGroupId: r.exposureGroupId,
  siteIds: r.siteIds,
  measure: r.measure,
  thresholdOn: r.thresholdOn,
  threshold: r.threshold,
  minCases: r.minCases,
  minExpected: r.minExpected,
  window: r.windowKind,
  consecutivePeriods: r.consecutivePeriods,
  fdrControl: r.fdrControl,
  fdrLevel: r.fdrLevel,
  recipients: r.recipients,
  active: r.active,
  createdAt: r.createdAt.toISOString(),
  updatedAt: r.updatedAt.toISOString(),
});

/** The stored fields of a rule's fields as the API names them. */
function ruleFields(r: WatchRulePatch): Partial<WatchRuleRow> {
  const { window, ...same } = r;
  return window === undefined ? same : { ...same, windowKind: window };
}

export async function listRules(ds: DataSource): Promise<WatchRule[]> {
  return (await ds.getRepository(WatchRuleEntity).find({ order: { createdAt: 'ASC' } })).map(ruleDto);
}

async function ruleById(db: DataSource | EntityManager, id: string, lock = false): Promise<WatchRule> {
  const rule = await db.getRepository(WatchRuleEntity).findOne({ where: { id }, ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}) });
  if (!rule) throw new AppError('not_found', 'no such watch rule');
  return ruleDto(rule);
}

export const getRule = (ds: DataSource, id: string) => ruleById(ds, id);

/** The outcome, exposure group and sites a rule names must exist. */
async function assertTargets(em: EntityManager, outcomeId: number, groupId: number | null, siteIds: number[] | null): Promise<void> {
  const problems: Array<{ path: string; message: string }> = [];
  if (!(await em.getRepository(OutcomeEntity).existsBy({ id: outcomeId }))) problems.push({ path: 'outcomeId', message: 'no such outcome' });
  if (groupId !== null && !(await em.getRepository(ExposureGroupEntity).existsBy({ id: groupId })))
    problems.push({ path: 'exposureGroupId', message: 'no such exposure group' });
  if (siteIds !== null) {
    const found = new Set((await em.getRepository(SiteEntity).find({ select: { id: true }, where: { id: In(siteIds) } })).map((s) => s.id));
    const missing = siteIds.filter((id) => !found.has(id));
    if (missing.length) problems.push({ path: 'siteIds', message: `no such site: ${missing.join(', ')}` });
  }
  if (problems.length) throw new AppError('validation_failed', 'the watch rule is not valid', problems);
}

/**
 * Who may write a rule of a scope: a company-wide rule (null) only someone who reads every site
 * (its flags carry the company's figures); a site rule only someone with each of its sites.
 */
export async function assertRuleScope(db: DataSource | EntityManager, principal: Principal, siteIds: number[] | null): Promise<void> {
  if (siteIds === null) {
    if (!(await readsEverySite(db, principal)))
      throw new AppError('forbidden', 'a company-wide watch rule needs access to every site; choose among your sites instead');
    return;
  }
  const scope = siteScope(principal);
  if (scope === 'all') return;
  const outside = siteIds.filter((id) => !scope.includes(id));
  if (outside.length) throw new AppError('forbidden', `you have no access to site ${outside.join(', ')}`);
}

export async function createRule(
  ds: DataSource,
  principal: Principal,
  input: WatchRuleInput,
  { ip, smallCellThreshold = DEFAULT_SMALL_CELL_THRESHOLD }: RuleWriteOptions = {},
): Promise<WatchRule> {
  const r = watchRuleSchemas(smallCellThreshold).input.parse(input);
  return ds.transaction(async (em) => {
    await assertRuleScope(em, principal, r.siteIds);
    await assertTargets(em, r.outcomeId, r.exposureGroupId, r.siteIds);
    const { id } = await em.getRepository(WatchRuleEntity).save({ ...ruleFields(r), createdBy: principal.kind === 'user' ? principal.id : null });
    const rule = await ruleById(em, id);
    await recordAudit(em, { actor: principal, action: 'rule.create', target: `watch_rule:${rule.id}`, detail: { rule }, ip });
    return rule;
  });
}

/**
 * Applies a partial change; the merged rule is validated as a whole before it is stored. A patch
 * that changes nothing is neither written nor audited: the rule comes back as it was. The person
 * must be allowed the rule's scope both before and after the change.
 */
export async function updateRule(
  ds: DataSource,
  principal: Principal,
  id: string,
  input: WatchRulePatch,
  { ip, smallCellThreshold = DEFAULT_SMALL_CELL_THRESHOLD }: RuleWriteOptions = {},
): Promise<WatchRule> {
  const patch = watchRuleSchemas(smallCellThreshold).patch.parse(input);
  return ds.transaction(async (em) => {
    const before = await ruleById(em, id, true);
    await assertRuleScope(em, principal, before.siteIds);
    const keys = changedFields(before, patch);
    if (!keys.length) return before;
    const merged = { ...before, ...patch };
    watchRuleCompleteSchema.parse(merged);
    if (keys.includes('siteIds')) await assertRuleScope(em, principal, merged.siteIds);
    await assertTargets(em, merged.outcomeId, merged.exposureGroupId, merged.siteIds);
    await em.getRepository(WatchRuleEntity).update(id, ruleFields(Object.fromEntries(keys.map((k) => [k, patch[k]]))));
    const after = await ruleById(em, id);
    await recordAudit(em, { actor: principal, action: 'rule.update', target: `watch_rule:${id}`, detail: { before, after }, ip });
    return after;
  });
}

/** Deletes a rule that never raised a flag; one with flags keeps its history and can only be deactivated. */
export async function deleteRule(ds: DataSource, principal: Principal, id: string, ip?: string): Promise<void> {
  await ds.transaction(async (em) => {
    const before = await ruleById(em, id, true);
    await assertRuleScope(em, principal, before.siteIds);
    if (await em.getRepository(FlagEntity).existsBy({ ruleId: id })) {
      throw new AppError('conflict', 'this watch rule has raised flags; deactivate it instead so that their history stays');
    }
    await em.getRepository(WatchRuleEntity).delete(id);
    await recordAudit(em, { actor: principal, action: 'rule.delete', target: `watch_rule:${id}`, detail: { before }, ip });
  });
}
