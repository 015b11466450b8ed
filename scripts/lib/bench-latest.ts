import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

/** Where `npm run bench` keeps its figures. */
export const latestPath = (root: string): string => join(root, '.data', 'bench', 'latest.json');

/**
 * Merges sections into `.data/bench/latest.json`, re-read first so that the other sections'
 * figures stay; each section gets its measurement time unless `stamp` is false (a section keyed
 * by route labels, whose every key is a route).
 */
export function mergeLatest(root: string, sections: Record<string, object>, stamp = true): string {
  const path = latestPath(root);
  const latest = existsSync(path) ? (JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>) : {};
  const measuredAt = new Date().toISOString();
  for (const [key, value] of Object.entries(sections)) latest[key] = stamp ? { ...value, measuredAt } : value;
  writeFileSync(path, `${JSON.stringify(latest, null, 2)}\n`);
  return path;
}
