import type { RunSettings } from '@ratewarden/shared/runs';
import type { Cell } from './cells-query';
import { computeResults, type GroupInfo, type OutcomeInfo, type ResultRow } from './compute-results';
import { resultLine } from './copy-lines';

/** One piece of a run's statistics: one outcome in one scope (the company, or one site). */
export interface ComputeJob {
  siteId: number | null;
  outcome: OutcomeInfo;
  cells: Cell[];
  /** A site job whose rows some site-level watch rule reads: they come back as objects too. */
  forRules: boolean;
}

/** Key of an outcome × site that a site-level watch rule watches (see computeJobs). */
export const ruleSiteKey = (outcomeId: number, siteId: number) => `${outcomeId}|${siteId}`;

/**
 * Splits a run's cells into jobs: every outcome for the whole company and again for each site
 * alone, so that a person who may see only some sites is served results computed from those
 * sites' cells (never company figures). Jobs are independent, which lets them run on several
 * threads. `ruleSites` (ruleSiteKey) names the outcome × site jobs site-level rules read.
 */
export function computeJobs(cells: Cell[], outcomes: OutcomeInfo[], ruleSites: ReadonlySet<string> = new Set()): ComputeJob[] {
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
    jobs.push({ siteId: null, outcome, cells: own, forRules: false });
    const bySite = new Map<number, Cell[]>();
    for (const c of own) {
      const list = bySite.get(c.siteId);
      if (list) list.push(c);
      else bySite.set(c.siteId, [c]);
    }
    for (const siteId of [...bySite.keys()].sort((a, b) => a - b))
      jobs.push({ siteId, outcome, cells: bySite.get(siteId)!, forRules: ruleSites.has(ruleSiteKey(outcome.id, siteId)) });
  }
  return jobs;
}

/**
 * A job's answer as the run needs it: every row as COPY text for run_results (made where it is
 * computed, so only one string crosses between threads), and as objects only the rows watch
 * rules read (the company's, and the sites' that site-level rules watch).
 */
export interface JobAnswer {
  lines: string;
  resultCount: number;
  companyResults: ResultRow[];
  siteRuleResults: ResultRow[];
  outcomesWithoutReference: number[];
}

export function answerJob(job: ComputeJob, groups: GroupInfo[], settings: RunSettings, runId: string): JobAnswer {
  const c = computeResults(job.cells, [job.outcome], groups, settings, job.siteId);
  let lines = '';
  for (const r of c.results) lines += resultLine(runId, r);
  return {
    lines,
    resultCount: c.results.length,
    companyResults: job.siteId === null ? c.results : [],
    siteRuleResults: job.siteId !== null && job.forRules ? c.results : [],
    outcomesWithoutReference: job.siteId === null ? c.outcomesWithoutReference : [],
  };
}

export interface MergedAnswers {
  /** Company-wide rows (the company-wide watch rules' input). */
  companyResults: ResultRow[];
  /** Rows of the outcome × sites that site-level watch rules watch. */
  siteRuleResults: ResultRow[];
  /** Every row stored, company and sites. */
  resultCount: number;
  outcomesWithoutReference: number[];
}

/** Joins the jobs' answers in job order. */
export function mergeAnswers(answers: JobAnswer[]): MergedAnswers {
  const merged: MergedAnswers = { companyResults: [], siteRuleResults: [], resultCount: 0, outcomesWithoutReference: [] };
  for (const a of answers) {
    for (const r of a.companyResults) merged.companyResults.push(r);
    for (const r of a.siteRuleResults) merged.siteRuleResults.push(r);
    merged.resultCount += a.resultCount;
    merged.outcomesWithoutReference.push(...a.outcomesWithoutReference);
  }
  return merged;
}
