import type { DataSource, EntityManager, ObjectLiteral, SelectQueryBuilder } from 'typeorm';
import { FlagEntity, FlagEventEntity, NoticeEntity, type FlagEventRow, type FlagRow } from '@ratewarden/db/entities/index';
import { rows } from '@ratewarden/db/sql';
import type { Principal } from '@ratewarden/shared/permissions';
import type { Flag, FlagCase, FlagCloseInput, FlagDetail, FlagState } from '@ratewarden/shared/flags';
import { attributingRow, countedByRule, onsetMonthOf, rosterMonthOf } from '@ratewarden/db/case-attribution';
import { ruleWindowSchema } from '@ratewarden/shared/rules';
import { windowMonths } from '@ratewarden/shared/windows';
import { recordAudit } from '../../audit/audit-log';
import { siteScope } from '../../auth/authorize';
import { readsEverySite } from '../../disclosure/run-frame';
import { AppError } from '../../lib/app-error';

const iso = (d: Date | string | null): string | null => (d === null ? null : new Date(d).toISOString());

/** A flag as flagSelect reads it: its columns, its period as text and the names it shows. */
interface FlagListRow {
  id: string;
  rule_id: string;
  rule_name: string;
  outcome_id: number;
  exposure_group_id: number;
  group_name: string;
  site_id: number | null;
  site_name: string | null;
  state: FlagState;
  close_reason: FlagRow['closeReason'];
  close_comment: string | null;
  period_iso: string;
  value: number;
  worst_value: number;
  crossing: boolean;
  detail: FlagRow['detail'];
  raised_at: Date;
  updated_at: Date;
  closed_at: Date | null;
}

const flagSelect = `SELECT f.*, to_char(f.period, 'YYYY-MM-DD') AS period_iso, r.name AS rule_name, g.name AS group_name, s.name AS site_name
  FROM flags f JOIN watch_rules r ON r.id = f.rule_id JOIN exposure_groups g ON g.id = f.exposure_group_id LEFT JOIN sites s ON s.id = f.site_id`;

/**
 * Which flags a person may see: a site's flags with access to that site, the company's only with
 * access to every site (their figures hold every site's workers). Applied in SQL on every read
 * and before every decision, as `($sites::int[] IS NULL OR …)`: `sites` null means every site.
 */
export interface FlagScope {
  sites: number[] | null;
  company: boolean;
}
export const everyFlag: FlagScope = { sites: null, company: true };

export async function flagScopeOf(ds: DataSource | EntityManager, principal: Principal): Promise<FlagScope> {
  const scope = siteScope(principal);
  return { sites: scope === 'all' ? null : scope, company: await readsEverySite(ds, principal) };
}

/** The SQL condition of a FlagScope on flags `f`, its two parameters at $n and $n+1. */
const visible = (n: number) =>
  `((f.site_id IS NULL AND $${n + 1}::boolean) OR (f.site_id IS NOT NULL AND ($${n}::int[] IS NULL OR f.site_id = ANY($${n}::int[]))))`;

/** The same condition on flags `f` of a query builder. */
function visibleIn<T extends ObjectLiteral>(qb: SelectQueryBuilder<T>, scope: FlagScope): SelectQueryBuilder<T> {
  const site = scope.sites === null ? 'f.siteId IS NOT NULL' : 'f.siteId = ANY(:sites)';
  return qb.andWhere(scope.company ? `(f.siteId IS NULL OR ${site})` : site, { sites: scope.sites });
}

function flagOf(r: FlagListRow): Flag {
  return {
    id: r.id,
    ruleId: r.rule_id,
    ruleName: r.rule_name,
    outcomeId: r.outcome_id,
    exposureGroupId: r.exposure_group_id,
    exposureGroupName: r.group_name,
    siteId: r.site_id,
    siteName: r.site_name,
    state: r.state,
    closeReason: r.close_reason,
    closeComment: r.close_comment,
    period: r.period_iso,
    value: r.value,
    worstValue: r.worst_value,
    crossing: r.crossing,
    figures: r.detail,
    raisedAt: iso(r.raised_at)!,
    updatedAt: iso(r.updated_at)!,
    closedAt: iso(r.closed_at),
  };
}

