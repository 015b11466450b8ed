import type { DataSource } from 'typeorm';
import { ExposureGroupEntity, OutcomeEntity, SiteEntity } from '../entities';
import { seedDemoAccess } from './demo-access';
import { demoCohortShape } from './demo-generator';
import { loadDemoCohort } from './demo-generator-load';
import { seedDemoRules } from './demo-rules';
import { demoExposureGroups, demoOutcomes, demoSites } from './demo-scenario';

/** Loads the demo scenario into an empty database. Returns false when data is already there. */
export async function seedDemo(ds: DataSource): Promise<boolean> {
  return ds.transaction(async (em) => {
    if ((await em.count(SiteEntity)) > 0) return false;
    await em.insert(
      SiteEntity,
      demoSites.map((s) => ({ ...s })),
    );
    await em.insert(
      ExposureGroupEntity,
      demoExposureGroups.map((g) => ({ ...g, description: null })),
    );
    await em.insert(
      OutcomeEntity,
      demoOutcomes.map((o) => ({ ...o, lagMonths: 0, referenceGroupId: null })),
    );
    await seedDemoAccess(em);
    await seedDemoRules(em);
    // The generated cohort: monthly rosters since 2020 and the cases they produced (demo-generator.ts).
    await loadDemoCohort(em, demoCohortShape(demoSites.map((s) => s.code)));
    return true;
  });
}
