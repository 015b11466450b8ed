import type { DataSource, EntityManager } from 'typeorm';
import { RunRequestEntity } from './entities/run-request';
import { rows } from './sql';

/** The pending run requests and when the worker runs them. */
export interface PendingRun {
  /** Requests not yet picked up by a run. */
  count: number;
  /** One of them is the run button's: no waiting. */
  immediate: boolean;
  /** The latest request. */
  latestAt: Date;
  /** When they are due: now for an immediate request, else the latest one plus the quiet interval. */
  dueAt: Date;
  /** Whether `dueAt` has come (by the database's clock, or by `now` when given). */
  due: boolean;
}

/**
 * Batched runs, the one statement of the rule: intakes request a run, and the worker runs once the
 * latest pending request has been quiet for `quietSeconds` (RUN_QUIET_SECONDS), so a roster and
 * its case list uploaded together give one run; an immediate request (the run button) is due at
 * once. Null when nothing is pending.
 */
export async function pendingRun(db: DataSource | EntityManager, quietSeconds: number, now?: Date): Promise<PendingRun | null> {
  const [row] = await rows<{ count: string; immediate: boolean; latest_at: Date; due_at: Date; due: boolean }>(
    db,
    `
    WITH p AS (
      SELECT count(*) AS count, bool_or(immediate) AS immediate, max(requested_at) AS latest_at,
             CASE WHEN bool_or(immediate) THEN min(requested_at) ELSE max(requested_at) + make_interval(secs => $1) END AS due_at
      FROM run_requests WHERE picked_at IS NULL HAVING count(*) > 0)
    SELECT count, immediate, latest_at, due_at, due_at <= coalesce($2::timestamptz, now()) AS due FROM p`,
    [quietSeconds, now ?? null],
  );
  return row ? { count: Number(row.count), immediate: row.immediate, latestAt: row.latest_at, dueAt: row.due_at, due: row.due } : null;
}

/** Asks for a run, in the transaction of the change that calls for it (the worker batches requests: `pendingRun`). */
export async function requestRun(
  em: EntityManager,
  reason: string,
  options: { intakeId?: string; immediate?: boolean } = {},
): Promise<{ id: string; requestedAt: Date }> {
  const { generatedMaps } = await em
    .getRepository(RunRequestEntity)
    .insert({ reason, intakeId: options.intakeId ?? null, immediate: options.immediate ?? false });
  const made = generatedMaps[0] as { id: string | number; requestedAt: Date };
  return { id: String(made.id), requestedAt: made.requestedAt };
}
