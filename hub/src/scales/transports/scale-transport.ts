import type { Duplex } from 'node:stream';
import type { ScaleTransportKind } from '@tareline/protocol';

/** An open connection to a scale: bytes both ways, and a way to let go of it. */
export interface ScaleConnection {
  readonly stream: Duplex;
  /** Closes the port or socket; resolves once it is released (never rejects). */
  close(): Promise<void>;
}

/**
 * One way of reaching a scale. The scale link opens it again after every loss, so `open` must
 * leave nothing behind when it fails.
 */
export interface ScaleTransport {
  readonly kind: ScaleTransportKind;
  /** For people: `serial /dev/ttyUSB0 9600 8N1`. */
  readonly description: string;
  open(): Promise<ScaleConnection>;
  /**
   * Whether the device is still there, asked while an open connection has gone quiet. A pseudo-
   * terminal or USB adapter that vanishes does not always close the open port; without this
   * check the link would stay `stale` instead of going `offline` and reopening.
   */
  stillThere?(): Promise<boolean>;
  /** Frees what the transport itself holds (the simulator); after this `open` is not called. */
  dispose(): Promise<void>;
}

/**
 * Why an open failed. `absent` means there is nothing there to talk to right now (unplugged,
 * nobody listening): the link shows `offline` and keeps trying. Anything else is an `error`.
 */
export class TransportOpenError extends Error {
  constructor(
    message: string,
    readonly absent: boolean,
  ) {
    super(message);
    this.name = 'TransportOpenError';
  }
}

const ABSENT_CODES = new Set([
  'ENOENT',
  'ENODEV',
  'ENXIO',
  'ECONNREFUSED',
  'EHOSTUNREACH',
  'ECONNRESET',
]);

/** Sorts a system error into absent (offline) or a real problem (error). */
export function toOpenError(err: unknown, what: string): TransportOpenError {
  const e = err as NodeJS.ErrnoException;
  const code = e?.code ?? /\b(E[A-Z]+)\b/.exec(e?.message ?? '')?.[1];
  const absent =
    (code !== undefined && ABSENT_CODES.has(code)) ||
    /no such file|unplugged/i.test(e?.message ?? '');
  return new TransportOpenError(`${what}: ${e?.message ?? String(err)}`, absent);
}
