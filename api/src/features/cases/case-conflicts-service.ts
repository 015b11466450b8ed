import type { DataSource } from 'typeorm';
import type { CaseConflict, CaseConflictResolution } from '@ratewarden/shared/cases';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordAudit } from '../../audit/audit-log';
import { assertSites, userOf } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';

type Row = Record<string, any>;

async function intakeSites(ds: DataSource, principal: Principal, intakeId: string): Promise<void> {
  const [it]: Row[] = await ds.query(`SELECT site_ids FROM intakes WHERE id = $1 AND kind = 'cases'`, [intakeId]);
  if (!it) throw new AppError('not_found', 'no such case list');
  assertSites(principal, it.site_ids);
}

/** The cases of a case list that contradict a physician's decision, with the decision and its resolution; audited. */
export async function listConflicts(ds: DataSource, principal: Principal, intakeId: string, ip?: string): Promise<CaseConflict[]> {
  await intakeSites(ds, principal, intakeId);
  const rows: Row[] = await ds.query(
    `SELECT k.case_ref, w.worker_key, to_char(e.onset_date, 'YYYY-MM-DD') AS onset, k.decided_status, k.list_status, k.resolution, ru.email AS resolved_by, k.resolved_at,
            r.id::text AS review_id, r.decision, r.from_status, r.to_status, r.reason, du.email AS decided_by, r.decided_at
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
    decision: {
      id: r.review_id,
      decision: r.decision,
      fromStatus: r.from_status,
      toStatus: r.to_status,
      reason: r.reason,
      decidedBy: r.decided_by,
      decidedAt: new Date(r.decided_at).toISOString(),
    },
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
    const [it]: Row[] = await em.query(`SELECT state FROM intakes WHERE id = $1 FOR UPDATE`, [intakeId]);
    if (it!.state !== 'checked') throw new AppError('conflict', `the case list is ${it!.state}; conflicts are decided before it is applied`);
    const [row]: Row[] = await em.query(`SELECT 1 FROM intake_case_conflicts WHERE intake_id = $1 AND case_ref = $2`, [intakeId, caseRef]);
    if (!row) throw new AppError('not_found', 'no such conflict in this case list');
    await em.query(`UPDATE intake_case_conflicts SET resolution = $3, resolved_by = $4, resolved_at = now() WHERE intake_id = $1 AND case_ref = $2`, [
      intakeId,
      caseRef,
      resolution,
      user.id,
    ]);
    await recordAudit(em, { actor: principal, action: 'case.conflict_resolve', target: `intake:${intakeId}`, detail: { resolution }, ip });
  });
  return listConflicts(ds, principal, intakeId, ip);
}
