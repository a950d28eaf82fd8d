import { Inject, Logger } from '@nestjs/common';
import {
  OnGatewayConnection,
  OnGatewayDisconnect,
  OnGatewayInit,
  WebSocketGateway,
  WebSocketServer,
} from '@nestjs/websockets';
import {
  LIVE_NAMESPACE,
  type BenchPresenceEvent,
  type LiveClientEvents,
  type LiveServerEvents,
  type ReadingEvent,
} from '@tareline/protocol';
import type { Namespace, Socket } from 'socket.io';
import {
  SOCKET_AUTHENTICATOR,
  SocketRefusedError,
  type SocketAuthenticator,
  type SocketPrincipal,
} from '../auth/socket-authenticator.js';
import { HubDirectory } from '../hubs/hub-directory.js';
import { ScalesService } from '../scales/scales.service.js';

interface LiveSocketData {
  benchId: string;
  principal: SocketPrincipal;
}

/** Between hubs sharing a server: the readings one hub read, in batches. */
interface BetweenHubs {
  readings: (readings: ReadingEvent[]) => void;
}

type LiveNamespace = Namespace<LiveClientEvents, LiveServerEvents, BetweenHubs, LiveSocketData>;
type LiveSocket = Socket<LiveClientEvents, LiveServerEvents, BetweenHubs, LiveSocketData>;

/**
 * How long readings for the other hubs are gathered before they go as one message: a message
 * per reading (2,000 a second for 100 benches) would queue up in the database for seconds.
 */
export const READINGS_BATCH_MS = 20;

/**
 * How often open sockets are asked again whether their person may still watch: a person switched
 * off stops seeing the bench within this long. A sign-out is pushed and acts at once.
 */
export const RECHECK_EVERY_MS = 5_000;
/** setTimeout's longest delay; a later expiry is caught by the periodic re-check. */
const MAX_TIMER_MS = 2 ** 31 - 1;

export const benchRoom = (benchId: string) => `bench:${benchId}`;

/**
 * The live socket `/live`. A client names its bench in the handshake (`query: { benchId }`,
 * `auth: { token }`); the injected {@link SocketAuthenticator} accepts or refuses it, and an
 * accepted socket joins the room `bench:<id>` and gets the scale's state and newest reading at
 * once. Emits go through {@link emitToBench}, type-checked against `LiveServerEvents`.
 */
