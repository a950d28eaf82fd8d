import type { Role } from '@tareline/protocol';
import { ROLES } from '@tareline/protocol';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PeopleRepository } from '../src/people/people.repository.js';
import { TokenService } from '../src/auth/token.service.js';
import { call } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

type Caller = 'anonymous' | Role;
const CALLERS: readonly Caller[] = ['anonymous', ...ROLES];
const EVERYONE_SIGNED_IN: readonly Role[] = ['operator', 'lead', 'admin'];

/**
 * Who may call each route, as the product intends it. Written out by hand on purpose: a route the
 * hub registers that is missing here fails the suite, so every new route gets a conscious decision.
 */
const EXPECTED: Record<string, 'public' | readonly Role[]> = {
  'GET /api/health': 'public',
  'POST /api/auth/badge': 'public',
  'POST /api/auth/login': 'public',
  'GET /api/me': EVERYONE_SIGNED_IN,
  'POST /api/auth/logout': EVERYONE_SIGNED_IN,
  'GET /api/people': ['admin'],
  'POST /api/people': ['admin'],
  'PATCH /api/people/:id': ['admin'],
  'PUT /api/people/:id/badge': ['admin'],
  'PUT /api/people/:id/pin': ['admin'],
  'PUT /api/people/:id/password': ['admin'],
  'GET /api/me/alerts': EVERYONE_SIGNED_IN,
  'PUT /api/me/alerts': EVERYONE_SIGNED_IN,
  'GET /api/people/:id/alerts': ['admin'],
  'PUT /api/people/:id/alerts': ['admin'],
  'GET /api/outbox': ['admin'],
  'GET /api/mail-catcher': ['admin'],
  'POST /api/plan': 'public',
  'GET /api/benches': EVERYONE_SIGNED_IN,
  // Pours and unplugs as a person at the bench would: signed in, at that bench for operators.
  'POST /api/benches/:id/simulator': EVERYONE_SIGNED_IN,
  // Scale checks: the bench is looked up first (404 here), then the service refuses admins and
  // operators of another bench a check (403, in hub/test/scale-checks.test.ts).
  'POST /api/benches/:id/checks': EVERYONE_SIGNED_IN,
  'GET /api/benches/:id/checks': EVERYONE_SIGNED_IN,
  'GET /api/benches/:id/checks/:checkId': EVERYONE_SIGNED_IN,
  'POST /api/benches/:id/checks/:checkId/cancel': EVERYONE_SIGNED_IN,
  'GET /api/benches/:id/check-status': EVERYONE_SIGNED_IN,
  'PATCH /api/benches/:id': ['admin'],
  'GET /api/materials': EVERYONE_SIGNED_IN,
  'GET /api/materials/:id': EVERYONE_SIGNED_IN,
  'POST /api/materials': ['lead', 'admin'],
  'GET /api/lots': EVERYONE_SIGNED_IN,
  'POST /api/lots': ['lead', 'admin'],
  'PATCH /api/materials/:id': ['lead', 'admin'],
  'GET /api/materials/export.csv': ['lead', 'admin'],
  'POST /api/materials/import': ['lead', 'admin'],
  'GET /api/lots/:id': EVERYONE_SIGNED_IN,
  'GET /api/lots/:id/movements': ['lead', 'admin'],
  'POST /api/lots/:id/adjustments': ['lead', 'admin'],
  'POST /api/materials/:id/documents': ['lead', 'admin'],
  'GET /api/materials/:id/documents': EVERYONE_SIGNED_IN,
  'GET /api/documents/:id': EVERYONE_SIGNED_IN,
  // A browser tab opening a sheet carries a signed link, not a token; without one it is refused.
  'GET /api/documents/:id/open': 'public',
  'GET /api/pour-plans': EVERYONE_SIGNED_IN,
  'GET /api/pour-plans/:id': EVERYONE_SIGNED_IN,
  'POST /api/pour-plans': ['lead', 'admin'],
  'PATCH /api/pour-plans/:id': ['lead', 'admin'],
  'GET /api/batches': EVERYONE_SIGNED_IN,
  'GET /api/batches/current': EVERYONE_SIGNED_IN,
  'GET /api/batches/:id': EVERYONE_SIGNED_IN,
  'GET /api/batches/export.csv': ['lead', 'admin'],
  'POST /api/batches/:id/dispositions': ['lead', 'admin'],
  'GET /api/audit': ['lead', 'admin'],
  'GET /api/accuracy': ['lead', 'admin'],
  'GET /api/audit/verify': ['lead', 'admin'],
  'POST /api/batches': EVERYONE_SIGNED_IN,
  'POST /api/batches/:id/tare': EVERYONE_SIGNED_IN,
  'POST /api/batches/:id/next': EVERYONE_SIGNED_IN,
  'POST /api/batches/:id/rescue': EVERYONE_SIGNED_IN,
  'POST /api/batches/:id/save-no-go': EVERYONE_SIGNED_IN,
  'POST /api/batches/:id/abandon': EVERYONE_SIGNED_IN,
  'POST /api/batches/:id/resume': EVERYONE_SIGNED_IN,
  // A copy of every record, hashes included.
  'GET /api/backup': ['admin'],
};

