import { RATEWARDEN_VERSION } from '@ratewarden/shared';

/**
 * Bumped whenever the way a run computes its results changes (aggregation, counting rule, lag,
 * strata, methods), so that two runs with different numbers from the same inputs can be told
 * apart in the run history.
 */
export const COMPUTATION_REVISION = 1;

export const RUN_CODE_VERSION = `${RATEWARDEN_VERSION}+computation.${COMPUTATION_REVISION}`;
