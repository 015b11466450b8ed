import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { crossFeatureImports, featureViolations, sharedIntoFeatures } from '../../../tests/support/feature-boundaries';

// Code flows from the shared folders (api, components, config, lib) into features and from
// features into app; a feature never imports from another. What several features read lives in src/api/.
const featuresDir = fileURLToPath(new URL('../features/', import.meta.url));

describe('feature boundaries', () => {
  it('finds an import into another feature and lets shared and own imports through', () => {
    const root = join(featuresDir, 'imaginary-root');
    const file = join(root, 'rules', 'rules-page.tsx');
    const source = [
      "import { useGroups } from '../groups/api/get-groups';",
      "import type { Flag } from '../flags/flag-labels';",
      "export { runKeys } from '../../imaginary-root/runs/api/run-keys';",
      "const lazy = () => import('../results/overview-page');",
      "import { useSites } from '../../api/get-sites';",
      "import { useRules } from './api/get-rules';",
      "import { describeRule } from '../rules/describe-rule';",
      "import { z } from 'zod';",
      "// import { nothing } from '../admin/people-page';",
      'const text = "from \'../admin/people-page\'";',
    ].join('\n');
    expect(crossFeatureImports(file, source, root)).toEqual([
      '../groups/api/get-groups',
      '../flags/flag-labels',
      '../../imaginary-root/runs/api/run-keys',
      '../results/overview-page',
    ]);
  });

  it('no feature imports from another feature', () => {
    const { features, violations } = featureViolations(featuresDir);
    expect(features).toBeGreaterThan(1);
    expect(violations).toEqual([]);
  });

  it('the shared folders never import from a feature', () => {
    const { files, violations } = sharedIntoFeatures(fileURLToPath(new URL('../', import.meta.url)), ['api', 'components', 'config', 'lib']);
    expect(files).toBeGreaterThan(10);
    expect(violations).toEqual([]);
  });
});
