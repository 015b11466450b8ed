import type { DataSource, EntityManager } from 'typeorm';
import type { SiteCreate, SiteDto, SiteUpdate } from '@ratewarden/shared/groups';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordAudit } from '../../audit/audit-log';
import { AppError } from '../../lib/app-error';
import { changedFields } from '../../lib/changed-fields';

const siteCols = `id, code, name, region, retired_at AS "retiredAt"`;
type SiteRow = Omit<SiteDto, 'retiredAt'> & { retiredAt: Date | string | null };
const dto = (r: SiteRow): SiteDto => ({ ...r, retiredAt: r.retiredAt === null ? null : new Date(r.retiredAt).toISOString() });

/** Every site, retired ones too (their history stays readable); active first, by code. */
export async function listSites(db: DataSource | EntityManager): Promise<SiteDto[]> {
  const rows: SiteRow[] = await db.query(`SELECT ${siteCols} FROM sites ORDER BY retired_at IS NOT NULL, code`);
  return rows.map(dto);
}

async function siteById(em: EntityManager, id: number, lock = false): Promise<SiteDto> {
  const rows: SiteRow[] = await em.query(`SELECT ${siteCols} FROM sites WHERE id = $1${lock ? ' FOR UPDATE' : ''}`, [id]);
  if (!rows[0]) throw new AppError('not_found', 'no such site');
  return dto(rows[0]);
}

export async function createSite(ds: DataSource, p: Principal, body: SiteCreate, ip?: string | null): Promise<SiteDto> {
  return ds.transaction(async (em) => {
    const [{ id }] = await em
      .query(`INSERT INTO sites (code, name, region) VALUES ($1, $2, $3) RETURNING id`, [body.code, body.name, body.region])
      .catch((e: unknown) => {
        if ((e as { code?: string }).code === '23505') throw new AppError('conflict', `a site with code ${body.code} already exists`);
        throw e;
      });
    const after = await siteById(em, id);
    await recordAudit(em, { actor: p, action: 'site.create', target: `site:${id}`, ip, detail: { before: null, after } });
    return after;
  });
}

/** Rename (name, region); the code stays, since rosters and case files already carry it. */
export async function updateSite(ds: DataSource, p: Principal, id: number, body: SiteUpdate, ip?: string | null): Promise<SiteDto> {
  return ds.transaction(async (em) => {
    const before = await siteById(em, id, true);
    if (!changedFields(before, body).length) return before;
    const next = { ...before, ...body };
    await em.query(`UPDATE sites SET name = $2, region = $3, updated_at = now() WHERE id = $1`, [id, next.name, next.region]);
    const after = await siteById(em, id);
    await recordAudit(em, { actor: p, action: 'site.rename', target: `site:${id}`, ip, detail: { before, after } });
    return after;
  });
}

/**
 * Retire a site, or reinstate it. A retired site keeps its rosters, cases, results and flags; it is
 * no longer expected to report months after the one it was retired in (shared/src/periods.ts), and
 * the months it did report still count. Both request a run, since completeness changes with it.
 */
export async function setSiteRetired(ds: DataSource, p: Principal, id: number, retired: boolean, ip?: string | null): Promise<SiteDto> {
  return ds.transaction(async (em) => {
    const before = await siteById(em, id, true);
    if ((before.retiredAt !== null) === retired) return before;
    await em.query(`UPDATE sites SET retired_at = ${retired ? 'now()' : 'NULL'}, updated_at = now() WHERE id = $1`, [id]);
    const after = await siteById(em, id);
    await recordAudit(em, { actor: p, action: retired ? 'site.retire' : 'site.reinstate', target: `site:${id}`, ip, detail: { before, after } });
    await em.query(`INSERT INTO run_requests (reason) VALUES ($1)`, [`site ${before.code} ${retired ? 'retired' : 'reinstated'}`]);
    return after;
  });
}
