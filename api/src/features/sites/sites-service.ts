import type { DataSource, EntityManager } from 'typeorm';
import { SiteEntity, type Site } from '@ratewarden/db';
import { requestRun } from '@ratewarden/db/run-requests';
import type { SiteCreate, SiteDto, SiteUpdate } from '@ratewarden/shared/groups';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordAudit } from '../../audit/audit-log';
import { AppError } from '../../lib/app-error';
import { changedFields } from '../../lib/changed-fields';

/** A site as the API answers it. */
const siteDto = (s: Site): SiteDto => ({ id: s.id, code: s.code, name: s.name, region: s.region, retiredAt: s.retiredAt?.toISOString() ?? null });

/** Every site, retired ones too (their history stays readable); active first, by code. */
export async function listSites(db: DataSource | EntityManager): Promise<SiteDto[]> {
  const sites = await db.getRepository(SiteEntity).createQueryBuilder('s').orderBy('s.retiredAt IS NOT NULL').addOrderBy('s.code').getMany();
  return sites.map(siteDto);
}

async function siteById(em: EntityManager, id: number, lock = false): Promise<SiteDto> {
  const site = await em.getRepository(SiteEntity).findOne({ where: { id }, ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}) });
  if (!site) throw new AppError('not_found', 'no such site');
  return siteDto(site);
}

export async function createSite(ds: DataSource, p: Principal, body: SiteCreate, ip?: string | null): Promise<SiteDto> {
  return ds.transaction(async (em) => {
    const created = await em
      .getRepository(SiteEntity)
      .save({ code: body.code, name: body.name, region: body.region })
      .catch((e: unknown) => {
        if ((e as { code?: string }).code === '23505') throw new AppError('conflict', `a site with code ${body.code} already exists`);
        throw e;
      });
    const after = await siteById(em, created.id);
    await recordAudit(em, { actor: p, action: 'site.create', target: `site:${created.id}`, ip, detail: { before: null, after } });
    return after;
  });
}

/** Rename (name, region); the code stays, since rosters and case files already carry it. */
export async function updateSite(ds: DataSource, p: Principal, id: number, body: SiteUpdate, ip?: string | null): Promise<SiteDto> {
  return ds.transaction(async (em) => {
    const before = await siteById(em, id, true);
    if (!changedFields(before, body).length) return before;
    const next = { ...before, ...body };
    await em.getRepository(SiteEntity).update(id, { name: next.name, region: next.region });
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
    await em.getRepository(SiteEntity).update(id, { retiredAt: retired ? () => 'now()' : null });
    const after = await siteById(em, id);
    await recordAudit(em, { actor: p, action: retired ? 'site.retire' : 'site.reinstate', target: `site:${id}`, ip, detail: { before, after } });
    await requestRun(em, `site ${before.code} ${retired ? 'retired' : 'reinstated'}`);
    return after;
  });
}
