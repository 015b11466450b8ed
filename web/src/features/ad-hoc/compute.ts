import { compareRates, compareRisks, StatsValidationError, type RateComparisonResult, type RiskComparisonResult } from '@ratewarden/shared/stats';
import type { RateInput, TableInput } from './ad-hoc-schemas';

/** The core throws on invalid input; the page turns that into a message rather than a crash. */
export type Computed<T> = { ok: true; result: T } | { ok: false; message: string };

function guarded<T>(f: () => T): Computed<T> {
  try {
    return { ok: true, result: f() };
  } catch (e) {
    if (e instanceof StatsValidationError) return { ok: false, message: e.issues.map((i) => i.message).join('; ') };
    throw e;
  }
}

export function computeRates(input: RateInput, confidence: number, per: number): Computed<RateComparisonResult> {
  return guarded(() => compareRates(input.exposed, input.reference, { confidence, per }));
}

export function computeRisks(t: TableInput, confidence: number): Computed<RiskComparisonResult> {
  return guarded(() =>
    compareRisks(
      { cases: t.exposedWith, total: t.exposedWith + t.exposedWithout },
      { cases: t.unexposedWith, total: t.unexposedWith + t.unexposedWithout },
      confidence,
    ),
  );
}
