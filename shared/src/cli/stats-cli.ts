/**
 * Ratewarden statistics CLI: JSON Lines requests on stdin, one JSON result per line on stdout,
 * in order. Run from the repository root as `npm run -s stats`, e.g.
 *
 *   echo '{"kind":"sir","observed":12,"expected":7.4}' | npm run -s stats
 *
 * Request kinds: rates, stratified-rates, trend, sir, poisson, risks, stratified-risks
 * (see `shared/src/stats/schemas.ts`). Lines are processed as they arrive.
 */
import { createInterface } from 'node:readline';
import { processLine } from './process-lines';

const rl = createInterface({ input: process.stdin, crlfDelay: Infinity });
let lineNumber = 0;
rl.on('line', (line) => {
  lineNumber += 1;
  const out = processLine(line, lineNumber);
  if (out !== null) process.stdout.write(`${out}\n`);
});
