import type { SignInResponse } from '@tareline/protocol';
import type { TestHub } from './test-app.js';

export interface Answer<T = unknown> {
  status: number;
  body: T;
}

/** Calls the hub with a JSON body and an optional bearer token. */
export async function call<T = unknown>(
  hub: TestHub,
  method: string,
  path: string,
  options: { body?: unknown; token?: string } = {},
): Promise<Answer<T>> {
  const res = await fetch(`${hub.url}${path}`, {
    method,
    headers: {
      ...(options.body !== undefined ? { 'Content-Type': 'application/json' } : {}),
      ...(options.token ? { Authorization: `Bearer ${options.token}` } : {}),
    },
    body: options.body !== undefined ? JSON.stringify(options.body) : undefined,
  });
  // Not every answer is JSON (a backup is a gzipped tarball): those bodies are not parsed.
  if (!res.headers.get('content-type')?.includes('json')) {
    await res.arrayBuffer();
    return { status: res.status, body: undefined as T };
  }
  const text = await res.text();
  return { status: res.status, body: (text ? JSON.parse(text) : undefined) as T };
}

export function badgeSignIn(
  hub: TestHub,
  badge: string,
  pin?: string,
  benchId = 'bench-1',
): Promise<Answer<SignInResponse & { message: string; errors: { path: string }[] }>> {
  return call(hub, 'POST', '/api/auth/badge', {
    body: { benchId, badge, ...(pin !== undefined ? { pin } : {}) },
  });
}

export async function login(hub: TestHub, email: string, password: string): Promise<string> {
  const answer = await call<SignInResponse>(hub, 'POST', '/api/auth/login', {
    body: { email, password },
  });
  if (answer.status !== 200) throw new Error(`login failed: ${JSON.stringify(answer.body)}`);
  return answer.body.token;
}

/** Demo shop (hub/src/demo/demo-shop.ts). */
export const DEMO = {
  admin: { email: 'oda.fenwick@hollin-ridge.example', password: 'ridge-admin-demo' },
  lead: { email: 'ilse.varga@hollin-ridge.example', password: 'ridge-lead-demo' },
  ilse: { badge: 'HR-0002', pin: '4321' },
  tomas: { badge: 'HR-1001', pin: '1357' },
  priya: { badge: 'HR-1002', pin: '2468' },
  joss: { badge: 'HR-1003' },
};
