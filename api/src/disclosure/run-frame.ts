import { In, Not, type DataSource, type EntityManager } from 'typeorm';
import { CurrentRunEntity } from '@ratewarden/db/entities/current-run';
import { RunEntity } from '@ratewarden/db/entities/run';
import { SiteEntity } from '@ratewarden/db/entities/site';
import { roleMay, type Principal } from '@ratewarden/shared/permissions';
import { isSmallCount, type Withheld } from '@ratewarden/shared/small-cells';
import { siteScope } from '../auth/authorize';
import { AppError } from '../lib/app-error';
import { RunMemo } from '../lib/run-memo';

/** Who sees every count, small ones included: whoever may read case-level data (the physician). */
export const seesEveryCount = (p: Principal) => p.kind === 'user' && roleMay(p.role, 'counts:small');

/** Whether a person may read every site (and so the company's figures, which include every site's workers). */
export async function readsEverySite(ds: DataSource | EntityManager, principal: Principal): Promise<boolean> {
  const scope = siteScope(principal);
  if (scope === 'all') return true;
  const sites = ds.getRepository(SiteEntity);
  return !(scope.length === 0 ? await sites.exists() : await sites.existsBy({ id: Not(In(scope)) }));
}

/** Key of one count in a run's disclosure frame: scope, outcome, group, window, period (ISO, "" for a series). */
export const frameKey = (siteId: number | null, outcomeId: number, groupId: number, window: string, period: string | null) =>
  `${siteId ?? 'all'}|${outcomeId}|${groupId}|${window}|${period ?? ''}`;

/** The counts of one run withheld from a reader, by frameKey. */
export type RunFrame = Map<string, Withheld>;

/**
 * The disclosure frame a reader gets for a run (worker/src/disclosure/disclosure-frame.ts): null
 * for the physician, who sees every count; for everyone else the run's withheld counts, read
 * from run_withheld, optionally for one outcome. Readers other than the physician see the
 * figures of the current run only: figures of two runs side by side would give back, by
 * difference, counts each withholds (the windows move a month between runs). A run stored
 * before frames existed has none and is the physician's alone.
 */
export async function runFrame(ds: DataSource, runId: string, principal: Principal, outcomeId?: number): Promise<RunFrame | null> {
  if (seesEveryCount(principal)) return null;
  const run = await ds.getRepository(RunEntity).findOne({ select: { id: true, disclosureFrame: true }, where: { id: runId } });
  if (!run) throw new AppError('not_found', 'no such run');
  if (!(await ds.getRepository(CurrentRunEntity).existsBy({ runId })))
    throw new AppError('forbidden', "the figures of earlier runs are shown to the physician only; read the current run's");
  if (!run.disclosureFrame)
    throw new AppError(
      'conflict',
      'the figures of this run are shown to the physician only until the next run, which publishes them with the counts protected',
    );
  // The checks above are per request; the frame itself is the run's and never changes.
  return frames.get(`${runId}|${outcomeId ?? ''}`, async () => {
    const rows: Array<{ site_id: number | null; outcome_id: number; exposure_group_id: number; window_kind: string; period: string | null; reason: Withheld }> =
      await ds.query(
        `SELECT site_id, outcome_id, exposure_group_id, window_kind, to_char(period, 'YYYY-MM-DD') AS period, reason
       FROM run_withheld WHERE run_id = $1 AND ($2::int IS NULL OR outcome_id = $2)`,
        [runId, outcomeId ?? null],
      );
    return new Map(rows.map((r) => [frameKey(r.site_id, r.outcome_id, r.exposure_group_id, r.window_kind, r.period), r.reason]));
  });
}

const frames = new RunMemo<RunFrame>(32);

/** Why a reader may not see a count (null: shown). */
export function withheldIn(
  frame: RunFrame | null,
  siteId: number | null,
  outcomeId: number,
  groupId: number,
  window: string,
  period: string | null,
): Withheld | null {
  return frame?.get(frameKey(siteId, outcomeId, groupId, window, period)) ?? null;
}

/**
 * Why a reader may not see a count of `cases`: as the frame says, and a small count in any case
 * (null frame: the physician, who sees every count).
 */
export function withheldCount(
  frame: RunFrame | null,
  cases: number,
  threshold: number,
  siteId: number | null,
  outcomeId: number,
  groupId: number,
  window: string,
  period: string,
): Withheld | null {
  if (frame === null) return null;
  return withheldIn(frame, siteId, outcomeId, groupId, window, period) ?? (isSmallCount(cases, threshold) ? 'small' : null);
}
