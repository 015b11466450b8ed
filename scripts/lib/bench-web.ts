import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { buildWebIfStale } from './web-build';

export interface WebBench {
  /** JavaScript the browser must fetch before the first page renders: index.html's module script and its modulepreloads. */
  initialJsGzipKb: number;
  /** Every JavaScript file of the build, lazy route chunks included. */
  totalJsGzipKb: number;
}

const gzipKb = (file: string): number => gzipSync(readFileSync(file), { level: 9 }).length / 1024;
const round1 = (x: number): number => Math.round(x * 10) / 10;

/** Builds web/dist when stale and measures its JavaScript, gzip level 9, in KiB. */
export function benchWeb(root: string): WebBench {
  buildWebIfStale(root);
  const dist = join(root, 'web', 'dist');
  const html = readFileSync(join(dist, 'index.html'), 'utf8');
  const initial = new Set<string>();
  for (const m of html.matchAll(/<script[^>]*type="module"[^>]*src="([^"]+\.js)"/g)) initial.add(m[1]!);
  for (const m of html.matchAll(/<link[^>]*rel="modulepreload"[^>]*href="([^"]+\.js)"/g)) initial.add(m[1]!);
  const assets = join(dist, 'assets');
  const all = readdirSync(assets).filter((f) => f.endsWith('.js'));
  return {
    initialJsGzipKb: round1([...initial].reduce((s, src) => s + gzipKb(join(dist, src.replace(/^\//, ''))), 0)),
    totalJsGzipKb: round1(all.reduce((s, f) => s + gzipKb(join(assets, f)), 0)),
  };
}
