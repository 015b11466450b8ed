import { CaseEventEntity } from '@ratewarden/db/entities/case-event';
import { CaseReviewEntity } from '@ratewarden/db/entities/case-review';
import { requestRun } from '@ratewarden/db/run-requests';
import type { DataSource } from 'typeorm';
import {
  decisionStatus,
  type CaseDetail,
  type CaseListQuery,
  type CaseReviewInput,
  type CaseReviewResult,
  type CaseSummary,
  type CaseVersion,
} from '@ratewarden/shared/cases';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordAudit } from '../../audit/audit-log';
import { userOf } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import { queryCase, queryCases } from './case-queries';
import { reviewColumns, reviewOf, type ReviewRow } from './review-columns';

/** The decision that made a version, as the join in `history` reads it (every column null for a list's version). */
type ReviewColumns = ReviewRow | { [K in keyof ReviewRow]: null };

/** One version of a case with its outcome, worker and intake, as the join in `history` reads it. */
type VersionRow = ReviewColumns & {
  id: string;
  status: CaseVersion['status'];
  onset: string;
  outcome_code: string;
  worker_key: string;
  intake_id: string;
  file_name: string;
  created_at: Date;
  current: boolean;
};

/**
 * The physician's case register and case review. Every read is audited: the entry names what was
 * read (filters, a case reference) and, for an export, how many cases, which the administrator's
 * view of the log withholds when small.
 */
export async function listCases(ds: DataSource, principal: Principal, q: CaseListQuery, ip?: string): Promise<CaseSummary[]> {
  const cases = await queryCases(ds, principal, q);
  await recordAudit(ds, { actor: principal, action: 'cases.read', target: 'case_register', detail: { filters: filtersOf(q) }, ip });
  return cases;
}

/** The register's rows for a download: the same read, audited as an export with its count. */
export async function exportCases(ds: DataSource, principal: Principal, q: CaseListQuery, ip?: string): Promise<CaseSummary[]> {
  const cases = await queryCases(ds, principal, q);
  await recordAudit(ds, { actor: principal, action: 'cases.export', target: 'case_register', detail: { filters: filtersOf(q), cases: cases.length }, ip });
  return cases;
}

/** The filters for the audit entry; a search text may be a worker key or case reference, so the entry says only that there was one. */
const filtersOf = (q: CaseListQuery) =>
  Object.fromEntries(
    Object.entries(q)
      .filter(([k, v]) => v !== undefined && v !== '' && k !== 'limit')
      .map(([k, v]) => (k === 'q' ? ['search', true] : [k, v])),
  );

async function history(ds: DataSource, caseRef: string): Promise<CaseVersion[]> {
  const rows: VersionRow[] = await ds.query(
    `SELECT c.id::text AS id, c.status, to_char(c.onset_date, 'YYYY-MM-DD') AS onset, o.code AS outcome_code, w.worker_key,
            c.intake_id, i.file_name, c.created_at, c.superseded_by IS NULL AS current,
            ${reviewColumns('u')}
     FROM case_events c
     JOIN outcomes o ON o.id = c.outcome_id
     JOIN workers w ON w.id = c.worker_id
     JOIN intakes i ON i.id = c.intake_id
     LEFT JOIN case_reviews r ON r.id = c.review_id
     LEFT JOIN users u ON u.id = r.decided_by
     WHERE c.case_ref = $1 ORDER BY c.created_at, c.id`,
    [caseRef],
  );
  return rows.map((r) => ({
    id: r.id,
    status: r.status,
    onsetDate: r.onset,
    outcomeCode: r.outcome_code,
    workerKey: r.worker_key,
    intakeId: r.intake_id,
    intakeFileName: r.file_name,
    createdAt: new Date(r.created_at).toISOString(),
    current: r.current,
    review: r.review_id === null ? null : reviewOf(r),
  }));
}

/**
 * An audit entry names a case by its current version's row id: the administrator reads the log,
 * and the source system's case reference and the physician's reasons are case-level.
 */
const caseTarget = (c: CaseDetail) => `case_event:${c.history.find((v) => v.current)?.id ?? 'unknown'}`;

async function detail(ds: DataSource, principal: Principal, caseRef: string): Promise<CaseDetail> {
  const summary = await queryCase(ds, principal, caseRef);
  if (!summary) throw new AppError('not_found', 'no such case among your sites');
  return { ...summary, history: await history(ds, caseRef) };
}

/** One case with every version (list versions and decisions), audited. */
export async function getCase(ds: DataSource, principal: Principal, caseRef: string, ip?: string): Promise<CaseDetail> {
  const found = await detail(ds, principal, caseRef);
  await recordAudit(ds, { actor: principal, action: 'cases.read', target: caseTarget(found), ip });
  return found;
}

/**
 * Confirms, rules out or reopens a case, with a reason: the current version is replaced by a new
 * one naming the review (see the CaseReviews migration), and a run is requested so the next run
 * counts the case as decided. A decision that leaves the status as it is is refused.
 */
export async function reviewCase(ds: DataSource, principal: Principal, caseRef: string, input: CaseReviewInput, ip?: string): Promise<CaseReviewResult> {
  const user = userOf({ principal });
  // Within the reader's sites, as every read of the case.
  if (!(await queryCase(ds, principal, caseRef))) throw new AppError('not_found', 'no such case among your sites');
  const to = decisionStatus[input.decision];
  const runRequestId = await ds.transaction(async (em) => {
    const events = em.getRepository(CaseEventEntity);
    const cur = await events
      .createQueryBuilder('c')
      .where('c.caseRef = :caseRef AND c.supersededBy IS NULL', { caseRef })
      .setLock('pessimistic_write')
      .getOne();
    if (!cur) throw new AppError('not_found', 'no such case');
    if (cur.status === to) throw new AppError('conflict', `the case is already ${to.replace('_', ' ')}`);
    const review = await em
      .getRepository(CaseReviewEntity)
      .save({ caseRef, decision: input.decision, fromStatus: cur.status, toStatus: to, reason: input.reason, decidedBy: user.id });
    // The current version is superseded by its own intake and the review; the new one copies it with the decided status.
    await events.update(cur.id, { supersededBy: cur.intakeId, supersededByReview: review.id });
    await events.insert({
      intakeId: cur.intakeId,
      caseRef,
      workerId: cur.workerId,
      outcomeId: cur.outcomeId,
      onsetDate: cur.onsetDate,
      status: to,
      reviewId: review.id,
    });
    // No case reference in the request: run requests are read by people without case-level access.
    const req = await requestRun(em, 'a physician reviewed a case');
    await recordAudit(em, {
      actor: principal,
      action: 'case.review',
      target: `case_event:${cur.id}`,
      detail: { decision: input.decision, review: review.id },
      ip,
    });
    return req.id;
  });
  return { case: await detail(ds, principal, caseRef), runRequestId };
}
