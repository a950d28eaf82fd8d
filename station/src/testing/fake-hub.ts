import { vi } from 'vitest';

export interface FakeRequest {
  method: string;
  path: string;
  body: unknown;
  token: string | undefined;
}

type Handler = (req: FakeRequest) => [number, unknown?] | Promise<[number, unknown?]>;

/**
 * Stubs `fetch` with a hub that answers by "METHOD /path" (path without `/api`). Health always
 * answers ok; an unknown route answers 404. Returns the list of requests made, for assertions.
 */
export function stubHub(handlers: Record<string, Handler>): FakeRequest[] {
  const requests: FakeRequest[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (input: string, init: RequestInit = {}) => {
      const method = init.method ?? 'GET';
      const path = input.replace(/^\/api/, '');
      const headers = (init.headers ?? {}) as Record<string, string>;
      const req: FakeRequest = {
        method,
        path,
        body: typeof init.body === 'string' ? JSON.parse(init.body) : undefined,
        token: headers.Authorization?.replace(/^Bearer /, ''),
      };
      if (path === '/health') {
        return json(200, {
          status: 'ok',
          version: '0.1.0',
          uptimeS: 1,
          db: { ok: true, driver: 'pglite' },
        });
      }
      const handler = handlers[`${method} ${path}`];
      // The shell's periodic session check is not what the tests look at.
      if (path === '/me' && !handler) return json(404, { message: 'Cannot GET /me', errors: [] });
      requests.push(req);
      if (!handler) return json(404, { message: `Cannot ${method} ${path}`, errors: [] });
      const [status, body] = await handler(req);
      return json(status, body);
    }),
  );
  return requests;
}
function json(status: number, body: unknown): Response {
  return new Response(body === undefined ? null : JSON.stringify(body), {
    status,
    headers: { 'Content-Type': 'application/json' },
  });
}

/** A sign-in answer as the hub gives it. */
export function signInAnswer(
  user: { name: string; role: 'operator' | 'lead' | 'admin' },
  bench?: { id: string; idleSignOutMin?: number },
) {
  return {
    token: `token-of-${user.name.replace(/\s/g, '-')}`,
    user: { id: `id-${user.name}`, ...user },
    expiresAt: Date.now() + 12 * 3600_000,
    ...(bench
      ? {
          bench: {
            id: bench.id,
            name: bench.id === 'bench-1' ? 'Bench 1' : 'Casting bench',
            pinRequired: false,
            idleSignOutMin: bench.idleSignOutMin ?? 5,
          },
        }
      : {}),
  };
}
