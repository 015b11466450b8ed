import type { WindowKind } from '@ratewarden/shared/windows';
import { useSearchParams } from 'react-router';

/**
 * The choices every results page shares, kept in the address so a view can be bookmarked and
 * sent: outcome, window (single month or rolling 12 months), period, stratification, group, site.
 */
export interface ResultsFilters {
  outcomeId: number | null;
  window: WindowKind;
  period: string | null;
  stratify: 'age' | 'site' | 'sex';
  groupId: number | null;
  span: number;
  /** One site's own figures, or null for all sites together (only for people who see every site). */
  siteId: number | null;
}

const STRATIFICATIONS = ['age', 'site', 'sex'] as const;
/** An address may carry anything: only a known stratification is taken. */
const asStratify = (v: string | null): ResultsFilters['stratify'] | null =>
  (STRATIFICATIONS as readonly string[]).includes(v ?? '') ? (v as ResultsFilters['stratify']) : null;

export function useResultsFilters(
  defaults: Partial<ResultsFilters> = {},
): [ResultsFilters, (patch: Partial<Record<keyof ResultsFilters, string | number | null>>) => void] {
  const [params, setParams] = useSearchParams();
  const num = (k: string) => (params.get(k) ? Number(params.get(k)) : null);
  const filters: ResultsFilters = {
    outcomeId: num('outcome') ?? defaults.outcomeId ?? null,
    window: (params.get('window') as WindowKind | null) ?? defaults.window ?? 'rolling12',
    period: params.get('period') ?? defaults.period ?? null,
    stratify: asStratify(params.get('stratify')) ?? defaults.stratify ?? 'age',
    groupId: num('group') ?? defaults.groupId ?? null,
    span: num('span') ?? defaults.span ?? 36,
    siteId: num('site') ?? defaults.siteId ?? null,
  };
  const names: Record<keyof ResultsFilters, string> = {
    outcomeId: 'outcome',
    window: 'window',
    period: 'period',
    stratify: 'stratify',
    groupId: 'group',
    span: 'span',
    siteId: 'site',
  };
  const set = (patch: Partial<Record<keyof ResultsFilters, string | number | null>>) =>
    setParams(
      (prev) => {
        const next = new URLSearchParams(prev);
        for (const [k, v] of Object.entries(patch)) {
          const name = names[k as keyof ResultsFilters];
          if (v === null || v === '') next.delete(name);
          else next.set(name, String(v));
        }
        return next;
      },
      { replace: true },
    );
  return [filters, set];
}
