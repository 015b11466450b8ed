import { randomBytes } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import type { DataSource } from 'typeorm';
import type { Principal } from '@ratewarden/shared/permissions';
import { receiveIntake, type ReceiveInput } from '@ratewarden/api/features/intake/intake-receive';

export const fixtureDir = join(import.meta.dirname, '..', 'fixtures', 'intake');

/**
 * A private corner of the shared test database: two sites, three exposure groups and two outcomes
 * with codes of their own, and a hygienist for those sites, so these tests never meet other rows.
 * Fixture files write the placeholders {S1} {S2} {GA} {GB} {GC} {OA} {OB} {W} for those codes
 * and a worker-key prefix.
 */
export interface Corner {
  tag: string;
  codes: Record<'S1' | 'S2' | 'GA' | 'GB' | 'GC' | 'OA' | 'OB' | 'W', string>;
  siteIds: number[];
  principal: Principal;
  fill(text: string): string;
  fixture(name: string): Buffer;
  upload(kind: 'roster' | 'cases', body: string | Buffer, opts?: Partial<ReceiveInput>): ReturnType<typeof receiveIntake>;
}

export async function makeCorner(ds: DataSource): Promise<Corner> {
  const tag = randomBytes(3).toString('hex').toUpperCase();
  const codes = { S1: `S1${tag}`, S2: `S2${tag}`, GA: `GA${tag}`, GB: `GB${tag}`, GC: `GC${tag}`, OA: `OA${tag}`, OB: `OB${tag}`, W: `T${tag}-` };
  const sites = (await ds.query(`INSERT INTO sites (code, name) VALUES ($1, 'Test site one'), ($2, 'Test site two') RETURNING id`, [codes.S1, codes.S2])) as {
    id: number;
  }[];
  await ds.query(`INSERT INTO exposure_groups (code, name, hazard, exposure_level) VALUES ($1, 'A', 'none', 0), ($2, 'B', 'noise', 1), ($3, 'C', 'dust', 2)`, [
    codes.GA,
    codes.GB,
    codes.GC,
  ]);
  await ds.query(
    `INSERT INTO outcomes (code, name, case_definition, counting_rule) VALUES ($1, 'Outcome A', 'test', 'first_event'), ($2, 'Outcome B', 'test', 'recurrent')`,
    [codes.OA, codes.OB],
  );
  const [user] = (await ds.query(`INSERT INTO users (subject, email, name, role) VALUES ($1, $2, 'Test hygienist', 'hygienist') RETURNING id`, [
    `test-${tag}`,
    `hyg-${tag}@test.invalid`,
  ])) as { id: string }[];
  const siteIds = sites.map((s) => s.id);
  const principal: Principal = { kind: 'user', id: user!.id, email: `hyg-${tag}@test.invalid`, name: 'Test hygienist', role: 'hygienist', siteIds };
  const fill = (text: string) => text.replace(/\{(S1|S2|GA|GB|GC|OA|OB|W)\}/g, (_m, k: keyof typeof codes) => codes[k]);
  return {
    tag,
    codes,
    siteIds,
    principal,
    fill,
    // latin1 maps bytes 1:1, so non-UTF-8 and binary fixtures keep their exact bytes.
    fixture: (name) => Buffer.from(fill(readFileSync(join(fixtureDir, name), 'latin1')), 'latin1'),
    upload: (kind, body, opts = {}) =>
      receiveIntake(ds, {
        kind,
        mode: 'check',
        fileName: `${kind}.csv`,
        principal,
        stream: Readable.from([typeof body === 'string' ? Buffer.from(fill(body)) : body]),
        ...opts,
      }),
  };
}

/** Current roster rows of the corner's sites, as the store holds them. */
export async function currentRoster(
  ds: DataSource,
  siteIds: number[],
): Promise<Array<{ worker_key: string; site: string; month: string; grp: string; hours: string }>> {
  return ds.query(
    `SELECT w.worker_key, si.code AS site, to_char(re.month, 'YYYY-MM') AS month, g.code AS grp, re.hours::text AS hours
     FROM roster_entries re JOIN roster_slices rs ON rs.intake_id = re.intake_id AND rs.site_id = re.site_id AND rs.month = re.month
     JOIN workers w ON w.id = re.worker_id JOIN sites si ON si.id = re.site_id JOIN exposure_groups g ON g.id = re.exposure_group_id
     WHERE re.site_id = ANY($1) ORDER BY 1, 3`,
    [siteIds],
  );
}
