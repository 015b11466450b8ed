import { z } from 'zod';
import { SetupError } from './log';

const SECTIONS = ['intake', 'run', 'reads', 'endToEnd'] as const;
export type BenchSection = (typeof SECTIONS)[number];

/** Switches of `npm run bench`, parsed once; every key is documented in the README's Benchmarks section. */
const schema = z.object({
  BENCH_SECTIONS: z
    .string()
    .default(SECTIONS.join(','))
    .transform((s) =>
      s
        .split(',')
        .map((x) => x.trim())
        .filter(Boolean),
    )
    .pipe(z.array(z.enum(SECTIONS)).min(1))
    .describe('comma list of the sections to run: intake, run, reads, endToEnd (reads and endToEnd need run, run needs intake)'),
  BENCH_READS_SECONDS: z.coerce.number().int().min(1).default(30).describe('seconds of load per read route'),
  BENCH_READS_CONNECTIONS: z.coerce.number().int().min(1).default(50).describe('concurrent connections of the read load'),
  BENCH_READS_BESIDE: z
    .string()
    .optional()
    .describe(
      "another checkout's root (its node_modules in place): its API is loaded on each read route just before or after this one's, in turn, on the same database",
    ),
  BENCH_PGPORT: z.coerce.number().int().min(1024).max(65535).default(54349).describe('port of the benchmark PostgreSQL (another checkout may bench at once)'),
  BENCH_END_TO_END_ROUNDS: z.coerce.number().int().min(1).max(10).default(3).describe('rounds of the end-to-end path beside its baselines'),
});

export type BenchSettings = Omit<z.infer<typeof schema>, 'BENCH_SECTIONS'> & { sections: Set<BenchSection> };

export function readBenchSettings(env: NodeJS.ProcessEnv = process.env): BenchSettings {
  const { BENCH_SECTIONS, ...rest } = schema.parse(env);
  const sections = new Set(BENCH_SECTIONS);
  // The run section aggregates the roster the intake section applied; reads and the end-to-end
  // path need the run's results and its generated case list.
  const needs: Array<[BenchSection, BenchSection]> = [
    ['run', 'intake'],
    ['reads', 'run'],
    ['endToEnd', 'run'],
  ];
  for (const [section, needed] of needs) {
    if (sections.has(section) && !sections.has(needed)) throw new SetupError(`BENCH_SECTIONS: ${section} needs ${needed} (give both)`);
  }
  return { ...rest, sections };
}
