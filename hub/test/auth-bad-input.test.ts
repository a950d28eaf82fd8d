import type { Person } from '@tareline/protocol';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

/** Text that has broken stores before: NUL, lone surrogates, right-to-left marks, long runs. */
const awkwardText = fc.oneof(
  fc.string({ unit: 'binary' }),
  fc.constantFrom('\u0000', 'a\u0000b', '\ud800', '\u202e', ' ', 'x'.repeat(5_000), '%', '../'),
);

/** `id` with lone surrogates replaced (U+FFFD), so it can go in a URL. */
function wellFormed(id: string): string {
  return Buffer.from(id, 'utf8').toString('utf8');
}

/** Bodies that are wrong in every way JSON allows, and some nearly right. */
const badBody = fc.oneof(
  fc.jsonValue(),
  fc.record(
    {
      benchId: fc.oneof(awkwardText, fc.constant('bench-1'), fc.jsonValue()),
      badge: fc.oneof(awkwardText, fc.constant('HR-1001'), fc.jsonValue()),
      pin: fc.oneof(awkwardText, fc.stringMatching(/^\d{4,8}$/), fc.jsonValue()),
      email: fc.oneof(awkwardText, fc.emailAddress(), fc.jsonValue()),
      password: fc.oneof(awkwardText, fc.jsonValue()),
      name: fc.oneof(awkwardText, fc.jsonValue()),
      role: fc.oneof(fc.constantFrom('operator', 'lead', 'admin', 'root'), fc.jsonValue()),
      active: fc.oneof(fc.boolean(), fc.jsonValue()),
    },
    { requiredKeys: [] },
  ),
);

describe('sign-in and people routes, given bad input', () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let admin: string;
  let someoneId: string;

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '100000' });
    admin = await login(hub, DEMO.admin.email, DEMO.admin.password);
    const people = await call<Person[]>(hub, 'GET', '/api/people', { token: admin });
    someoneId = people.body.find((p) => p.name === 'Priya Sandell')!.id;
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  /** Every answer is a client error or a success, in the API's error shape when refused. */
  function expectNoServerError(answer: { status: number; body: unknown }, what: string): void {
    expect(answer.status, what).toBeLessThan(500);
    if (answer.status >= 400) {
      expect(answer.body, what).toEqual({ message: expect.any(String), errors: expect.any(Array) });
    }
  }

  async function send(method: string, path: string, body: string, token?: string) {
    const res = await fetch(`${hub.url}${path}`, {
      method,
      headers: {
        'Content-Type': 'application/json',
        ...(token !== undefined ? { Authorization: `Bearer ${token}` } : {}),
      },
      body,
    });
    const text = await res.text();
    return { status: res.status, body: text ? (JSON.parse(text) as unknown) : undefined };
  }

  const routes: Array<{
    route: string;
    method: string;
    path: (id: string) => string;
    token: () => string | undefined;
  }> = [
    {
      route: 'POST /api/auth/badge',
      method: 'POST',
      path: () => '/api/auth/badge',
      token: () => undefined,
    },
    {
      route: 'POST /api/auth/login',
      method: 'POST',
      path: () => '/api/auth/login',
      token: () => undefined,
    },
    { route: 'POST /api/people', method: 'POST', path: () => '/api/people', token: () => admin },
    {
      route: 'PATCH /api/people/:id',
      method: 'PATCH',
      path: (id) => `/api/people/${id}`,
      token: () => admin,
    },
    {
      route: 'PUT /api/people/:id/badge',
      method: 'PUT',
      path: (id) => `/api/people/${id}/badge`,
      token: () => admin,
    },
    {
      route: 'PUT /api/people/:id/pin',
      method: 'PUT',
      path: (id) => `/api/people/${id}/pin`,
      token: () => admin,
    },
    {
      route: 'PUT /api/people/:id/password',
      method: 'PUT',
      path: (id) => `/api/people/${id}/password`,
      token: () => admin,
    },
  ];

  it.each(routes)('$route never answers 500 to any JSON body or id', async (route) => {
    await fc.assert(
      fc.asyncProperty(
        badBody,
        fc.oneof(
          fc.constant(someoneId),
          awkwardText.filter((t) => t.length > 0),
        ),
        async (body, id) => {
          const path = route.path(encodeURIComponent(wellFormed(id)));
          const answer = await send(route.method, path, JSON.stringify(body), route.token());
          expectNoServerError(answer, `${route.method} ${path} ${JSON.stringify(body)}`);
        },
      ),
      {
        numRuns: 40,
        // A NUL character: PostgreSQL text cannot hold it, in an id or in a new name.
        examples: [
          [{ name: 'Ada\u0000Lin', role: 'operator', badge: 'HR-4040', pin: '1234' }, '\u0000'],
          [{ name: 'Ada Lin', email: 'ada\u0000@x.example' }, someoneId],
        ],
      },
    );
  });

  it('answers a body that is not JSON, or too large, in words', async () => {
    for (const route of routes) {
      const path = route.path(someoneId);
      const broken = await send(route.method, path, '{"name": ', route.token());
      expectNoServerError(broken, `${route.method} ${path} broken JSON`);
      expect(broken.status).toBe(400);
      const huge = await send(
        route.method,
        path,
        JSON.stringify({ name: 'x'.repeat(200_000) }),
        route.token(),
      );
      expectNoServerError(huge, `${route.method} ${path} huge body`);
    }
  });

  it('answers any bearer token that is not one of its own with 401', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.oneof(
          fc.string({ unit: 'grapheme-ascii' }),
          fc.constantFrom(
            'a.b.c',
            // An unsigned token ("alg": "none") claiming to be an admin.
            `${Buffer.from('{"alg":"none","typ":"JWT"}').toString('base64url')}.${Buffer.from(
              '{"sub":"x","role":"admin","jti":"j","iat":1,"exp":99999999999}',
            ).toString('base64url')}.`,
          ),
        ),
        async (token) => {
          for (const [method, path] of [
            ['GET', '/api/me'],
            ['POST', '/api/auth/logout'],
            ['GET', '/api/people'],
          ] as const) {
            const answer = await call(hub, method, path, { token: token.trim() || 'x' });
            expectNoServerError(answer, `${method} ${path} with ${JSON.stringify(token)}`);
            expect(answer.status).toBe(401);
          }
        },
      ),
      { numRuns: 30 },
    );
  });
});
