/** Months as consecutive integers (year × 12 + month − 1): the shared definition (shared/src/windows.ts). */
export { monthIndex, monthIso } from '@ratewarden/shared/windows';