export async function listFlags(
  ds: DataSource,
  q: { state?: FlagState; outcomeId?: number; exposureGroupId?: number },
  scope: FlagScope = everyFlag,
): Promise<Flag[]> {
  const found = await rows<FlagListRow>(
    ds,
    `${flagSelect} WHERE ($1::text IS NULL OR f.state = $1) AND ($2::int IS NULL OR f.outcome_id = $2) AND ($3::int IS NULL OR f.exposure_group_id = $3) AND ${visible(4)}
     ORDER BY (f.state = 'closed'), f.raised_at DESC LIMIT 500`,
    [q.state ?? null, q.outcomeId ?? null, q.exposureGroupId ?? null, scope.sites, scope.company],
  );
  return found.map(flagOf);
}

/** One flag with its history and notices; a flag outside the reader's scope is "no such flag". */
export async function getFlag(ds: DataSource, id: string, scope: FlagScope = everyFlag): Promise<FlagDetail> {
  const [flag] = await rows<FlagListRow>(ds, `${flagSelect} WHERE f.id = $1 AND ${visible(2)}`, [id, scope.sites, scope.company]);
  if (!flag) throw new AppError('not_found', 'no such flag');
  const events = await ds.getRepository(FlagEventEntity).find({ where: { flagId: id }, order: { at: 'ASC', id: 'ASC' } });
  const notices = await ds.getRepository(NoticeEntity).find({
    select: { id: true, recipient: true, state: true, attempts: true, lastError: true, createdAt: true, sentAt: true },
    where: { flagId: id },
    order: { createdAt: 'ASC', recipient: 'ASC' },
  });
  return {
    ...flagOf(flag),
    events: events.map((e) => ({ id: e.id, at: iso(e.at)!, kind: e.kind, actorId: e.actorId, runId: e.runId, detail: e.detail })),
    notices: notices.map((n) => ({
      id: n.id,
      recipient: n.recipient,
      state: n.state,
      attempts: n.attempts,
      lastError: n.lastError,
      createdAt: iso(n.createdAt)!,
      sentAt: iso(n.sentAt),
    })),
  };
}

const actorId = (p: Principal) => (p.kind === 'user' ? p.id : null);

/** One event of a flag's history, in the caller's transaction. */
async function addEvent(em: EntityManager, event: Pick<FlagEventRow, 'flagId' | 'kind' | 'actorId' | 'detail'>): Promise<void> {
  const events = em.getRepository(FlagEventEntity);
  await events.save(events.create(event));
}

/** A flag's state, locked for a decision, when the person may see the flag. */
async function lockVisible(em: EntityManager, principal: Principal, id: string): Promise<Pick<FlagRow, 'id' | 'state'> | null> {
  const scope = await flagScopeOf(em, principal);
  const qb = em.getRepository(FlagEntity).createQueryBuilder('f').select(['f.id', 'f.state']).where('f.id = :id', { id });
  return visibleIn(qb, scope).setLock('pessimistic_write').getOne();
}

/** raised → in review. */
export async function startReview(ds: DataSource, principal: Principal, id: string, comment: string | undefined, ip?: string): Promise<FlagDetail> {
  await ds.transaction(async (em) => {
    const f = await lockVisible(em, principal, id);
    if (!f) throw new AppError('not_found', 'no such flag');
    if (f.state !== 'raised') throw new AppError('conflict', `the flag is ${f.state.replace('_', ' ')}, not raised`);
    await em.getRepository(FlagEntity).update({ id }, { state: 'in_review' });
    await addEvent(em, { flagId: id, kind: 'review_started', actorId: actorId(principal), detail: { comment: comment ?? null } });
    await recordAudit(em, { actor: principal, action: 'flag.review', target: `flag:${id}`, detail: { comment: comment ?? null }, ip });
  });
  return getFlag(ds, id, await flagScopeOf(ds, principal));
}

