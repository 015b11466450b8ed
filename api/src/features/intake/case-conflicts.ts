import type { PoolClient } from 'pg';

/**
 * Cases of a checked case list that contradict a physician's decision (see the
 * IntakeCaseConflicts migration), over `intake_cases` as the check left it. Conflicts already
 * resolved stay as resolved; unresolved ones the store no longer has (the decision changed since)
 * are dropped.
 */
export async function recordCaseConflicts(client: PoolClient, intakeId: string): Promise<void> {
  await client.query(
    `
    INSERT INTO intake_case_conflicts (intake_id, case_ref, review_id, decided_status, list_status)
    SELECT $1, c.case_ref, c.stored_review, c.stored_status, c.status FROM intake_cases c
    WHERE c.stored_review IS NOT NULL AND c.status <> c.stored_status
    ON CONFLICT (intake_id, case_ref) DO UPDATE SET review_id = EXCLUDED.review_id, decided_status = EXCLUDED.decided_status, list_status = EXCLUDED.list_status,
      resolution = CASE WHEN intake_case_conflicts.review_id = EXCLUDED.review_id THEN intake_case_conflicts.resolution END,
      resolved_by = CASE WHEN intake_case_conflicts.review_id = EXCLUDED.review_id THEN intake_case_conflicts.resolved_by END,
      resolved_at = CASE WHEN intake_case_conflicts.review_id = EXCLUDED.review_id THEN intake_case_conflicts.resolved_at END`,
    [intakeId],
  );
  await client.query(
    `
    DELETE FROM intake_case_conflicts k WHERE k.intake_id = $1
      AND NOT EXISTS (SELECT 1 FROM intake_cases c WHERE c.case_ref = k.case_ref AND c.stored_review = k.review_id AND c.status <> c.stored_status)`,
    [intakeId],
  );
}

/** Whether a physician still has to decide a conflict of this intake. */
export async function hasOpenConflicts(client: PoolClient, intakeId: string): Promise<boolean> {
  const { rows } = await client.query(`SELECT 1 FROM intake_case_conflicts WHERE intake_id = $1 AND resolution IS NULL LIMIT 1`, [intakeId]);
  return rows.length > 0;
}

/** The cases whose decision the physician keeps are taken out of what the apply stores. */
export async function leaveKeptCases(client: PoolClient, intakeId: string): Promise<void> {
  await client.query(
    `
    DELETE FROM intake_cases c USING intake_case_conflicts k
    WHERE k.intake_id = $1 AND k.case_ref = c.case_ref AND k.resolution = 'keep'`,
    [intakeId],
  );
}

/**
 * Whether restoring a case intake would put back, over a physician's decision, a version whose
 * status differs (restoreCases makes the intake's latest versions current again).
 */
export async function restoreWouldOverrule(client: PoolClient, intakeId: string): Promise<boolean> {
  const { rows } = await client.query(
    `
    SELECT 1 FROM case_events mine
    JOIN case_events cur ON cur.case_ref = mine.case_ref AND cur.superseded_by IS NULL AND cur.intake_id <> $1 AND cur.review_id IS NOT NULL
    WHERE mine.intake_id = $1 AND mine.superseded_by IS NOT NULL AND mine.superseded_by_review IS NULL AND mine.status <> cur.status
    LIMIT 1`,
    [intakeId],
  );
  return rows.length > 0;
}
