import type { CountingRule } from '@ratewarden/shared/domain';

/**
 * The demo scenario: Kestrelmoor Components, an invented maker of cast and welded parts with
 * four sites. Every name here is made up for the demo; none is a real company or person.
 */
export const demoSites = [
  { code: 'NFD', name: 'North Foundry', region: 'North' },
  { code: 'RVW', name: 'Riverside Works', region: 'North' },
  { code: 'HLA', name: 'Hillcrest Assembly', region: 'South' },
  { code: 'EYD', name: 'East Yard Depot', region: 'South' },
] as const;

export const demoExposureGroups = [
  { code: 'OFFICE', name: 'Office and planning', hazard: 'none above background', exposureLevel: 0, isReference: true },
  { code: 'ASSEMBLY', name: 'Assembly lines', hazard: 'manual handling, moderate noise', exposureLevel: 1, isReference: false },
  { code: 'WELDING', name: 'Welding bays', hazard: 'metal fumes, noise', exposureLevel: 2, isReference: false },
  { code: 'FETTLING', name: 'Fettling and grinding', hazard: 'crystalline silica, high noise', exposureLevel: 3, isReference: false },
  { code: 'COATING', name: 'Coating shop', hazard: 'solvents, isocyanates', exposureLevel: 2, isReference: false },
] as const;

export const demoOutcomes: ReadonlyArray<{ code: string; name: string; caseDefinition: string; countingRule: CountingRule }> = [
  {
    code: 'STS',
    name: 'Standard threshold shift (hearing)',
    caseDefinition: 'Average shift of 10 dB or more at 2, 3 and 4 kHz in either ear against the baseline audiogram, confirmed on retest.',
    countingRule: 'first_event',
  },
  {
    code: 'DERM',
    name: 'Contact dermatitis',
    caseDefinition: 'Dermatitis of the hands or forearms diagnosed by the occupational physician, with a workplace exposure history.',
    countingRule: 'first_event',
  },
  {
    code: 'ASTHMA',
    name: 'Work-related asthma',
    caseDefinition: 'New asthma or a work-related worsening confirmed by serial peak-flow records and physician review.',
    countingRule: 'first_event',
  },
  {
    code: 'INJURY',
    name: 'Recordable injury',
    caseDefinition: 'A work-related injury needing treatment beyond first aid, restricted work or days away.',
    countingRule: 'recurrent',
  },
];
