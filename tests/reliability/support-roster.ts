import { createHash } from 'node:crypto';
import type { DataSource } from 'typeorm';

export interface RosterFile {
  csv: string;
  /** The file's rows as "worker,site,group,month,hours", sorted: what the current roster must hold once it is applied. */
  content: string;
}

/**
 * A large roster of one site for 2019 (`workers` × 12 months). `version` changes it the way a
 * corrected HR export does: from version 1 on, every third worker's hours differ, every seventh
 * worker is in the other group, the last 300 workers are gone and 500 new ones come.
 */
export function largeRoster(opts: { prefix: string; site: string; groups: [string, string]; workers: number; version: number }): RosterFile {
  const { prefix, site, groups, workers, version } = opts;
  const lines = ['worker_key,site,exposure_group,month,hours,birth_year,sex'];
  const content: string[] = [];
  const last = version === 0 ? workers : workers + 500;
  for (let i = 0; i < last; i++) {
    if (version > 0 && i >= workers - 300 && i < workers) continue;
    const key = `${prefix}${String(i).padStart(6, '0')}`;
    const group = groups[((i % 2) + (version > 0 && i % 7 === 0 ? 1 : 0)) % 2]!;
    const birth = 1960 + (i % 40);
    const sex = i % 2 ? 'F' : 'M';
    for (let m = 1; m <= 12; m++) {
      const month = `2019-${String(m).padStart(2, '0')}`;
      const hours = 120 + (i % 40) + (version > 0 && i % 3 === 0 ? version * 1.5 : 0);
      lines.push(`${key},${site},${group},${month},${hours},${birth},${sex}`);
      content.push(`${key},${site},${group},${month},${hours}`);
    }
  }
  return { csv: `${lines.join('\n')}\n`, content: content.sort().join('\n') };
}

export const md5 = (s: string) => createHash('md5').update(s).digest('hex');

/** MD5 of the current roster of `siteId` in the same form as `RosterFile.content`. */
export async function currentRosterSum(ds: DataSource, siteId: number): Promise<string> {
  const [row] = (await ds.query(
    `SELECT md5(coalesce(string_agg(line, E'\\n' ORDER BY line COLLATE "C"), '')) AS sum FROM (
       SELECT w.worker_key || ',' || s.code || ',' || g.code || ',' || to_char(re.month, 'YYYY-MM') || ',' || trim_scale(re.hours)::text AS line
       FROM roster_entries re JOIN roster_slices rs ON rs.intake_id = re.intake_id AND rs.site_id = re.site_id AND rs.month = re.month
       JOIN workers w ON w.id = re.worker_id JOIN sites s ON s.id = re.site_id JOIN exposure_groups g ON g.id = re.exposure_group_id
       WHERE re.site_id = $1) x`,
    [siteId],
  )) as Array<{ sum: string }>;
  return row!.sum;
}
