import type { DataSource, EntityManager } from 'typeorm';
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

const cols = `id, name, outcome_id AS "outcomeId", exposure_group_id AS "exposureGroupId", site_ids AS "siteIds", measure, threshold_on AS "thresholdOn",
  threshold, min_cases AS "minCases", min_expected AS "minExpected", window_kind AS "window", consecutive_periods AS "consecutivePeriods",
  fdr_control AS "fdrControl", fdr_level AS "fdrLevel", recipients, active, created_at AS "createdAt", updated_at AS "updatedAt"`;

type Row = Omit<WatchRule, 'createdAt' | 'updatedAt'> & { createdAt: Date; updatedAt: Date };
const dto = (r: Row): WatchRule => ({ ...r, createdAt: r.createdAt.toISOString(), updatedAt: r.updatedAt.toISOString() });

export async function listRules(ds: DataSource): Promise<WatchRule[]> {
  const rows: Row[] = await ds.query(`SELECT ${cols} FROM watch_rules ORDER BY created_at`);
  return rows.map(dto);
}

async function ruleById(db: DataSource | EntityManager, id: string, lock = false): Promise<WatchRule> {
  const rows: Row[] = await db.query(`SELECT ${cols} FROM watch_rules WHERE id = $1${lock ? ' FOR UPDATE' : ''}`, [id]);
  if (!rows[0]) throw new AppError('not_found', 'no such watch rule');
  return dto(rows[0]);
}

export const getRule = (ds: DataSource, id: string) => ruleById(ds, id);

/** The outcome, exposure group and sites a rule names must exist. */
async function assertTargets(em: EntityManager, outcomeId: number, groupId: number | null, siteIds: number[] | null): Promise<void> {
  const problems: Array<{ path: string; message: string }> = [];
  if (!(await em.query(`SELECT 1 FROM outcomes WHERE id = $1`, [outcomeId])).length) problems.push({ path: 'outcomeId', message: 'no such outcome' });
  if (groupId !== null && !(await em.query(`SELECT 1 FROM exposure_groups WHERE id = $1`, [groupId])).length)
    problems.push({ path: 'exposureGroupId', message: 'no such exposure group' });
  if (siteIds !== null) {
    const missing: Array<{ id: number }> = await em.query(`SELECT x AS id FROM unnest($1::int[]) x WHERE NOT EXISTS (SELECT 1 FROM sites s WHERE s.id = x)`, [
      siteIds,
    ]);
    if (missing.length) problems.push({ path: 'siteIds', message: `no such site: ${missing.map((m) => m.id).join(', ')}` });
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
    const [row]: Array<{ id: string }> = await em.query(
      `INSERT INTO watch_rules (name, outcome_id, exposure_group_id, site_ids, measure, threshold_on, threshold, min_cases, min_expected, window_kind,
         consecutive_periods, fdr_control, fdr_level, recipients, active, created_by)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15, $16) RETURNING id`,
      [
        r.name,
        r.outcomeId,
        r.exposureGroupId,
        r.siteIds,
        r.measure,
        r.thresholdOn,
        r.threshold,
        r.minCases,
        r.minExpected,
        r.window,
        r.consecutivePeriods,
        r.fdrControl,
        r.fdrLevel,
        r.recipients,
        r.active,
        principal.kind === 'user' ? principal.id : null,
      ],
    );
    const rule = await ruleById(em, row!.id);
    await recordAudit(em, { actor: principal, action: 'rule.create', target: `watch_rule:${rule.id}`, detail: { rule }, ip });
    return rule;
  });
}

const columnOf: Record<keyof WatchRulePatch, string> = {
  name: 'name',
  outcomeId: 'outcome_id',
  exposureGroupId: 'exposure_group_id',
  siteIds: 'site_ids',
  measure: 'measure',
  thresholdOn: 'threshold_on',
  threshold: 'threshold',
  minCases: 'min_cases',
  minExpected: 'min_expected',
  window: 'window_kind',
  consecutivePeriods: 'consecutive_periods',
  fdrControl: 'fdr_control',
  fdrLevel: 'fdr_level',
  recipients: 'recipients',
  active: 'active',
};

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
    await em.query(`UPDATE watch_rules SET ${keys.map((k, i) => `${columnOf[k]} = $${i + 2}`).join(', ')}, updated_at = now() WHERE id = $1`, [
      id,
      ...keys.map((k) => patch[k]),
    ]);
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
    if ((await em.query(`SELECT 1 FROM flags WHERE rule_id = $1 LIMIT 1`, [id])).length) {
      throw new AppError('conflict', 'this watch rule has raised flags; deactivate it instead so that their history stays');
    }
    await em.query(`DELETE FROM watch_rules WHERE id = $1`, [id]);
    await recordAudit(em, { actor: principal, action: 'rule.delete', target: `watch_rule:${id}`, detail: { before }, ip });
  });
}
