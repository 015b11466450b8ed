import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { featureViolations, sharedIntoFeatures } from '../../../tests/support/feature-boundaries';

// The API's features (src/features/<name>) are routers with their services: a feature never
// imports another's internals, and the shared folders (auth, audit, disclosure, lib, middleware, routes)
// never import a feature. What two features need lives in a shared folder. Only app.ts mounts features.
const srcDir = fileURLToPath(new URL('../', import.meta.url));

describe('api feature boundaries', () => {
  it('no feature imports from another feature', () => {
    const { features, violations } = featureViolations(fileURLToPath(new URL('../features/', import.meta.url)));
    expect(features).toBeGreaterThan(5);
    expect(violations).toEqual([]);
  });

  it('the shared folders never import from a feature', () => {
    const { files, violations } = sharedIntoFeatures(srcDir, ['auth', 'audit', 'disclosure', 'lib', 'middleware', 'routes']);
    expect(files).toBeGreaterThan(10);
    expect(violations).toEqual([]);
  });
});