/** raised or in review → closed, with a reason and a comment. */
export async function closeFlag(ds: DataSource, principal: Principal, id: string, input: FlagCloseInput, ip?: string): Promise<FlagDetail> {
  await ds.transaction(async (em) => {
    const f = await lockVisible(em, principal, id);
    if (!f) throw new AppError('not_found', 'no such flag');
    if (f.state === 'closed') throw new AppError('conflict', 'the flag is already closed');
    await em
      .getRepository(FlagEntity)
      .update({ id }, { state: 'closed', closeReason: input.reason, closeComment: input.comment, closedAt: () => 'now()', closedBy: actorId(principal) });
    await addEvent(em, { flagId: id, kind: 'closed', actorId: actorId(principal), detail: { ...input } });
    await recordAudit(em, { actor: principal, action: 'flag.close', target: `flag:${id}`, detail: { ...input, from: f.state }, ip });
  });
  return getFlag(ds, id, await flagScopeOf(ds, principal));
}

/**
 * The cases counted in a flag's group, window and scope (a site flag: that site's), as the run
 * counted them: its counted statuses, and the attribution and first-event rule of
 * db/src/case-attribution.ts. Case-level data: the route lets only the
 * physician in, for flags they may see and within their sites, and every read is audited.
 */
export async function flagCases(ds: DataSource, principal: Principal, id: string, ip?: string): Promise<FlagCase[]> {
  const visibleTo = await flagScopeOf(ds, principal);
  const [f] = await rows<{
    outcome_id: number;
    exposure_group_id: number;
    site_id: number | null;
    period: Date;
    period_iso: string;
    window_kind: string | null;
    statuses: string[];
  }>(
    ds,
    `SELECT f.outcome_id, f.exposure_group_id, f.site_id, f.period, to_char(f.period, 'YYYY-MM-DD') AS period_iso, f.detail->>'window' AS window_kind, r.settings->'countedStatuses' AS statuses
     FROM flags f JOIN runs r ON r.id = f.last_run_id WHERE f.id = $1 AND ${visible(2)}`,
    [id, visibleTo.sites, visibleTo.company],
  );
  if (!f) throw new AppError('not_found', 'no such flag');
  // The months of the flag's window, by the one definition of windows (rules watch month and rolling 12 only).
  const months = windowMonths(ruleWindowSchema.parse(f.window_kind), f.period_iso).length;
  const scope = siteScope(principal);
  const cases = await rows<{ case_ref: string; worker_key: string; onset: string; status: FlagCase['status']; site_id: number }>(
    ds,
    `SELECT c.case_ref, w.worker_key, to_char(c.onset_date, 'YYYY-MM-DD') AS onset, c.status, a.site_id
     FROM case_events c
     JOIN outcomes o ON o.id = c.outcome_id
     JOIN workers w ON w.id = c.worker_id
     JOIN LATERAL (${attributingRow('c.worker_id', rosterMonthOf(onsetMonthOf('c.onset_date'), 'o.lag_months'))}) a ON true
     WHERE c.superseded_by IS NULL AND c.outcome_id = $1 AND c.status = ANY(ARRAY(SELECT jsonb_array_elements_text($2::jsonb)))
       AND a.exposure_group_id = $3
       AND date_trunc('month', c.onset_date) BETWEEN ($4::date - make_interval(months => $5 - 1)) AND $4::date
       AND ($6::int[] IS NULL OR a.site_id = ANY($6::int[]))
       AND ($7::int IS NULL OR a.site_id = $7)
       AND ${countedByRule('c', 'o.counting_rule', 'ARRAY(SELECT jsonb_array_elements_text($2::jsonb))')}
     ORDER BY c.onset_date, c.case_ref`,
    [f.outcome_id, JSON.stringify(f.statuses), f.exposure_group_id, f.period, months, scope === 'all' ? null : scope, f.site_id],
  );
  // No count in the entry: the administrator reads the audit log and may not see how many cases a flag has.
  await recordAudit(ds, { actor: principal, action: 'cases.read', target: `flag:${id}`, ip });
  return cases.map((r) => ({ caseRef: r.case_ref, workerKey: r.worker_key, onsetDate: r.onset, status: r.status, siteId: r.site_id }));
}
