import { act } from '@testing-library/react';

type Handler = (...args: unknown[]) => void;

/** A stand-in for the socket.io client socket: the test plays the hub's side of `/live`. */
export class FakeSocket {
  handlers = new Map<string, Handler>();
  active = true;
  disconnected = false;
  on(event: string, handler: Handler) {
    this.handlers.set(event, handler);
    return this;
  }
  /** The hub sends an event (inside `act`, so React has drawn it when this returns). */
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

/** Every socket the code under test opened, newest last. */
export const openedSockets: { url: string; options: unknown; socket: FakeSocket }[] = [];

/**
 * The module to put in place of `socket.io-client`:
 * `vi.mock('socket.io-client', () => import('…/fake-live-socket').then((m) => m.fakeSocketIo))`.
 */
export const fakeSocketIo = {
  io: (url: string, options: unknown) => {
    const socket = new FakeSocket();
    openedSockets.push({ url, options, socket });
    return socket;
  },
};

/** The socket the screen has open now (the newest not yet closed). */
export function liveSocket(): FakeSocket {
  const open = openedSockets.filter((s) => !s.socket.disconnected).at(-1);
  if (!open) throw new Error('The screen has no live socket open');
  return open.socket;
}