@WebSocketGateway({ namespace: LIVE_NAMESPACE })
export class LiveGateway
  implements
    OnGatewayInit<LiveNamespace>,
    OnGatewayConnection<LiveSocket>,
    OnGatewayDisconnect<LiveSocket>
{
  private readonly logger = new Logger('Live');
  private readonly expiryTimers = new Map<string, NodeJS.Timeout>();
  private recheckTimer: NodeJS.Timeout | undefined;
  private stopWatchingSessions: (() => void) | undefined;
  private outgoing: ReadingEvent[] = [];
  private flushTimer: NodeJS.Timeout | undefined;

  @WebSocketServer()
  private readonly server!: LiveNamespace;

  constructor(
    @Inject(SOCKET_AUTHENTICATOR) private readonly authenticator: SocketAuthenticator,
    @Inject(ScalesService) private readonly scales: ScalesService,
    @Inject(HubDirectory) private readonly hubs: HubDirectory,
  ) {}

  afterInit(namespace: LiveNamespace): void {
    namespace.use((socket, next) => {
      const query = socket.handshake.query.benchId;
      const benchId = typeof query === 'string' ? query : undefined;
      const auth = socket.handshake.auth as { token?: unknown } | undefined;
      const token = typeof auth?.token === 'string' ? auth.token : undefined;
      if (!benchId) {
        next(new Error("Name the bench in the handshake: io('/live', { query: { benchId } })"));
        return;
      }
      // A bench whose scale another hub reads is watched here all the same: its events come
      // through the database (the socket.io PostgreSQL adapter).
      if (!this.scales.has(benchId) && !this.hubs.remote(benchId)) {
        next(new Error(`There is no bench "${benchId}"`));
        return;
      }
      this.authenticator.authenticate({ token, benchId }).then(
        (principal) => {
          socket.data = { benchId, principal };
          next();
        },
        (err: unknown) => {
          if (!(err instanceof SocketRefusedError)) {
            this.logger.error(err instanceof Error ? err : String(err));
          }
          next(new Error(err instanceof SocketRefusedError ? err.message : 'Refused by the hub'));
        },
      );
    });
    if (this.hubs.shared) {
      namespace.on('readings', (readings) => {
        for (const reading of readings) {
          namespace.local.to(benchRoom(reading.benchId)).emit('reading', reading);
        }
      });
    }
    this.recheckTimer = setInterval(() => this.recheckSoon(), RECHECK_EVERY_MS);
    this.recheckTimer.unref();
    this.stopWatchingSessions = this.authenticator.onSessionEnded(() => this.recheckSoon());
  }

  async handleConnection(socket: LiveSocket): Promise<void> {
    const { benchId, principal } = socket.data;
    await socket.join(benchRoom(benchId));
    // Someone at the bench: every screen watching it learns; anyone else: this screen alone.
    if (principal.atBench) this.announcePresence(benchId);
    else this.tellPresence(benchId, socket);
    const untilExpiry = principal.expiresAt - Date.now();
    if (untilExpiry < MAX_TIMER_MS) {
      const timer = setTimeout(() => socket.disconnect(true), Math.max(0, untilExpiry));
      this.expiryTimers.set(socket.id, timer);
    }
    if (this.scales.has(benchId)) {
      socket.emit('scaleStatus', this.scales.status(benchId));
      const latest = this.scales.latest(benchId);
      if (latest) socket.emit('reading', latest);
      return;
    }
    const remote = this.hubs.remote(benchId);
    const scale = this.hubs.remoteScale(benchId);
    if (remote && scale) {
      socket.emit('scaleStatus', { benchId, state: scale.state, detail: scale.detail });
      // The newest reading its hub told (up to a heartbeat old); live ones follow.
      if (remote.alive && remote.snapshot.latest) socket.emit('reading', remote.snapshot.latest);
    }
  }

  handleDisconnect(socket: LiveSocket): void {
    clearTimeout(this.expiryTimers.get(socket.id));
    this.expiryTimers.delete(socket.id);
    // socket.io has taken the socket out of its rooms by now, so it is no longer counted.
    const { benchId, principal } = socket.data ?? {};
    if (benchId && principal?.atBench) this.announcePresence(benchId);
  }

  /**
   * Who has the bench's own screen open, from the sockets in its room: on every hub sharing the
   * server too (the adapter asks them), one entry a person.
   */
  private async presenceOf(benchId: string): Promise<BenchPresenceEvent> {
    const sockets = await this.server.in(benchRoom(benchId)).fetchSockets();
    const people = new Map<string, string>();
    for (const s of sockets) {
      const principal = (s.data as Partial<LiveSocketData>).principal;
      if (principal?.atBench) people.set(principal.userId, principal.name);
    }
    return { benchId, people: [...people].map(([id, name]) => ({ id, name })) };
  }

  private announcePresence(benchId: string): void {
    this.presenceOf(benchId).then(
      (event) => this.emitToBench(benchId, 'presence', event),
      (err: unknown) => this.logger.warn(`${benchId}: presence not sent: ${String(err)}`),
    );
  }

  private tellPresence(benchId: string, socket: LiveSocket): void {
    this.presenceOf(benchId).then(
      (event) => socket.emit('presence', event),
      (err: unknown) => this.logger.warn(`${benchId}: presence not sent: ${String(err)}`),
    );
  }

  /** Sends an event to every screen watching a bench. */
  emitToBench<E extends keyof LiveServerEvents>(
    benchId: string,
    event: E,
    ...payload: Parameters<LiveServerEvents[E]>
  ): void {
    this.server?.to(benchRoom(benchId)).emit(event, ...payload);
  }

  /**
   * Sends a reading to every screen watching its bench: at once to this hub's, and gathered for
   * a few milliseconds into one message to the other hubs sharing the server (in order: one
   * connection sends them).
   */
  emitReading(reading: ReadingEvent): void {
    this.emitToBenchHere(reading.benchId, 'reading', reading);
    if (!this.hubs.shared) return;
    this.outgoing.push(reading);
    this.flushTimer ??= setTimeout(() => {
      this.flushTimer = undefined;
      const readings = this.outgoing;
      this.outgoing = [];
      this.server?.serverSideEmit('readings', readings);
    }, READINGS_BATCH_MS);
  }

  /** Sends an event to the screens watching a bench through this hub only (not the others). */
  emitToBenchHere<E extends keyof LiveServerEvents>(
    benchId: string,
    event: E,
    ...payload: Parameters<LiveServerEvents[E]>
  ): void {
    this.server?.local.to(benchRoom(benchId)).emit(event, ...payload);
  }

  /** Stops the periodic re-check (the app is closing). */
  close(): void {
    clearInterval(this.recheckTimer);
    clearTimeout(this.flushTimer);
    this.stopWatchingSessions?.();
    for (const timer of this.expiryTimers.values()) clearTimeout(timer);
    this.expiryTimers.clear();
  }

  private recheckSoon(): void {
    this.recheck().catch((err: unknown) =>
      this.logger.error(err instanceof Error ? err : String(err)),
    );
  }

  private async recheck(): Promise<void> {
    // This hub's own sockets: each hub re-checks its own (asking the others would wait on a
    // silent hub).
    const sockets = await this.server.local.fetchSockets();
    for (const socket of sockets) {
      const ok = await this.authenticator.stillValid(socket.data.principal).catch(() => false);
      if (!ok) socket.disconnect(true);
    }
  }
}