interface ExpressLayer {
  route?: { path: string; methods: Record<string, boolean> };
}

/** Every route the running Nest app registered with Express, as "METHOD /path". */
function registeredRoutes(hub: TestHub): string[] {
  const express = hub.app.getHttpAdapter().getInstance() as { router: { stack: ExpressLayer[] } };
  const routes = new Set<string>();
  for (const layer of express.router.stack) {
    if (!layer.route) continue;
    for (const [method, on] of Object.entries(layer.route.methods)) {
      if (on && method !== '_all') routes.add(`${method.toUpperCase()} ${layer.route.path}`);
    }
  }
  return [...routes].sort();
}

describe('authorization matrix: every registered route against every kind of caller', () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let routes: string[];
  let personIdByRole: Record<Role, string>;

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });
    routes = registeredRoutes(hub).filter((r) => r.split(' ')[1]!.startsWith('/api/'));
    const people = await hub.app.get(PeopleRepository).list();
    personIdByRole = Object.fromEntries(
      ROLES.map((role) => [role, people.find((p) => p.role === role)!.id]),
    ) as Record<Role, string>;
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  /** A fresh token per call: probing sign-out must not spoil the next probe. */
  async function tokenFor(caller: Caller): Promise<string | undefined> {
    if (caller === 'anonymous') return undefined;
    const { token } = await hub.app
      .get(TokenService)
      .issue({ id: personIdByRole[caller], role: caller }, 'bench-1');
    return token;
  }

  it('finds the routes the hub serves (the discovery itself works)', () => {
    expect(routes).toContain('GET /api/health');
    expect(routes).toContain('POST /api/auth/badge');
    expect(routes.length).toBeGreaterThanOrEqual(Object.keys(EXPECTED).length);
  });

  it('has a declared expectation for every registered route, and no stale ones', () => {
    const undeclared = routes.filter((r) => !(r in EXPECTED));
    const stale = Object.keys(EXPECTED).filter((r) => !routes.includes(r));
    expect(undeclared, 'routes without an entry in EXPECTED').toEqual([]);
    expect(stale, 'entries in EXPECTED the hub no longer serves').toEqual([]);
  });

  it('lets in exactly the callers each route declares, and refuses the rest', async () => {
    const wrong: string[] = [];
    for (const route of routes) {
      const [method, pattern] = route.split(' ') as [string, string];
      // Route parameters get a value that names nothing; access is decided before lookup.
      const path = pattern.replace(/:(\w+)/g, 'no-such-$1');
      const expected = EXPECTED[route];
      for (const caller of CALLERS) {
        const answer = await call(hub, method, path, {
          token: await tokenFor(caller),
          ...(method === 'GET' ? {} : { body: {} }),
        });
        const allowed =
          expected === 'public' || (caller !== 'anonymous' && !!expected?.includes(caller));
        const refusal = caller === 'anonymous' ? 401 : 403;
        const ok = allowed
          ? answer.status !== 401 && answer.status !== 403 && answer.status < 500
          : answer.status === refusal;
        if (!ok)
          wrong.push(
            `${route} as ${caller}: ${answer.status} (${allowed ? 'allowed' : 'refused'} expected)`,
          );
      }
    }
    expect(wrong).toEqual([]);
  });
});
