import type { EntityManager } from 'typeorm';

/**
 * A starting watch rule per outcome, as a hygienist would first set one: flag an exposure group
 * whose rolling 12-month rate ratio has a 95% lower bound above 1, with at least 5 cases (the
 * small-cell threshold: no rule selects on a withheld count) and Benjamini–Hochberg across the
 * groups, the rule's default.
 */
export async function seedDemoRules(em: EntityManager): Promise<void> {
  await em.query(
    `INSERT INTO watch_rules (name, outcome_id, measure, threshold_on, threshold, min_cases, window_kind)
     SELECT 'IRR lower bound above 1 (' || o.code || ')', o.id, 'irr', 'lower_bound', 1, 5, 'rolling12' FROM outcomes o
      WHERE NOT EXISTS (SELECT 1 FROM watch_rules w WHERE w.outcome_id = o.id)`,
  );
}
