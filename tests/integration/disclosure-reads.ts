import { expect } from 'vitest';
import { runResultSchema, runStrataSchema, type RunResult, type RunStrata } from '@ratewarden/shared/runs';
import type { WindowKind } from '@ratewarden/shared/windows';
import type { SignedInAgent } from '../support/sign-in';

/** Key of one result row: scope (site id or "all"), outcome, group, window, period. */
export const resultKey = (siteId: number | null, outcomeId: number, groupId: number, window: string, period: string) =>
  `${siteId ?? 'all'}|${outcomeId}|${groupId}|${window}|${period}`;

export type By = 'age' | 'sex' | 'site';
/** Key of one stratum table: by, scope, outcome, group, window, period. */
export const strataKey = (by: By, siteId: number | null, outcomeId: number, groupId: number, window: string, period: string) =>
  `${by}|${siteId ?? 'all'}|${outcomeId}|${groupId}|${window}|${period}`;

export interface StrataRequest {
  by: By;
  siteId: number | null;
  outcomeId: number;
  exposureGroupId: number;
  window: WindowKind;
  period: string;
}

/** Every result row a reader gets for these outcomes, company-wide and for each site. */
export async function readResults(who: SignedInAgent, runId: string, outcomes: number[], sites: number[]): Promise<Map<string, RunResult>> {
  const out = new Map<string, RunResult>();
  for (const outcomeId of outcomes) {
    for (const siteId of [null, ...sites]) {
      const res = await who.agent.get(`/api/runs/${runId}/results`).query({ outcomeId, ...(siteId !== null && { siteId }) });
      expect(res.status, `results of outcome ${outcomeId}, scope ${siteId ?? 'company'}`).toBe(200);
      for (const r of runResultSchema.array().parse(res.body)) out.set(resultKey(r.siteId, r.outcomeId, r.exposureGroupId, r.window, r.period), r);
    }
  }
  return out;
}

/** Stratum tables, a few requests at a time; every one must be answered 200. */
export async function readStrata(who: SignedInAgent, runId: string, requests: StrataRequest[]): Promise<Map<string, RunStrata>> {
  const out = new Map<string, RunStrata>();
  for (let i = 0; i < requests.length; i += 6) {
    await Promise.all(
      requests.slice(i, i + 6).map(async (q) => {
        const { siteId, ...rest } = q;
        const res = await who.agent.get(`/api/runs/${runId}/strata`).query({ ...rest, ...(siteId !== null && { siteId }) });
        expect(res.status, `strata ${JSON.stringify(q)}: ${JSON.stringify(res.body)}`).toBe(200);
        out.set(strataKey(q.by, siteId, q.outcomeId, q.exposureGroupId, q.window, q.period), runStrataSchema.parse(res.body));
      }),
    );
  }
  return out;
}
