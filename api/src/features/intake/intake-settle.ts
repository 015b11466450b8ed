import type { PoolClient } from 'pg';
import type { EntityManager } from 'typeorm';
import { requestRun } from '@ratewarden/db/run-requests';
import type { IntakeKind } from '@ratewarden/shared/intake';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordAudit } from '../../audit/audit-log';
import { AppError } from '../../lib/app-error';
import { hasOpenConflicts, leaveKeptCases, recordCaseConflicts } from './case-conflicts';
import { applyChecked, type CheckOutcome } from './intake-check';
import { dropStaging } from './staging-drop';
import { IntakeEntity } from '@ratewarden/db/entities/intake';

/** Records the checks' verdict; applies when asked and the file is clean ('if-clear': and no case contradicts a physician's decision). */
export async function settleChecked(
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
  await em.getRepository(IntakeEntity).update(id, {
    state: rejected ? 'rejected' : 'checked',
    problemCount: outcome.problemCount,
    problems: outcome.problems,
    diff: outcome.diff,
    siteIds: outcome.scope.siteIds,
    monthFrom: outcome.scope.monthFrom,
    monthTo: outcome.scope.monthTo,
    checkedAt: () => 'now()',
  });
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
  await em.getRepository(IntakeEntity).update(id, { state: 'applied', appliedAt: () => 'now()' });
  await dropStaging(client, id, table);
  await requestRun(em, `${kind === 'roster' ? 'roster' : 'case list'} intake applied`, { intakeId: id });
  await recordAudit(em, { actor: principal, action: 'intake.apply', target: `intake:${id}`, ip, detail: { kind, superseded } });
}
