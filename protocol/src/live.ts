import type { ReadingEvent, ScaleStatusEvent } from './scale/types.js';

/** socket.io namespace of the live bench data. */
export const LIVE_NAMESPACE = '/live';

/**
 * Events the hub sends on `/live`. Every emit in the hub is checked against this map, and the
 * station's socket is typed with it. Later work adds the batch events here.
 */
export interface LiveServerEvents {
  reading: (event: ReadingEvent) => void;
  scaleStatus: (event: ScaleStatusEvent) => void;
}

/** Events the station may send on `/live` (intents only; the hub decides). */
export interface LiveClientEvents {
  [event: string]: (...args: never[]) => void;
}

/** Handshake of a live socket: `io('/live', { query: { benchId }, auth: { token } })`. */
export interface LiveHandshake {
  query: { benchId: string };
  auth: { token?: string };
}
