import type { TestHub } from './test-app.js';

interface ExpressLayer {
  route?: { path: string; methods: Record<string, boolean> };
}

/** Every API route the running Nest app registered with Express, as "METHOD /path", sorted. */
export function registeredApiRoutes(hub: TestHub): string[] {
  const express = hub.app.getHttpAdapter().getInstance() as { router: { stack: ExpressLayer[] } };
  const routes = new Set<string>();
  for (const { route } of express.router.stack) {
    if (!route?.path.startsWith('/api/')) continue;
    for (const [method, on] of Object.entries(route.methods)) {
      if (on && method !== '_all') routes.add(`${method.toUpperCase()} ${route.path}`);
    }
  }
  return [...routes].sort();
}
