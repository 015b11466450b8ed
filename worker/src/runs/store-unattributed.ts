import type { EntityManager } from 'typeorm';
import { UNATTRIBUTED_REASONS, type UnattributedReason } from '@ratewarden/shared/unattributed';
import type { UnattributedCase } from './cells-query';

/** Stores the run's unattributed cases (run_unattributed), in one statement. */
export async function storeUnattributed(em: EntityManager, runId: string, cases: UnattributedCase[]): Promise<void> {
  if (cases.length === 0) return;
  await em.query(`INSERT INTO run_unattributed (run_id, case_event_id, outcome_id, reason) SELECT $1, * FROM unnest($2::bigint[], $3::int[], $4::text[])`, [
    runId,
    cases.map((c) => c.caseEventId),
    cases.map((c) => c.outcomeId),
    cases.map((c) => c.reason),
  ]);
}

/**
 * The run summary's count of unattributed cases by outcome and reason, for every outcome the run
 * counted (zeros included): the API serves these counts, withheld as its reader requires.
 */
export function unattributedSummary(
  outcomeIds: number[],
  cases: UnattributedCase[],
): Array<{ outcomeId: number; reasons: Record<UnattributedReason, number> }> {
  return outcomeIds.map((outcomeId) => {
    const reasons = Object.fromEntries(UNATTRIBUTED_REASONS.map((r) => [r, 0])) as Record<UnattributedReason, number>;
    for (const c of cases) if (c.outcomeId === outcomeId) reasons[c.reason]++;
    return { outcomeId, reasons };
  });
}
