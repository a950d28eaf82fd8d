import {
  Inject,
  Injectable,
  Logger,
  type BeforeApplicationShutdown,
  type OnApplicationBootstrap,
} from '@nestjs/common';
import { HttpAdapterHost } from '@nestjs/core';
import type { BenchScale, ReadingEvent, ScaleStatusEvent } from '@tareline/protocol';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { Database } from '../database/database.js';
import { HubEvents } from '../events/hub-events.js';
import { ScalesService } from '../scales/scales.service.js';
import { HubsRepository, type HubRow } from './hubs.repository.js';

/** A bench's scale as its hub last told the others: what a bench list shows, and the newest reading. */
export interface ScaleSnapshot {
  scale: BenchScale;
  latest?: ReadingEvent;
}

/** How often a hub on a server writes its heartbeat and reads the others'. */
export const HEARTBEAT_MS = 1_000;
/**
 * A hub silent this long counts as gone. With a heartbeat a second and a check a second, its
 * benches show offline elsewhere within about 4 s, and a hub held up by a busy machine for a
 * moment is not taken for dead.
 */
export const STALE_AFTER_MS = 3_000;

/** Where one bench's scale is read, if not here. */
export interface RemoteBench {
  hubId: string;
  alive: boolean;
  internalUrl: string | null;
  snapshot: ScaleSnapshot;
}

/**
 * The hubs sharing this hub's database (a server PostgreSQL): writes this hub's heartbeat every
 * second with what its scales show, reads the others', and notices one that went silent (its
 * benches go offline here; one hub interrupts its open batches, `hub.lost`). On PGlite a hub is
 * alone and this does nothing.
 */
@Injectable()
export class HubDirectory implements OnApplicationBootstrap, BeforeApplicationShutdown {
  private readonly logger = new Logger('Hubs');
  private others = new Map<string, HubRow>();
  private timer: NodeJS.Timeout | undefined;
  private beating: Promise<void> | undefined;

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(Database) private readonly database: Database,
    @Inject(HubsRepository) private readonly repository: HubsRepository,
    @Inject(ScalesService) private readonly scales: ScalesService,
    @Inject(HubEvents) private readonly events: HubEvents,
    @Inject(HttpAdapterHost) private readonly http: HttpAdapterHost,
  ) {}

  get hubId(): string {
    return this.config.hub.id;
  }

  /** True when other hubs may share the database. */
  get shared(): boolean {
    return this.database.driver === 'postgres';
  }

  async onApplicationBootstrap(): Promise<void> {
    if (!this.shared) return;
    await this.tick();
    this.timer = setInterval(() => this.beat(), HEARTBEAT_MS);
    // A bench taken on is told to the others at once, not a heartbeat later.
    this.scales.onAttach(() => setImmediate(() => this.timer && this.beat()));
  }

  private beat(): void {
    // One beat at a time: a slow database delays the next instead of piling them up.
    this.beating ??= this.tick().finally(() => (this.beating = undefined));
  }

  async beforeApplicationShutdown(): Promise<void> {
    clearInterval(this.timer);
    this.timer = undefined;
    if (!this.shared) return;
    await this.beating;
    await this.repository.signOff(this.hubId).catch(() => undefined);
  }

  /** The bench's hub and last snapshot when another hub reads its scale. */
  remote(benchId: string): RemoteBench | undefined {
    if (this.scales.has(benchId)) return undefined;
    for (const hub of this.others.values()) {
      const snapshot = hub.scales[benchId];
      if (snapshot) {
        return { hubId: hub.id, alive: hub.alive, internalUrl: hub.internalUrl, snapshot };
      }
    }
    return undefined;
  }

  /** A remote bench's scale as the screens here should show it: offline once its hub is gone. */
  remoteScale(benchId: string): BenchScale | undefined {
    const remote = this.remote(benchId);
    if (!remote) return undefined;
    return remote.alive
      ? remote.snapshot.scale
      : { ...remote.snapshot.scale, ...goneStatus(benchId, remote.hubId) };
  }

  /** The address this hub is reached at by the others. */
  private internalUrl(): string | null {
    if (this.config.hub.internalUrl) return this.config.hub.internalUrl;
    const address = this.http.httpAdapter?.getHttpServer()?.address() as
      { port: number } | null | undefined;
    return address ? `http://127.0.0.1:${address.port}` : null;
  }

  private snapshot(): Record<string, ScaleSnapshot> {
    const out: Record<string, ScaleSnapshot> = {};
    for (const benchId of this.scales.benchIds()) {
      const capacityG = this.scales.capacityG(benchId);
      const latest = this.scales.latest(benchId);
      out[benchId] = {
        scale: {
          ...this.scales.status(benchId),
          readabilityG: this.scales.readabilityG(benchId),
          ...(capacityG === undefined ? {} : { capacityG }),
          transport: this.scales.transport(benchId),
        },
        ...(latest ? { latest } : {}),
      };
    }
    return out;
  }

  private async tick(): Promise<void> {
    try {
      // Not alive to the others before it listens: they could not hand it anything yet.
      const internalUrl = this.internalUrl();
      const { wasNotedDown } = internalUrl
        ? await this.repository.beat(this.hubId, internalUrl, this.snapshot())
        : { wasNotedDown: false };
      if (wasNotedDown) {
        this.logger.warn('Another hub found this one silent and interrupted its open batches');
        this.events.emit('hub.lost', {
          hubId: this.hubId,
          benchIds: this.scales.benchIds(),
          takenOver: true,
          self: true,
        });
      }
      const rows = await this.repository.list(STALE_AFTER_MS);
      const next = new Map(rows.filter((r) => r.id !== this.hubId).map((r) => [r.id, r]));
      for (const hub of next.values()) {
        if (hub.alive) continue;
        const wasAlive = this.others.get(hub.id)?.alive === true;
        // One hub notes the silence (a database row, so exactly one) and interrupts.
        const takenOver = await this.repository.noteDown(hub.id, STALE_AFTER_MS);
        if (wasAlive || takenOver) {
          this.logger.warn(`Hub ${hub.id} went silent: its benches are offline here`);
          this.events.emit('hub.lost', {
            hubId: hub.id,
            benchIds: Object.keys(hub.scales),
            takenOver,
            self: false,
          });
        }
      }
      this.others = next;
    } catch (err) {
      this.logger.warn(`Heartbeat not written: ${(err as Error).message.split('\n')[0]}`);
    }
  }
}

/** A bench's scale state when the hub that reads it is silent. */
export function goneStatus(benchId: string, hubId: string): ScaleStatusEvent {
  return {
    benchId,
    state: 'offline',
    detail: `The hub "${hubId}" that reads this scale is not answering`,
  };
}
