import type { DataSource } from 'typeorm';
import { IntakeCaseConflictEntity, type IntakeCaseConflict } from '@ratewarden/db/entities/intake-case-conflict';
import { IntakeEntity } from '@ratewarden/db/entities/intake';
import type { CaseConflict, CaseConflictResolution } from '@ratewarden/shared/cases';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordAudit } from '../../audit/audit-log';
import { assertSites, userOf } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import { reviewColumns, reviewOf, type ReviewRow } from './review-columns';

/** A conflict with its case, the decision it contradicts and its resolution, as the join below reads it. */
interface ConflictRow extends ReviewRow {
  case_ref: string;
  worker_key: string;
  onset: string;
  decided_status: IntakeCaseConflict['decidedStatus'];
  list_status: IntakeCaseConflict['listStatus'];
  resolution: IntakeCaseConflict['resolution'];
  resolved_by: string | null;
  resolved_at: Date | null;
}

async function intakeSites(ds: DataSource, principal: Principal, intakeId: string): Promise<void> {
  const it = await ds.getRepository(IntakeEntity).findOne({ select: { id: true, siteIds: true }, where: { id: intakeId, kind: 'cases' } });
  if (!it) throw new AppError('not_found', 'no such case list');
  assertSites(principal, it.siteIds);
}

/** The cases of a case list that contradict a physician's decision, with the decision and its resolution; audited. */
export async function listConflicts(ds: DataSource, principal: Principal, intakeId: string, ip?: string): Promise<CaseConflict[]> {
  await intakeSites(ds, principal, intakeId);
  const rows: ConflictRow[] = await ds.query(
    `SELECT k.case_ref, w.worker_key, to_char(e.onset_date, 'YYYY-MM-DD') AS onset, k.decided_status, k.list_status, k.resolution, ru.email AS resolved_by, k.resolved_at,
            ${reviewColumns('du')}
     FROM intake_case_conflicts k
     JOIN case_reviews r ON r.id = k.review_id
     JOIN users du ON du.id = r.decided_by
     JOIN case_events e ON e.review_id = r.id
     JOIN workers w ON w.id = e.worker_id
     LEFT JOIN users ru ON ru.id = k.resolved_by
     WHERE k.intake_id = $1 ORDER BY k.case_ref`,
    [intakeId],
  );
  await recordAudit(ds, { actor: principal, action: 'cases.read', target: `intake:${intakeId}`, detail: { read: 'case list conflicts' }, ip });
  return rows.map((r) => ({
    caseRef: r.case_ref,
    workerKey: r.worker_key,
    onsetDate: r.onset,
    decidedStatus: r.decided_status,
    listStatus: r.list_status,
    decision: reviewOf(r),
    resolution: r.resolution,
    resolvedBy: r.resolved_by,
    resolvedAt: r.resolved_at ? new Date(r.resolved_at).toISOString() : null,
  }));
}

/**
 * A physician resolves one conflict: keep the decision (the list's row for the case will not be
 * applied) or accept the list's status (applied with the list). Only while the list is checked.
 */
export async function resolveConflict(
  ds: DataSource,
  principal: Principal,
  intakeId: string,
  caseRef: string,
  resolution: CaseConflictResolution,
  ip?: string,
): Promise<CaseConflict[]> {
  const user = userOf({ principal });
  await intakeSites(ds, principal, intakeId);
  await ds.transaction(async (em) => {
    const it = await em
      .getRepository(IntakeEntity)
      .findOne({ select: { id: true, state: true }, where: { id: intakeId }, lock: { mode: 'pessimistic_write' } });
    if (it!.state !== 'checked') throw new AppError('conflict', `the case list is ${it!.state}; conflicts are decided before it is applied`);
    const conflicts = em.getRepository(IntakeCaseConflictEntity);
    if (!(await conflicts.existsBy({ intakeId, caseRef }))) throw new AppError('not_found', 'no such conflict in this case list');
    await conflicts.update({ intakeId, caseRef }, { resolution, resolvedBy: user.id, resolvedAt: () => 'now()' });
    await recordAudit(em, { actor: principal, action: 'case.conflict_resolve', target: `intake:${intakeId}`, detail: { resolution }, ip });
  });
  return listConflicts(ds, principal, intakeId, ip);
}
