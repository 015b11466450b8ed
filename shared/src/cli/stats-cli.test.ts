import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const repoRoot = fileURLToPath(new URL('../../../', import.meta.url));

describe('stats CLI process', () => {
  it('reads JSON Lines on stdin and writes one line per request, in order', () => {
    const input = [
      '{"kind":"poisson","count":10}',
      '{"kind":"sir","observed":12,"expected":7.4,"confidence":0.9}',
      '{"kind":"bogus"}',
      '{"kind":"rates","exposed":{"cases":41,"personTime":28010},"reference":{"cases":15,"personTime":19017},"per":1000}',
    ].join('\n');
    const run = spawnSync(process.execPath, ['--import', 'tsx', 'shared/src/cli/stats-cli.ts'], { cwd: repoRoot, input, encoding: 'utf8', timeout: 60_000 });
    expect(run.status, run.stderr).toBe(0);
    const lines = run.stdout
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l));
    expect(lines).toHaveLength(4);
    expect(lines[0].exact.lower).toBeCloseTo(4.795388696, 8); // Garwood 1936
    expect(lines[1].confidence).toBe(0.9);
    expect(lines[2].error.type).toBe('invalid-request');
    expect(lines[3].rateExposed.estimate).toBeCloseTo((41 / 28010) * 1000, 12);
  }, 60_000);
});
