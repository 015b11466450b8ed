import type { Express } from 'express';
import type { Permission } from '@ratewarden/shared/permissions';

export interface RouteEntry {
  method: string;
  path: string;
  /** The permission of the route's `authorize()` guard, or null when it has none. */
  permission: Permission | null;
}

interface LayerLike {
  rawPath?: string | string[];
  route?: { path: string; methods: Record<string, boolean>; stack: { handle: { permission?: Permission } }[] };
  handle: { stack?: LayerLike[]; permission?: Permission };
}

/**
 * Reads the route × permission table back from a built app, so a test can prove that every route
 * is guarded and walk it role by role. Guards mounted with `router.use(authorize(..))` count too.
 */
export function listRoutes(app: Express): RouteEntry[] {
  const out: RouteEntry[] = [];
  const walk = (stack: LayerLike[], prefix: string, inherited: Permission | null) => {
    let guard = inherited;
    for (const layer of stack) {
      const raw = Array.isArray(layer.rawPath) ? layer.rawPath : [layer.rawPath ?? ''];
      if (layer.route) {
        const permission = layer.route.stack.map((l) => l.handle.permission).find(Boolean) ?? guard;
        for (const method of Object.keys(layer.route.methods))
          out.push({ method: method.toUpperCase(), path: (prefix + layer.route.path).replace(/(.)\/$/, '$1'), permission: permission ?? null });
      } else if (layer.handle.stack) {
        for (const p of raw) walk(layer.handle.stack, prefix + (p === '/' ? '' : p), guard);
      } else if (layer.handle.permission && raw.every((p) => p === '/' || p === '')) {
        guard = layer.handle.permission;
      }
    }
  };
  walk((app as unknown as { router: { stack: LayerLike[] } }).router.stack, '', null);
  return out;
}
