// Month arithmetic is shared/src/months.ts; this re-export keeps the imports of compute-results.ts
// and disclosure/ (changed in parallel elsewhere) working until they import the shared module.
export { monthIndex, monthIso } from '@ratewarden/shared/months';
