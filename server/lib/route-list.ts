import type { Router } from 'express';

export interface RouteSignature {
  method: string;
  path: string;
}

/** The routes a set of mounted routers answer, as "METHOD /full/path" (for the matrix test). */
export function listRoutes(mounts: [string, Router][]): RouteSignature[] {
  const out: RouteSignature[] = [];
  for (const [base, router] of mounts) {
    for (const layer of router.stack as unknown as {
      route?: { path: string; methods: Record<string, boolean> };
    }[]) {
      if (!layer.route) continue;
      const sub = layer.route.path === '/' ? '' : layer.route.path;
      for (const [method, on] of Object.entries(layer.route.methods)) {
        if (on && method !== '_all')
          out.push({ method: method.toUpperCase(), path: `${base}${sub}` || '/' });
      }
    }
  }
  return out;
}
