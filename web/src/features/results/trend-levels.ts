import type { ExposureGroupDto } from '@ratewarden/shared/groups';
import type { RunResult } from '@ratewarden/shared/runs';
import { rateTrend, type RateTrendResult } from '@ratewarden/shared/stats/rate-trend';

/**
 * The score test for trend across ordered exposure levels, from one window and period of a run:
 * the groups' cases and person-time are summed per ordinal level (groups without a level are left
 * out), exactly as the worker does, and the shared statistics core computes the test.
 */
export interface LevelRow {
  level: number;
  groups: string[];
  cases: number;
  personTime: number;
  /** A group's count at this level was withheld (small cells): the level's total is unknown. */
  withheld: boolean;
}

export function levelRows(results: RunResult[], groups: ExposureGroupDto[]): LevelRow[] {
  const byLevel = new Map<number, LevelRow>();
  for (const r of results) {
    const g = groups.find((x) => x.id === r.exposureGroupId);
    if (!g || g.exposureLevel === null) continue;
    const row = byLevel.get(g.exposureLevel) ?? { level: g.exposureLevel, groups: [], cases: 0, personTime: 0, withheld: false };
    row.groups.push(g.name);
    row.cases += r.cases ?? 0;
    row.withheld ||= r.suppressed || r.cases === null;
    row.personTime += r.personTime;
    byLevel.set(g.exposureLevel, row);
  }
  return [...byLevel.values()].sort((a, b) => a.level - b.level);
}

/** Null with fewer than two levels, or when a level's count was withheld (a partial sum would give a wrong test). */
export function trendOf(levels: LevelRow[], options: { confidence: number; per: number }): RateTrendResult | null {
  if (levels.length < 2 || levels.some((l) => l.withheld)) return null;
  return rateTrend(
    levels.map((l) => ({ score: l.level, cases: l.cases, personTime: l.personTime })),
    options,
  );
}
