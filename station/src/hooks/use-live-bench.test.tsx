import { renderHook } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { openedSockets as sockets } from '../testing/fake-live-socket';
import { partBFixture, pourFixture } from '../testing/live-fixtures';

vi.mock('socket.io-client', () =>
  import('../testing/fake-live-socket').then((m) => m.fakeSocketIo),
);

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

  it("carries the bench's batch and the hub's judgement of each pour, and nothing malformed", () => {
    const { result } = renderHook(() => useLiveBench('bench-1'));
    const { socket } = sockets[0]!;
    expect(result.current.batchEvent).toBeUndefined();
    socket.fire('batch', { benchId: 'bench-1', batch: partBFixture() });
    socket.fire('pour', pourFixture({ netG: 13.9, verdict: 'GO', saveInMs: 600 }));
    expect(result.current.batchEvent?.batch?.state).toBe('weighing-b');
    expect(result.current.pour).toMatchObject({ netG: 13.9, verdict: 'GO', saveInMs: 600 });
    // A batch event that does not fit the protocol, or another bench's, changes nothing.
    socket.fire('batch', { benchId: 'bench-1', batch: { id: 'seven' } });
    socket.fire('pour', pourFixture({ benchId: 'bench-2', verdict: 'OVER' }));
    expect(result.current.batchEvent?.batch?.id).toBe(7);
    expect(result.current.pour?.verdict).toBe('GO');
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
