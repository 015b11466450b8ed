import type { DataSource } from 'typeorm';
import { CurrentRunEntity } from '@ratewarden/db/entities/current-run';
import { RunEntity } from '@ratewarden/db/entities/run';
import type { Principal } from '@ratewarden/shared/permissions';
import type { RunDetail } from '@ratewarden/shared/runs';
import { splitSuppression } from '@ratewarden/shared/small-cells';
import { UNATTRIBUTED_REASONS, type UnattributedCount, type UnattributedList, type UnattributedReason } from '@ratewarden/shared/unattributed';
import { recordAudit } from '../../audit/audit-log';
import { readsEverySite, seesEveryCount } from '../../disclosure/run-frame';
import { siteScope } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import type { ResultReader } from './result-reader';

interface StoredCount {
  outcomeId: number;
  reasons: Record<UnattributedReason, number>;
}

function storedCounts(summary: Record<string, unknown>): StoredCount[] | null {
  const u = summary.unattributed;
  return Array.isArray(u) ? (u as StoredCount[]) : null;
}

/**
 * The unattributed cases of a run, counted by outcome and reason, as `reader` may see them. They
 * are company-wide (a case no roster row attributes has no site), so only readers of every site
 * get them; anyone but the physician gets the current run's only (two runs side by side would
 * give the change by difference) and counts from 1 to threshold − 1 withheld, split and total
 * alike (splitSuppression). The counts are of cases outside every cell, so no figure of the
 * disclosure frame adds up with them.
 */
export async function unattributedFor(ds: DataSource, run: RunDetail, reader: ResultReader): Promise<UnattributedCount[] | null> {
  const stored = run.summary && typeof run.summary === 'object' ? storedCounts(run.summary) : null;
  if (!stored || !(await readsEverySite(ds, reader.principal))) return null;
  const all = seesEveryCount(reader.principal);
  if (!all && !run.isCurrent) return null;
  return stored.map(({ outcomeId, reasons }) => {
    const parts = UNATTRIBUTED_REASONS.map((r) => reasons[r] ?? 0);
    const total = parts.reduce((a, b) => a + b, 0);
    const shown = all ? { total: null, parts: parts.map(() => null) } : splitSuppression(parts, reader.smallCellThreshold);
    return {
      outcomeId,
      count: shown.total ? null : total,
      withheld: shown.total,
      reasons: UNATTRIBUTED_REASONS.map((reason, i) => ({ reason, count: shown.parts[i] ? null : parts[i]!, withheld: shown.parts[i] ?? null })),
    };
  });
}

/**
 * The unattributed cases of the current run, one by one: case-level data, for the physician (the
 * route asks for `cases:read`). A case no roster row attributes has no site of its own, so a
 * reader of some sites only gets the cases of workers who have been on a roster of one of their
 * sites (any version). Every read is audited, without counts (the administrator reads the log).
 */
export async function listUnattributed(ds: DataSource, principal: Principal, ip?: string): Promise<UnattributedList> {
  const scope = (await readsEverySite(ds, principal)) ? null : siteScope(principal);
  const run = await ds
    .getRepository(RunEntity)
    .createQueryBuilder('r')
    .innerJoin(CurrentRunEntity.options.name, 'c', 'c.runId = r.id')
    .select(['r.id', 'r.number'])
    .getOne();
  if (!run) throw new AppError('not_found', 'no run has succeeded yet');
  const rows: Array<{
    case_ref: string;
    worker_key: string;
    outcome_id: number;
    onset: string;
    status: 'suspected' | 'confirmed' | 'ruled_out';
    reason: UnattributedReason;
  }> = await ds.query(
    `SELECT c.case_ref, w.worker_key, u.outcome_id, to_char(c.onset_date, 'YYYY-MM-DD') AS onset, c.status, u.reason
     FROM run_unattributed u
     JOIN case_events c ON c.id = u.case_event_id
     JOIN workers w ON w.id = c.worker_id
     WHERE u.run_id = $1 AND ($2::int[] IS NULL OR EXISTS (SELECT 1 FROM roster_entries re WHERE re.worker_id = c.worker_id AND re.site_id = ANY($2::int[])))
     ORDER BY u.outcome_id, c.onset_date, c.case_ref`,
    [run.id, scope],
  );
  await recordAudit(ds, { actor: principal, action: 'cases.read', target: `run:${run.id}:unattributed`, ip });
  return {
    runId: run.id,
    runNumber: Number(run.number),
    cases: rows.map((r) => ({ caseRef: r.case_ref, workerKey: r.worker_key, outcomeId: r.outcome_id, onsetDate: r.onset, status: r.status, reason: r.reason })),
  };
}
