/**
 * Line processing of the stats CLI, kept pure so it can be tested without a process: each
 * non-blank input line is one JSON request; each produces exactly one JSON line, in order. A bad
 * line gives an error object for that line (with its 1-based line number) and the rest go on.
 *
 * @example
 * processLine('{"kind":"poisson","count":0}', 1)
 * // '{"kind":"poisson","confidence":0.95,"count":0,"exact":{"lower":0,"upper":3.6888794541139354},...}'
 */
import { runStatsRequest } from '../stats/run-request';
import { toJsonValue } from '../stats/json-encoding';
import { StatsValidationError } from '../stats/validation';

export interface CliError {
  line: number;
  error: { type: 'invalid-json' | 'invalid-request' | 'internal'; message: string; issues?: Array<{ path: string; message: string }> };
}

/**
 * Process one line; returns null for a blank line (no output), else one JSON text.
 *
 * @example
 * processLine('not json', 3) // '{"line":3,"error":{"type":"invalid-json","message":"..."}}'
 */
export function processLine(line: string, lineNumber: number): string | null {
  if (line.trim() === '') return null;
  let input: unknown;
  try {
    input = JSON.parse(line);
  } catch (e) {
    return JSON.stringify(errorObject(lineNumber, 'invalid-json', `not valid JSON: ${(e as Error).message}`));
  }
  try {
    return JSON.stringify(toJsonValue(runStatsRequest(input)));
  } catch (e) {
    if (e instanceof StatsValidationError) {
      return JSON.stringify(errorObject(lineNumber, 'invalid-request', e.message, e.issues));
    }
    // Anything else is a defect of the core; report it on this line and keep going.
    return JSON.stringify(errorObject(lineNumber, 'internal', (e as Error)?.message ?? String(e)));
  }
}

function errorObject(line: number, type: CliError['error']['type'], message: string, issues?: CliError['error']['issues']): CliError {
  return { line, error: issues ? { type, message, issues } : { type, message } };
}

/** Process many lines, in order. @example processLines(['{"kind":"poisson","count":1}', '']).length // 1 */
export function processLines(lines: Iterable<string>): string[] {
  const out: string[] = [];
  let n = 0;
  for (const line of lines) {
    n += 1;
    const result = processLine(line, n);
    if (result !== null) out.push(result);
  }
  return out;
}
