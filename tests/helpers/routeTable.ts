import type { Router } from 'express';
import type { z } from 'zod';
import { createApiRouter } from '../../server/routes';

/** One route of the real API router, with what its middleware says about it. */
export type ApiRoute = {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  /** Full path under /api, with Express placeholders (`/api/designs/:id`). */
  path: string;
  /** Roles of its requireRole / requireMember check (admins pass every one); null: no role check on the route. */
  roles: readonly string[] | null;
  /** It authenticates (requireAuth or a role check, on the route or its router). */
  isSignedIn: boolean;
  /** It takes a multipart upload. */
  isUpload: boolean;
  /** The zod schemas of its validate() middleware. */
  schemas: { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType };
};

type Layer = {
  route?: { path: string; methods: Record<string, boolean>; stack: Layer[] };
  handle: ((...args: unknown[]) => unknown) & { stack?: Layer[]; roles?: readonly string[]; schemas?: ApiRoute['schemas'] };
  name: string;
  rawPath?: string | string[];
};

const AUTH_NAMES = new Set(['requireAuth', 'requireRoleMiddleware']);

function describe(handlers: Layer['handle'][]): Omit<ApiRoute, 'method' | 'path'> {
  const roleCheck = handlers.find((h) => h.roles);
  const validators = handlers.filter((h) => h.schemas);
  return {
    roles: roleCheck?.roles ?? null,
    isSignedIn: handlers.some((h) => AUTH_NAMES.has(h.name)),
    isUpload: handlers.some((h) => h.name === 'uploadFileMiddleware'),
    schemas: Object.assign({}, ...validators.map((v) => v.schemas)),
  };
}

/**
 * Every route of a router, found by walking its stack (nested routers included), so tests cover the routes that
 * exist rather than a list someone keeps by hand. Router-level middleware (`router.use(requireMember)`) counts for
 * the routes registered after it.
 */
export function walkRoutes(router: Router = createApiRouter(), prefix = '/api', inherited: Layer['handle'][] = []): ApiRoute[] {
  const routes: ApiRoute[] = [];
  const above = [...inherited];
  for (const layer of (router as unknown as { stack: Layer[] }).stack) {
    if (layer.route) {
      const handlers = [...above, ...layer.route.stack.map((l) => l.handle)];
      for (const [method, isOn] of Object.entries(layer.route.methods)) {
        if (!isOn || method === '_all') continue;
        const path = layer.route.path === '/' && prefix ? prefix : `${prefix}${layer.route.path}`;
        routes.push({ method: method as ApiRoute['method'], path, ...describe(handlers) });
      }
    } else if (layer.handle.stack) {
      const mount = typeof layer.rawPath === 'string' ? layer.rawPath : '';
      routes.push(...walkRoutes(layer.handle as unknown as Router, `${prefix}${mount === '/' ? '' : mount}`, above));
    } else {
      above.push(layer.handle);
    }
  }
  return routes;
}

/** "POST /api/designs/:id/submit" */
export const routeLabel = (r: Pick<ApiRoute, 'method' | 'path'>) => `${r.method.toUpperCase()} ${r.path}`;

/** The path with every `:param` replaced by `id` (or by `ids[param]`). */
export function fillPath(path: string, id: string | number, ids: Record<string, string | number> = {}): string {
  return path.replace(/:(\w+)/g, (_m, name: string) => String(ids[name] ?? id));
}
