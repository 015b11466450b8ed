import { caseSummarySchema, type CaseSummary } from '@ratewarden/shared/cases';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { caseQueryString, type CaseFilters } from './case-keys';

/** The register's rows for a download, read again through the export route so the export is recorded with its count. */
export function exportCases(f: CaseFilters): Promise<CaseSummary[]> {
  return api.get(`/api/cases/export${caseQueryString(f)}`, z.array(caseSummarySchema));
}
