import type { RunSettings } from '@ratewarden/shared/runs';
import type { Cell } from './cells-query';
import { computeResults, type ComputedResults, type GroupInfo, type OutcomeInfo } from './compute-results';

/** One piece of a run's statistics: one outcome in one scope (the company, or one site). */
export interface ComputeJob {
  siteId: number | null;
  outcome: OutcomeInfo;
  cells: Cell[];
}

/**
 * Splits a run's cells into jobs: every outcome for the whole company and again for each site
 * alone, so that a person who may see only some sites is served results computed from those
 * sites' cells (never company figures). Jobs are independent, which lets them run on several
 * threads.
 */
export function computeJobs(cells: Cell[], outcomes: OutcomeInfo[]): ComputeJob[] {
  const byOutcome = new Map<number, Cell[]>();
  for (const c of cells) {
    const list = byOutcome.get(c.outcomeId);
    if (list) list.push(c);
    else byOutcome.set(c.outcomeId, [c]);
  }
  const jobs: ComputeJob[] = [];
  for (const outcome of outcomes) {
    const own = byOutcome.get(outcome.id);
    if (!own) continue;
    jobs.push({ siteId: null, outcome, cells: own });
    const bySite = new Map<number, Cell[]>();
    for (const c of own) {
      const list = bySite.get(c.siteId);
      if (list) list.push(c);
      else bySite.set(c.siteId, [c]);
    }
    for (const siteId of [...bySite.keys()].sort((a, b) => a - b)) jobs.push({ siteId, outcome, cells: bySite.get(siteId)! });
  }
  return jobs;
}

export function runJob(job: ComputeJob, groups: GroupInfo[], settings: RunSettings): ComputedResults {
  return computeResults(job.cells, [job.outcome], groups, settings, job.siteId);
}

/** Joins the jobs' answers in job order; outcomes without a reference group come from the company scope. */
export function mergeComputed(jobs: ComputeJob[], parts: ComputedResults[]): ComputedResults {
  const merged: ComputedResults = { results: [], trends: [], outcomesWithoutReference: [] };
  parts.forEach((p, i) => {
    for (const r of p.results) merged.results.push(r);
    for (const t of p.trends) merged.trends.push(t);
    if (jobs[i]!.siteId === null) merged.outcomesWithoutReference.push(...p.outcomesWithoutReference);
  });
  return merged;
}
