import 'reflect-metadata';
import type { LiveServerEvents } from '@tareline/protocol';
import { io, type Socket } from 'socket.io-client';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import type { SocketAuthenticator, SocketPrincipal } from '../src/auth/socket-authenticator.js';
import type { HubDirectory } from '../src/hubs/hub-directory.js';
import { LiveGateway } from '../src/live/live.gateway.js';
import type { ScalesService } from '../src/scales/scales.service.js';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

describe('live socket sessions on a running hub', () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  const sockets: Socket<LiveServerEvents>[] = [];

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });
  });

  afterEach(() => {
    for (const socket of sockets.splice(0)) socket.disconnect();
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  async function connected(token: string): Promise<Socket<LiveServerEvents>> {
    const socket: Socket<LiveServerEvents> = io(`${hub.url}/live`, {
      query: { benchId: 'bench-1' },
      auth: { token },
      transports: ['websocket'],
      reconnection: false,
    });
    sockets.push(socket);
    await new Promise<void>((resolve, reject) => {
      socket.once('connect', resolve);
      socket.once('connect_error', reject);
    });
    return socket;
  }

  it('drops the bench screen the moment its person signs out', async () => {
    const token = (await badgeSignIn(hub, DEMO.joss.badge)).body.token;
    const socket = await connected(token);
    const dropped = new Promise<string>((resolve) => socket.once('disconnect', resolve));
    expect((await call(hub, 'POST', '/api/auth/logout', { token })).status).toBe(204);
    // Dropped by the hub, not by this client.
    expect(await dropped).toBe('io server disconnect');
  });

  it("keeps other people's screens open when one person signs out", async () => {
    const lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
    const leadSocket = await connected(lead);
    const operator = (await badgeSignIn(hub, DEMO.joss.badge)).body.token;
    const operatorSocket = await connected(operator);
    const dropped = new Promise<void>((resolve) =>
      operatorSocket.once('disconnect', () => resolve()),
    );
    await call(hub, 'POST', '/api/auth/logout', { token: operator });
    await dropped;
    expect(leadSocket.connected).toBe(true);
  });

  it('tells a desk who is signed in at the bench, as people come and go', async () => {
    const lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
    const leadSocket = await connected(lead);
    const seen: { people: { name: string }[] }[] = [];
    leadSocket.on('presence', (e) => seen.push(e));
    const latest = (names: string[]) =>
      vi.waitFor(() => expect(seen.at(-1)?.people.map((p) => p.name)).toEqual(names), 5_000);
    const joss = (await badgeSignIn(hub, DEMO.joss.badge)).body.token;
    const bench = await connected(joss);
    await latest(['Joss Whitcombe']);
    // A second desk watching is not someone at the bench; a second screen of Joss's is the same
    // person.
    await connected(await login(hub, DEMO.admin.email, DEMO.admin.password));
    await connected(joss);
    await latest(['Joss Whitcombe']);
    const before = seen.length;
    bench.disconnect();
    await vi.waitFor(() => expect(seen.length).toBeGreaterThan(before), 5_000);
    await latest(['Joss Whitcombe']);
    for (const s of sockets.filter((x) => x !== leadSocket)) s.disconnect();
    await latest([]);
  });
});

describe('live gateway session re-check', () => {
  afterEach(() => {
    vi.useRealTimers();
  });

  /** A gateway over fake sockets, with an authenticator whose answers the test sets. */
  function gatewayWith(valid: Map<string, boolean>) {
    let ended: (() => void) | undefined;
    const authenticator: SocketAuthenticator = {
      authenticate: () => Promise.reject(new Error('not used here')),
      stillValid: (principal: SocketPrincipal) => Promise.resolve(valid.get(principal.userId)!),
      onSessionEnded: (listener) => {
        ended = listener;
        return () => (ended = undefined);
      },
    };
    const sockets = [...valid.keys()].map((userId) => ({
      data: { principal: { userId, name: userId, role: 'operator', expiresAt: Infinity } },
      disconnect: vi.fn(),
    }));
    const gateway = new LiveGateway(authenticator, {} as ScalesService, {} as HubDirectory);
    // Each hub re-checks its own sockets: `local` is this hub's part of the namespace.
    const fetchSockets = () => Promise.resolve(sockets);
    const namespace = { use: () => undefined, fetchSockets, local: { fetchSockets } };
    Object.assign(gateway, { server: namespace });
    gateway.afterInit(namespace as never);
    return { gateway, sockets, endSession: () => ended?.() };
  }

  it('drops a socket whose person was switched off within five seconds', async () => {
    vi.useFakeTimers();
    const valid = new Map([
      ['tomas', true],
      ['priya', true],
    ]);
    const { gateway, sockets } = gatewayWith(valid);
    try {
      valid.set('tomas', false);
      await vi.advanceTimersByTimeAsync(5_000);
      expect(sockets[0]!.disconnect).toHaveBeenCalledWith(true);
      expect(sockets[1]!.disconnect).not.toHaveBeenCalled();
    } finally {
      gateway.close();
    }
  });

  it('re-checks at once when a session ends, without waiting for the period', async () => {
    vi.useFakeTimers();
    const valid = new Map([['joss', true]]);
    const { gateway, sockets, endSession } = gatewayWith(valid);
    try {
      valid.set('joss', false);
      endSession();
      await vi.advanceTimersByTimeAsync(0);
      expect(sockets[0]!.disconnect).toHaveBeenCalledWith(true);
    } finally {
      gateway.close();
    }
  });
});
