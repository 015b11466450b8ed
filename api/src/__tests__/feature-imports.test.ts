import { readFileSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';
import { featureViolations, sharedIntoFeatures, sourceFiles } from '../../../tests/support/feature-boundaries';

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

/**
 * The development stand-ins (identity provider, SMTP fake) and their packages are development
 * dependencies: code that runs in production (everything but the stand-ins and the tests) never
 * imports a package its workspace lists only under devDependencies.
 */
describe('production code and development dependencies', () => {
  const workspaces = [
    { name: 'api', dir: fileURLToPath(new URL('../', import.meta.url)), standIns: ['stand-ins'] },
    { name: 'worker', dir: fileURLToPath(new URL('../../../worker/src/', import.meta.url)), standIns: ['smtp-fake'] },
  ];
  it.each(workspaces)('$name imports no development dependency outside its stand-ins and tests', ({ dir, standIns }) => {
    const pkg = JSON.parse(readFileSync(join(dir, '..', 'package.json'), 'utf8')) as { devDependencies?: Record<string, string> };
    const devOnly = new Set(Object.keys(pkg.devDependencies ?? {}).filter((n) => !n.startsWith('@types/')));
    expect(devOnly.size).toBeGreaterThan(0);
    const files = sourceFiles(dir).filter((f) => {
      const top = relative(dir, f).split(sep)[0]!;
      return !standIns.includes(top) && top !== '__tests__' && !/\.test\.tsx?$/.test(f);
    });
    const violations = files.flatMap((file) =>
      ts
        .preProcessFile(readFileSync(file, 'utf8'), true, true)
        .importedFiles.map((i) => i.fileName)
        .filter((spec) => devOnly.has(spec.startsWith('@') ? spec.split('/').slice(0, 2).join('/') : spec.split('/')[0]!))
        .map((spec) => `${relative(dir, file)} imports ${spec}`),
    );
    expect(violations).toEqual([]);
  });
});
