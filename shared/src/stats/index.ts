/**
 * The Ratewarden statistics core: pure functions, no I/O. Every result carries its method
 * names and confidence level; undefined values are null with reasons; infinities are explicit.
 */
export * from './attributable-fraction';
export * from './attributable-risk';
export * from './binomial-tests';
export * from './contingency-tests';
export * from './distributions';
export * from './incidence-rate';
export * from './json-encoding';
export * from './methods';
export * from './multiple-comparisons';
export * from './noncentral-hypergeometric';
export * from './number-needed';
export * from './odds-ratio';
export * from './person-time';
export * from './poisson-limits';
export * from './proportion-intervals';
export * from './rate-comparison';
export * from './rate-difference';
export * from './rate-ratio';
export * from './rate-trend';
export * from './result-types';
export * from './risk-comparison';
export * from './risk-difference';
export * from './risk-ratio';
export * from './root-finding';
export * from './run-request';
export * from './schemas';
export * from './sir';
export * from './stratified-rates';
export * from './stratified-risks';
export * from './two-by-two';
export * from './u-chart';
export * from './validation';
