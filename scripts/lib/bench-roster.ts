import { createWriteStream, existsSync, statSync } from 'node:fs';
import { once } from 'node:events';
import type pg from 'pg';

export const BENCH_SITES = ['BS1', 'BS2', 'BS3', 'BS4'];
export const BENCH_GROUPS = ['BG0', 'BG1', 'BG2', 'BG3', 'BG4'];

/** Creates the benchmark's sites and exposure groups; BG0 (level 0) is the reference group the run compares the others with. */
export async function insertBenchSitesAndGroups(client: pg.ClientBase): Promise<void> {
  for (const s of BENCH_SITES) await client.query(`INSERT INTO sites (code, name) VALUES ($1, $1)`, [s]);
  for (const [i, g] of BENCH_GROUPS.entries()) {
    await client.query(`INSERT INTO exposure_groups (code, name, hazard, exposure_level, is_reference) VALUES ($1, $1, 'bench', $2, $3)`, [g, i, i === 0]);
  }
}

/**
 * The benchmark roster: every one of `workers` workers in every one of `months` months (from
 * January 2019, or `firstMonth` months later), so rows = workers × months. Deterministic (no
 * randomness) so the file, and its checksum, are the same each run; written once and reused while
 * its size matches. Later month ranges continue the same workers (same site, birth year and sex).
 */
export async function writeBenchRoster(path: string, workers: number, months: number, firstMonth = 0): Promise<{ rows: number; bytes: number }> {
  const rows = workers * months;
  if (existsSync(path) && statSync(path).size > rows * 30) return { rows, bytes: statSync(path).size };
  const out = createWriteStream(path);
  out.write('worker_key,site,exposure_group,month,hours,birth_year,sex,job_title\n');
  for (let w = 0; w < workers; w++) {
    const key = `B${String(w).padStart(6, '0')}`;
    const site = BENCH_SITES[w % BENCH_SITES.length];
    const by = 1960 + (w % 43);
    const sex = w % 3 === 0 ? 'F' : 'M';
    let chunk = '';
    for (let m = firstMonth; m < firstMonth + months; m++) {
      const y = 2019 + Math.floor(m / 12);
      const mm = String((m % 12) + 1).padStart(2, '0');
      const group = BENCH_GROUPS[(w + Math.floor(m / 24)) % BENCH_GROUPS.length];
      const hours = (120 + ((w * 7 + m * 13) % 60) + ((w + m) % 4) * 0.25).toFixed(2);
      chunk += `${key},${site},${group},${y}-${mm},${hours},${by},${sex},${m % 7 === 0 ? 'Operator' : ''}\n`;
    }
    if (!out.write(chunk)) await once(out, 'drain');
  }
  out.end();
  await once(out, 'finish');
  return { rows, bytes: statSync(path).size };
}
