import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import ts from 'typescript';

/**
 * Import boundaries between feature folders, shared by the web's and the api's boundary tests.
 * The rule is from the bulletproof-react project structure (unidirectional codebase): code flows
 * from the shared folders into features and from features into the app, and a feature never
 * imports from another feature.
 */

/** Relative imports of `source` (the text of `file`, a file under `root`) that resolve to a path for which `leaves` says true. */
export function importsLeaving(file: string, source: string, leaves: (target: string) => boolean): string[] {
  // preProcessFile reads import, import type, export … from, import() and require(), skipping comments and strings.
  return ts
    .preProcessFile(source, true, true)
    .importedFiles.map((f) => f.fileName)
    .filter((spec) => spec.startsWith('.') && leaves(resolve(dirname(file), spec)));
}

/** Relative imports of `source` (the text of `file`) that resolve into a feature folder of `root` other than its own. */
export function crossFeatureImports(file: string, source: string, root: string): string[] {
  const own = relative(root, file).split(sep)[0];
  return importsLeaving(file, source, (target) => {
    const top = relative(root, target).split(sep)[0];
    return top !== '..' && top !== own;
  });
}

/** Every .ts and .tsx file under `dir`. */
export function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const path = join(dir, e.name);
    if (e.isDirectory()) return sourceFiles(path);
    return /\.tsx?$/.test(e.name) ? [path] : [];
  });
}

/** "file imports spec" for every import from one feature of `featuresDir` into another. */
export function featureViolations(featuresDir: string): { features: number; violations: string[] } {
  const files = sourceFiles(featuresDir);
  const features = new Set(files.map((f) => relative(featuresDir, f).split(sep)[0]));
  const violations = files.flatMap((file) =>
    crossFeatureImports(file, readFileSync(file, 'utf8'), featuresDir).map((spec) => `${relative(featuresDir, file)} imports ${spec}`),
  );
  return { features: features.size, violations };
}

/** "file imports spec" for every import from a file of `dirs` (folders of `srcDir`) into `srcDir/features`. */
export function sharedIntoFeatures(srcDir: string, dirs: string[]): { files: number; violations: string[] } {
  const files = dirs.flatMap((d) => sourceFiles(join(srcDir, d)));
  const violations = files.flatMap((file) =>
    importsLeaving(file, readFileSync(file, 'utf8'), (target) => relative(srcDir, target).split(sep)[0] === 'features').map(
      (spec) => `${relative(srcDir, file)} imports ${spec}`,
    ),
  );
  return { files: files.length, violations };
}
