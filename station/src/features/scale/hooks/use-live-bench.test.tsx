import { act, renderHook } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';

type Handler = (...args: unknown[]) => void;

/** A stand-in for the socket.io client socket: the test plays the hub. */
class FakeSocket {
  handlers = new Map<string, Handler>();
  active = true;
  disconnected = false;
  on(event: string, handler: Handler) {
    this.handlers.set(event, handler);
    return this;
  }
  fire(event: string, ...args: unknown[]) {
    act(() => this.handlers.get(event)?.(...args));
  }
  removeAllListeners() {
    this.handlers.clear();
  }
  disconnect() {
    this.disconnected = true;
  }
}

const sockets: { url: string; options: unknown; socket: FakeSocket }[] = [];
vi.mock('socket.io-client', () => ({
  io: (url: string, options: unknown) => {
    const socket = new FakeSocket();
    sockets.push({ url, options, socket });
    return socket;
  },
}));

const { useLiveBench } = await import('./use-live-bench');

afterEach(() => {
  sockets.length = 0;
});

describe('useLiveBench', () => {
  it('joins the bench on /live and follows its readings and scale state', () => {
    const { result } = renderHook(() => useLiveBench('bench-2'));
    expect(sockets[0]).toMatchObject({ url: '/live', options: { query: { benchId: 'bench-2' } } });
    expect(result.current.status.state).toBe('connecting');
    const { socket } = sockets[0]!;
    socket.fire('connect');
    socket.fire('scaleStatus', { benchId: 'bench-2', state: 'online', detail: 'sim' });
    socket.fire('reading', {
      benchId: 'bench-2',
      seq: 4,
      t: 1,
      grossG: 50,
      netG: 10,
      stable: false,
    });
    expect(result.current.connected).toBe(true);
    expect(result.current.status.state).toBe('online');
    expect(result.current.reading?.netG).toBe(10);
    // Another bench's or malformed events are ignored.
    socket.fire('reading', { benchId: 'bench-9', seq: 5, t: 1, grossG: 1, netG: 1, stable: true });
    socket.fire('reading', { benchId: 'bench-2', seq: 'x' });
    expect(result.current.reading?.seq).toBe(4);
  });

  it('shows the scale offline when the hub goes away, and the reason when it refuses', () => {
    const { result, unmount } = renderHook(() => useLiveBench('bench-7'));
    const { socket } = sockets[0]!;
    socket.fire('connect');
    socket.fire('disconnect');
    expect(result.current.status.state).toBe('offline');
    socket.active = false;
    socket.fire('connect_error', new Error('There is no bench "bench-7"'));
    expect(result.current.refused).toBe('There is no bench "bench-7"');
    unmount();
    expect(socket.disconnected).toBe(true);
  });
});
