import { z } from 'zod';
import type { BatchEvent, PourEvent } from './batches.js';
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
  /** The bench's batch changed (created, tared, part confirmed, saved, abandoned, interrupted). */
  batch: (event: BatchEvent) => void;
  /** The hub's judgement of the latest reading against the active pour. */
  pour: (event: PourEvent) => void;
  /** Who is signed in at the bench itself (its own screen), sent on connect and on each change. */
  presence: (event: BenchPresenceEvent) => void;
}

/**
 * The people whose bench screen is open at a bench (signed in there by badge), one entry each
 * however many screens they have open; people watching from a desk are not listed.
 */
export const benchPresenceEventSchema = z.object({
  benchId: z.string(),
  people: z.array(z.object({ id: z.string(), name: z.string() })),
});
export type BenchPresenceEvent = z.infer<typeof benchPresenceEventSchema>;

/** Events the station may send on `/live` (intents only; the hub decides). */
export interface LiveClientEvents {
  [event: string]: (...args: never[]) => void;
}

/** Handshake of a live socket: `io('/live', { query: { benchId }, auth: { token } })`. */
export interface LiveHandshake {
  query: { benchId: string };
  auth: { token?: string };
}
