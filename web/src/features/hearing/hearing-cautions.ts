/** The cautions of every audiogram page (issue 18), beside the standing ones. */
export const hearingCautions = [
  'Standard threshold shifts derived here are prompts for the licensed professional\u2019s review (audiologist, otolaryngologist or physician), not findings: a retest, the history and the examination decide.',
  'Computed per 29 CFR 1910.95(g)(10) and 1904.10; local rules may differ and take precedence.',
];
