import type { EntityManager } from 'typeorm';
import type { WithheldCount } from './disclosure-frame';

/** Stores a run's disclosure frame (run_withheld) in the run's final transaction, in one statement. */
export async function storeFrame(em: EntityManager, runId: string, frame: WithheldCount[]): Promise<void> {
  await em.query(
    `INSERT INTO run_withheld (run_id, site_id, outcome_id, exposure_group_id, window_kind, period, reason)
     SELECT $1, * FROM unnest($2::int[], $3::int[], $4::int[], $5::text[], $6::date[], $7::text[])`,
    [
      runId,
      frame.map((f) => f.siteId),
      frame.map((f) => f.outcomeId),
      frame.map((f) => f.exposureGroupId),
      frame.map((f) => f.window),
      frame.map((f) => f.period),
      frame.map((f) => f.reason),
    ],
  );
  await em.query(`UPDATE runs SET disclosure_frame = true WHERE id = $1`, [runId]);
}

/** Key of one count in a frame: scope, outcome, group, window, period (ISO, or "" for a series). */
export const frameKey = (siteId: number | null, outcomeId: number, groupId: number, window: string, period: string | null) =>
  `${siteId ?? 'all'}|${outcomeId}|${groupId}|${window}|${period ?? ''}`;

/** The frame as a look-up from frameKey to reason. */
export function frameIndex(frame: WithheldCount[]): Map<string, WithheldCount['reason']> {
  return new Map(frame.map((f) => [frameKey(f.siteId, f.outcomeId, f.exposureGroupId, f.window, f.period), f.reason]));
}
