import {
  batchEventSchema,
  benchPresenceEventSchema,
  type BenchPresenceEvent,
  LIVE_NAMESPACE,
  pourEventSchema,
  readingEventSchema,
  type BatchEvent,
  scaleStatusEventSchema,
  type LiveClientEvents,
  type LiveServerEvents,
  type PourEvent,
  type ReadingEvent,
  type ScaleStatusEvent,
} from '@tareline/protocol';
import { useEffect, useState } from 'react';
import { io, type Socket } from 'socket.io-client';

export interface LiveBench {
  /** The newest reading the hub sent; undefined until the first one. */
  reading: ReadingEvent | undefined;
  /** The scale's state as the hub sees it; `connecting` until the hub says otherwise. */
  status: ScaleStatusEvent;
  /** Whether this screen's socket to the hub is up. */
  connected: boolean;
  /** Why the hub refused the socket (unknown bench, sign-in needed), if it did. */
  refused: string | undefined;
  /** The newest `batch` event: the bench's batch as the hub committed it; undefined until one. */
  batchEvent: BatchEvent | undefined;
  /** The hub's newest judgement of a reading against the active pour; undefined until one. */
  pour: PourEvent | undefined;
  /** Who has the bench's own screen open; undefined until the hub says. */
  presence: BenchPresenceEvent | undefined;
}

type LiveSocket = Socket<LiveServerEvents, LiveClientEvents>;

/**
 * The live weights, scale state, batch and pour judgements of one bench, over socket.io, each
 * checked against the protocol's schema. The hub throttles readings to 25 a second; every event
 * replaces the last of its kind (no history kept here).
 */
export function useLiveBench(benchId: string, options: { token?: string } = {}): LiveBench {
  const { token } = options;
  const [state, setState] = useState<{ benchId: string } & LiveBench>(() => initial(benchId));

  useEffect(() => {
    // Patches the state of this bench; a state left from another bench starts over.
    const update = (patch: Partial<LiveBench>) =>
      setState((s) => ({ ...(s.benchId === benchId ? s : initial(benchId)), ...patch }));
    const socket: LiveSocket = io(LIVE_NAMESPACE, {
      query: { benchId },
      auth: token ? { token } : {},
      transports: ['websocket'],
    });
    socket.on('connect', () => update({ connected: true, refused: undefined }));
    socket.on('disconnect', () =>
      // Without the hub there is no scale state to trust.
      update({
        connected: false,
        status: { benchId, state: 'offline', detail: 'The hub cannot be reached' },
      }),
    );
    socket.on('connect_error', (err) => {
      // `active` is false when the hub refused the handshake: socket.io will not retry then.
      const refused = socket.active ? undefined : err.message;
      update({
        connected: false,
        refused,
        status: { benchId, state: 'offline', detail: refused ?? 'The hub cannot be reached' },
      });
    });
    socket.on('reading', (event) => {
      const parsed = readingEventSchema.safeParse(event);
      if (parsed.success && parsed.data.benchId === benchId) update({ reading: parsed.data });
    });
    socket.on('scaleStatus', (event) => {
      const parsed = scaleStatusEventSchema.safeParse(event);
      if (parsed.success && parsed.data.benchId === benchId) update({ status: parsed.data });
    });
    socket.on('batch', (event) => {
      const parsed = batchEventSchema.safeParse(event);
      if (parsed.success && parsed.data.benchId === benchId) update({ batchEvent: parsed.data });
    });
    socket.on('pour', (event) => {
      const parsed = pourEventSchema.safeParse(event);
      if (parsed.success && parsed.data.benchId === benchId) update({ pour: parsed.data });
    });
    socket.on('presence', (event) => {
      const parsed = benchPresenceEventSchema.safeParse(event);
      if (parsed.success && parsed.data.benchId === benchId) update({ presence: parsed.data });
    });
    return () => {
      socket.removeAllListeners();
      socket.disconnect();
    };
  }, [benchId, token]);

  const { benchId: _shownBench, ...live } = state.benchId === benchId ? state : initial(benchId);
  return live;
}

function initial(benchId: string): { benchId: string } & LiveBench {
  return {
    benchId,
    reading: undefined,
    status: { benchId, state: 'connecting', detail: 'Connecting to the hub…' },
    connected: false,
    refused: undefined,
    batchEvent: undefined,
    pour: undefined,
    presence: undefined,
  };
}
