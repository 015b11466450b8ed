import type { CaseStatus } from '@ratewarden/shared/intake';
import type { PersonTimeBasis } from '@ratewarden/shared/runs';

export const basisLabels: Record<PersonTimeBasis, string> = {
  person_years: 'person-years (2,000 h worked = 1 person-year)',
  hours_200k: 'units of 200,000 hours worked',
};

export const statusLabels: Record<CaseStatus, string> = { suspected: 'suspected', confirmed: 'confirmed', ruled_out: 'ruled out' };
