/** Ratewarden's version, shown by /api/health and recorded with every run. */
export const RATEWARDEN_VERSION = '0.1.0';
