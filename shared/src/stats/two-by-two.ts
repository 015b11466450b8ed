/**
 * The 2×2 table of cumulative-incidence data: exposed events a, exposed non-events b,
 * reference events c, reference non-events d (n1 = a + b, n0 = c + d).
 *
 * @example
 * tableFromGroups({ cases: 56, total: 70 }, { cases: 48, total: 80 }) // { a: 56, b: 14, c: 48, d: 32 }
 */
import { assertCasesWithinTotal, assertCount } from './validation';

export interface RiskGroup {
  cases: number;
  total: number;
}

export interface TwoByTwo {
  a: number;
  b: number;
  c: number;
  d: number;
}

/** Validate the groups and build the table. @example tableFromGroups({ cases: 0, total: 10 }, { cases: 0, total: 20 }) // { a: 0, b: 10, c: 0, d: 20 } */
export function tableFromGroups(exposed: RiskGroup, reference: RiskGroup, path = ''): TwoByTwo {
  const p = path ? `${path}.` : '';
  assertCount(`${p}exposed.cases`, exposed.cases);
  assertCount(`${p}exposed.total`, exposed.total);
  assertCount(`${p}reference.cases`, reference.cases);
  assertCount(`${p}reference.total`, reference.total);
  assertCasesWithinTotal(`${p}exposed`, exposed.cases, exposed.total);
  assertCasesWithinTotal(`${p}reference`, reference.cases, reference.total);
  return { a: exposed.cases, b: exposed.total - exposed.cases, c: reference.cases, d: reference.total - reference.cases };
}

/** Validate a table given by its cells. @example validateTable({ a: 1, b: 2, c: 3, d: 4 }) // undefined */
export function validateTable(t: TwoByTwo, path = 'table'): void {
  for (const k of ['a', 'b', 'c', 'd'] as const) assertCount(`${path}.${k}`, t[k]);
}

/** Margins of a table. @example margins({ a: 1, b: 2, c: 3, d: 4 }) // { n1: 3, n0: 7, m1: 4, m0: 6, n: 10 } */
export function margins(t: TwoByTwo): { n1: number; n0: number; m1: number; m0: number; n: number } {
  return { n1: t.a + t.b, n0: t.c + t.d, m1: t.a + t.c, m0: t.b + t.d, n: t.a + t.b + t.c + t.d };
}
