import { undefinedBecause, type Reason } from './result-types';

/** An adjusted estimate with its confidence limits; null where undefined (the reasons say why). */
export interface MhEstimate {
  estimate: number | null;
  lower: number | null;
  upper: number | null;
}

/** A χ² test of homogeneity across strata. */
export interface HomogeneityTest {
  chi2: number | null;
  df: number | null;
  p: number | null;
}

export const nullTest = (): HomogeneityTest => ({ chi2: null, df: null, p: null });

/** Every figure of `field` undefined, with the reason. */
export function noStrata(reasons: Reason[], field: string, why: string): MhEstimate {
  for (const f of ['estimate', 'lower', 'upper']) undefinedBecause(reasons, `${field}.${f}`, why);
  return { estimate: null, lower: null, upper: null };
}

/** num/den with limits exp(±z·√varLog) around it; a zero sum leaves the limits undefined (log of 0). */
export function ratioWithLogInterval(num: number, den: number, varLog: number, z: number, field: string, reasons: Reason[]): MhEstimate {
  const estimate = den === 0 ? Infinity : num / den;
  if (num === 0 || den === 0) {
    const why = num === 0 ? 'the numerator sum is 0 (log of 0)' : 'the denominator sum is 0 (log of 0)';
    undefinedBecause(reasons, `${field}.lower`, why);
    undefinedBecause(reasons, `${field}.upper`, why);
    return { estimate, lower: null, upper: null };
  }
  const se = Math.sqrt(varLog);
  return { estimate, lower: estimate * Math.exp(-z * se), upper: estimate * Math.exp(z * se) };
}
