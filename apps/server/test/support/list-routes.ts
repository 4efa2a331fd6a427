import type { TestApp } from './test-app.js';

interface Layer {
  route?: { path: string; methods: Record<string, boolean> };
}

/** The routes Express actually serves, read from its router (so nothing can hide from the matrix). */
export function listHttpRoutes(app: TestApp): { method: string; path: string }[] {
  const express = app.app.getHttpAdapter().getInstance() as { router: { stack: Layer[] } };
  const routes: { method: string; path: string }[] = [];
  for (const layer of express.router.stack) {
    if (!layer.route) continue;
    for (const [method, on] of Object.entries(layer.route.methods)) {
      if (on && method !== '_all') routes.push({ method: method.toUpperCase(), path: layer.route.path });
    }
  }
  return routes;
}
