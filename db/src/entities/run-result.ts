import { EntitySchema, type EntitySchemaColumnOptions } from 'typeorm';
import type { WindowKind } from '@ratewarden/shared/rules';

/**
 * One exposure group × outcome × window × period of one run: cases and hours (exact), the rate
 * and, against the reference group, the IRR and IRD crude and Mantel–Haenszel adjusted, with the
 * u-chart limits for single months. Written once, never updated.
 */
export interface RunResultRow {
  runId: string;
  /** null: the whole company; else that site's cells alone. */
  siteId: number | null;
  outcomeId: number;
  exposureGroupId: number;
  windowKind: WindowKind;
  period: string;
  monthsCovered: number;
  isReference: boolean;
  referenceGroupId: number | null;
  cases: number;
  hours: string;
  personTime: number;
  rate: number | null; rateLower: number | null; rateUpper: number | null;
  expected: number | null;
  irr: number | null; irrLower: number | null; irrUpper: number | null; irrP: number | null;
  irrWaldLower: number | null; irrWaldUpper: number | null;
  ird: number | null; irdLower: number | null; irdUpper: number | null; irdP: number | null;
  mhAgeIrr: number | null; mhAgeIrrLower: number | null; mhAgeIrrUpper: number | null; mhAgeIrrP: number | null;
  mhAgeIrd: number | null; mhAgeIrdLower: number | null; mhAgeIrdUpper: number | null;
  mhSiteIrr: number | null; mhSiteIrrLower: number | null; mhSiteIrrUpper: number | null; mhSiteIrrP: number | null;
  mhSiteIrd: number | null; mhSiteIrdLower: number | null; mhSiteIrdUpper: number | null;
  mhSexIrr: number | null; mhSexIrrLower: number | null; mhSexIrrUpper: number | null; mhSexIrrP: number | null;
  mhSexIrd: number | null; mhSexIrdLower: number | null; mhSexIrdUpper: number | null;
  uCentre: number | null; uLcl: number | null; uUcl: number | null;
  uSignal: 'above' | 'below' | 'within' | null;
  detail: Record<string, unknown>;
}

const dbl = (name: string): EntitySchemaColumnOptions => ({ name, type: 'double precision', nullable: true });

export const RunResultEntity = new EntitySchema<RunResultRow>({
  name: 'RunResult',
  tableName: 'run_results',
  columns: {
    runId: { name: 'run_id', type: 'uuid', primary: true },
    siteId: { name: 'site_id', type: 'integer', nullable: true },
    outcomeId: { name: 'outcome_id', type: 'integer', primary: true },
    exposureGroupId: { name: 'exposure_group_id', type: 'integer', primary: true },
    windowKind: { name: 'window_kind', type: 'text', primary: true },
    period: { type: 'date', primary: true },
    monthsCovered: { name: 'months_covered', type: 'smallint' },
    isReference: { name: 'is_reference', type: 'boolean' },
    referenceGroupId: { name: 'reference_group_id', type: 'integer', nullable: true },
    cases: { type: 'integer' },
    hours: { type: 'numeric', precision: 16, scale: 2 },
    personTime: { name: 'person_time', type: 'double precision' },
    rate: dbl('rate'), rateLower: dbl('rate_lower'), rateUpper: dbl('rate_upper'),
    expected: dbl('expected'),
    irr: dbl('irr'), irrLower: dbl('irr_lower'), irrUpper: dbl('irr_upper'), irrP: dbl('irr_p'),
    irrWaldLower: dbl('irr_wald_lower'), irrWaldUpper: dbl('irr_wald_upper'),
    ird: dbl('ird'), irdLower: dbl('ird_lower'), irdUpper: dbl('ird_upper'), irdP: dbl('ird_p'),
    mhAgeIrr: dbl('mh_age_irr'), mhAgeIrrLower: dbl('mh_age_irr_lower'), mhAgeIrrUpper: dbl('mh_age_irr_upper'), mhAgeIrrP: dbl('mh_age_irr_p'),
    mhAgeIrd: dbl('mh_age_ird'), mhAgeIrdLower: dbl('mh_age_ird_lower'), mhAgeIrdUpper: dbl('mh_age_ird_upper'),
    mhSiteIrr: dbl('mh_site_irr'), mhSiteIrrLower: dbl('mh_site_irr_lower'), mhSiteIrrUpper: dbl('mh_site_irr_upper'), mhSiteIrrP: dbl('mh_site_irr_p'),
    mhSiteIrd: dbl('mh_site_ird'), mhSiteIrdLower: dbl('mh_site_ird_lower'), mhSiteIrdUpper: dbl('mh_site_ird_upper'),
    mhSexIrr: dbl('mh_sex_irr'), mhSexIrrLower: dbl('mh_sex_irr_lower'), mhSexIrrUpper: dbl('mh_sex_irr_upper'), mhSexIrrP: dbl('mh_sex_irr_p'),
    mhSexIrd: dbl('mh_sex_ird'), mhSexIrdLower: dbl('mh_sex_ird_lower'), mhSexIrdUpper: dbl('mh_sex_ird_upper'),
    uCentre: dbl('u_centre'), uLcl: dbl('u_lcl'), uUcl: dbl('u_ucl'),
    uSignal: { name: 'u_signal', type: 'text', nullable: true },
    detail: { type: 'jsonb', default: () => "'{}'" },
  },
});
