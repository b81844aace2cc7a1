// Every route an Express app really mounts, read from Express's own router (not from the route tables,
// so that a path mounted some other way shows up too), with the route-table description its last
// handler carries when it was made by route() (backend/src/routes/route-table.ts).
import type { Express } from 'express';
import type { Route } from '../../../backend/src/routes/route-table';

export interface MountedRoute {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  /** The full path, e.g. `/api/build-sheets/:sheetId`. */
  path: string;
  /** The route table's description, or null for a route mounted without route(). */
  spec: Route | null;
}

type Layer = {
  rawPath?: string;
  slash?: boolean;
  route?: { path: string; methods: Record<string, boolean>; stack: { handle: { routeSpec?: Route } }[] };
  handle?: { stack?: Layer[] };
};

export function mountedRoutes(app: Express, under = '/api'): MountedRoute[] {
  const out: MountedRoute[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        const last = layer.route.stack[layer.route.stack.length - 1];
        for (const m of Object.keys(layer.route.methods)) {
          if (m === '_all') continue;
          out.push({ method: m as MountedRoute['method'], path: prefix + layer.route.path, spec: last?.handle.routeSpec ?? null });
        }
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack, prefix + (layer.slash || !layer.rawPath ? '' : layer.rawPath));
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '');
  // The front end's SPA fallback and static files are not API routes.
  return out.filter((r) => r.path === under || r.path.startsWith(`${under}/`));
}

export const routeKey = (r: { method: string; path: string }) => `${r.method.toUpperCase()} ${r.path}`;
