import type { DataSource } from 'typeorm';
import { CurrentRunEntity } from '@ratewarden/db/entities/current-run';
import type { Flag, FlagDetail } from '@ratewarden/shared/flags';
import type { Withheld } from '@ratewarden/shared/small-cells';
import { readsEverySite, runFrame, seesEveryCount, withheldIn, type RunFrame } from '../../disclosure/run-frame';

/** Who reads a flag: every role but the physician gets withheld counts withheld here too. */
export interface FlagReader {
  principal: import('@ratewarden/shared/permissions').Principal;
  smallCellThreshold: number;
}

/** Event detail keys that carry the measure's value (with the person-time they give the count back). */
const VALUE_KEYS = new Set(['value', 'previous', 'previousWorst', 'cases', 'expected']);

/** A flag with its figures withheld (and, for its history, every value the events carry). */
function withheldFlag<T extends Flag | FlagDetail>(flag: T, why: Withheld): T {
  const figures = {
    ...flag.figures,
    suppressed: true,
    withheld: why,
    cases: null,
    value: null,
    estimate: null,
    lower: null,
    upper: null,
    expected: null,
    p: null,
    q: null,
  };
  return { ...withoutEventValues(flag), value: null, worstValue: null, figures } as T;
}

/** The values in a flag's history are of earlier runs: the physician's (see runFrame). */
function withoutEventValues<T extends Flag | FlagDetail>(flag: T): T {
  if (!('events' in flag)) return flag;
  return {
    ...flag,
    events: flag.events.map((e) => ({
      ...e,
      detail:
        e.detail && typeof e.detail === 'object'
          ? Object.fromEntries(Object.entries(e.detail as Record<string, unknown>).filter(([k]) => !VALUE_KEYS.has(k)))
          : e.detail,
    })),
  };
}

/**
 * Flags as their reader may see them (the reader's flags only: flags-service.ts FlagScope). The
 * physician sees every figure. For anyone else a flag's figures are the count and measures of
 * its scope (the company's, or its site's own) in its latest run, shown only when that run is
 * the current one and the current run's disclosure frame shows the count in that scope (rules are
 * evaluated on shown counts only, so a flag the current run raised or updated normally is): a
 * flag left from an earlier run keeps its figures for the physician ('earlier'), and company
 * figures never reach a reader who sees only some sites ('complement': they would give back the
 * other sites' part; such readers are not given company flags at all). The rule, the group, the
 * site, the period, the person-time and the decisions stay.
 */
export async function flagsAsSeenBy<T extends Flag | FlagDetail>(ds: DataSource, flags: T[], reader: FlagReader): Promise<T[]> {
  const shown = (f: T) => ({ ...f, figures: { ...f.figures, suppressed: false, withheld: null } });
  if (seesEveryCount(reader.principal)) return flags.map(shown);
  const everySite = await readsEverySite(ds, reader.principal);
  const current = await ds.getRepository(CurrentRunEntity).findOne({ where: { singleton: true } });
  let frame: RunFrame | null | undefined;
  if (current && flags.some((f) => f.figures.runId === current.runId)) frame = await runFrame(ds, current.runId, reader.principal).catch(() => undefined);
  return flags.map((f) => {
    if (f.siteId === null && !everySite) return withheldFlag(f, 'complement');
    if (!current || f.figures.runId !== current.runId || frame === undefined) return withheldFlag(f, 'earlier');
    const why = withheldIn(frame, f.siteId, f.outcomeId, f.exposureGroupId, f.figures.window, f.figures.period);
    const small = f.figures.cases !== null && f.figures.cases > 0 && f.figures.cases < reader.smallCellThreshold;
    if (why || small) return withheldFlag(f, why ?? 'small');
    // The worst value so far may come from an earlier run: the physician's, like the history's values.
    return { ...shown(withoutEventValues(f)), worstValue: null };
  });
}
