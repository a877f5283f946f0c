import type { NestExpressApplication } from '@nestjs/platform-express';

/** "METHOD /api/path/:param", as Express holds it. */
export type RouteKey = string;

interface ExpressLayer {
  name?: string;
  route?: { path: string | string[]; methods: Record<string, boolean> };
  handle?: { stack?: ExpressLayer[] };
}

/**
 * Every route of the running application, read from its Express router (the routes Nest
 * registered for the controllers, plus whatever else was mounted on the app, such as the API
 * description). Nest's not-found fallback (`ALL *path` in a nested router) is not a route of
 * ours; any other route in a nested router would be hidden from this list, so it is an error.
 */
export function routesOf(app: NestExpressApplication): RouteKey[] {
  const instance = app.getHttpAdapter().getInstance() as { router?: { stack: ExpressLayer[] }; _router?: { stack: ExpressLayer[] } };
  const router = instance.router ?? instance._router;
  if (!router) throw new Error('the Express app has no router');
  const routes: RouteKey[] = [];
  for (const layer of router.stack) {
    if (layer.route) {
      const paths = Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path];
      for (const method of Object.keys(layer.route.methods).filter((m) => layer.route!.methods[m])) {
        for (const path of paths) routes.push(`${method === '_all' ? 'ALL' : method.toUpperCase()} ${path}`);
      }
      continue;
    }
    const nested = layer.handle?.stack;
    if (layer.name === 'router' && nested) {
      // Nested routers of middleware only (Nest mounts its error handler that way) hold no routes.
      const inner = nested.filter((l) => l.route).map((l) => `${Object.keys(l.route!.methods).join(',')} ${String(l.route!.path)}`);
      const hidden = inner.filter((r) => r !== '_all *path');
      if (hidden.length > 0) throw new Error(`a nested router with routes this list cannot see: ${hidden.join('; ')}`);
    }
  }
  return routes;
}

/** The path with each `:name` replaced by `params[name]` (URI-encoded); a missing value is an error. */
export function fillPath(path: string, params: Record<string, string | undefined>): string {
  return path.replace(/:([A-Za-z]+)/g, (_, name: string) => {
    const value = params[name];
    if (value === undefined) throw new Error(`no value for :${name} in ${path}`);
    return encodeURIComponent(value);
  });
}
