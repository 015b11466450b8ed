import { describe, expect, it } from 'vitest';
import { tablesToAnalyze } from './planner-statistics';

// PostgreSQL's defaults autovacuum_analyze_threshold = 50 and autovacuum_analyze_scale_factor = 0.1
// (PostgreSQL documentation, "Automatic Vacuuming" settings; from memory, and
// tests/integration/run-planner-statistics.test.ts reads them from the server; the run uses the server's own).
const DEFAULT_RULE = { threshold: 50, scaleFactor: 0.1 };

describe('tablesToAnalyze', () => {
  it('analyzes a table never analyzed, whatever its size', () => {
    expect(tablesToAnalyze([{ table: 'roster_entries', liveRows: 0, modifiedSinceAnalyze: 0, everAnalyzed: false }], DEFAULT_RULE)).toEqual(['roster_entries']);
  });
  it('analyzes past 50 + 10% of the live rows changed, not before', () => {
    const at = (modified: number) =>
      tablesToAnalyze([{ table: 'case_events', liveRows: 10_000, modifiedSinceAnalyze: modified, everAnalyzed: true }], DEFAULT_RULE);
    expect(at(1050)).toEqual([]);
    expect(at(1051)).toEqual(['case_events']);
  });
  it('keeps only the stale ones', () => {
    expect(
      tablesToAnalyze(
        [
          { table: 'workers', liveRows: 20_000, modifiedSinceAnalyze: 10, everAnalyzed: true },
          { table: 'roster_entries', liveRows: 1_200_000, modifiedSinceAnalyze: 1_200_000, everAnalyzed: true },
        ],
        DEFAULT_RULE,
      ),
    ).toEqual(['roster_entries']);
  });
});
