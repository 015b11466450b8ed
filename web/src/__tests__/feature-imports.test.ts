import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

// The rule is from the bulletproof-react project structure (unidirectional codebase): code flows from
// the shared folders (api, components, config, lib) into features and from features into app, and
// a feature never imports from another feature. What several features read lives in src/api/.
const featuresDir = fileURLToPath(new URL('../features/', import.meta.url));

/** Relative imports of `source` (the text of `file`) that resolve into a feature folder other than its own. */
function crossFeatureImports(file: string, source: string, root: string): string[] {
  const own = relative(root, file).split(sep)[0];
  // preProcessFile reads import, import type, export … from, import() and require(), skipping comments and strings.
  return ts
    .preProcessFile(source, true, true)
    .importedFiles.map((f) => f.fileName)
    .filter((spec) => spec.startsWith('.'))
    .filter((spec) => {
      const target = relative(root, resolve(dirname(file), spec));
      const top = target.split(sep)[0];
      return top !== '..' && top !== own;
    });
}

function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const path = join(dir, e.name);
    if (e.isDirectory()) return sourceFiles(path);
    return /\.tsx?$/.test(e.name) ? [path] : [];
  });
}

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
      "const text = \"from '../admin/people-page'\";",
    ].join('\n');
    expect(crossFeatureImports(file, source, root)).toEqual([
      '../groups/api/get-groups',
      '../flags/flag-labels',
      '../../imaginary-root/runs/api/run-keys',
      '../results/overview-page',
    ]);
  });

  it('no feature imports from another feature', () => {
    const files = sourceFiles(featuresDir);
    const features = new Set(files.map((f) => relative(featuresDir, f).split(sep)[0]));
    expect(features.size).toBeGreaterThan(1);

    const violations = files.flatMap((file) =>
      crossFeatureImports(file, readFileSync(file, 'utf8'), featuresDir).map((spec) => `${relative(featuresDir, file)} imports ${spec}`),
    );
    expect(violations).toEqual([]);
  });

  it('the shared folders never import from a feature', () => {
    const srcDir = fileURLToPath(new URL('../', import.meta.url));
    const shared = ['api', 'components', 'config', 'lib'].flatMap((d) => sourceFiles(join(srcDir, d)));
    expect(shared.length).toBeGreaterThan(10);
    const violations = shared.flatMap((file) =>
      ts
        .preProcessFile(readFileSync(file, 'utf8'), true, true)
        .importedFiles.map((f) => f.fileName)
        .filter((spec) => spec.startsWith('.') && relative(srcDir, resolve(dirname(file), spec)).split(sep)[0] === 'features')
        .map((spec) => `${relative(srcDir, file)} imports ${spec}`),
    );
    expect(violations).toEqual([]);
  });
});
