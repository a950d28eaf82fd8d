import { Inject, Injectable, Logger, OnApplicationShutdown } from '@nestjs/common';
import type {
  ReadingEvent,
  ScaleLinkSettings,
  ScaleStatusEvent,
  ScaleTransportKind,
} from '@tareline/protocol';
import type { SimulatedScale } from '@tareline/simulator';
import { HubEvents } from '../events/hub-events.js';
import { ScaleLink, type ScaleLinkTimings } from './scale-link.js';
import { SerialTransport } from './transports/serial.transport.js';
import { SimulatedTransport } from './transports/simulated.transport.js';
import type { ScaleTransport } from './transports/scale-transport.js';
import { TcpTransport } from './transports/tcp.transport.js';

/** A bench the hub has no scale link for. */
export class UnknownBenchError extends Error {
  constructor(readonly benchId: string) {
    super(`There is no bench "${benchId}"`);
    this.name = 'UnknownBenchError';
  }
}

/** Builds the transport for a link; tests swap it to reach a mock serial binding. */
export type TransportFactory = (benchId: string, link: ScaleLinkSettings) => ScaleTransport;

export const defaultTransportFactory: TransportFactory = (benchId, link) => {
  switch (link.transport) {
    case 'serial':
      return new SerialTransport(link);
    case 'tcp':
      return new TcpTransport(link);
    case 'simulated':
      return new SimulatedTransport(link, benchId);
  }
};

/**
 * One scale link per bench. The benches feature tells it which benches exist and how their
 * scales are reached ({@link attach}); everyone else reads weights and states through it.
 */
@Injectable()
export class ScalesService implements OnApplicationShutdown {
  private readonly logger = new Logger('Scales');
  private readonly links = new Map<string, ScaleLink>();
  private transportFactory: TransportFactory = defaultTransportFactory;
  private timings: Partial<ScaleLinkTimings> = {};
  private readonly attachListeners = new Set<(benchId: string) => void>();

  constructor(@Inject(HubEvents) private readonly events: HubEvents) {}

  /** For tests: how transports are made and how fast links give up, before any attach. */
  configure(options: { transportFactory?: TransportFactory; timings?: Partial<ScaleLinkTimings> }) {
    if (options.transportFactory) this.transportFactory = options.transportFactory;
    if (options.timings) this.timings = options.timings;
  }

  /** Starts reading a bench's scale (replacing any link it had). */
  async attach(benchId: string, link: ScaleLinkSettings): Promise<void> {
    await this.detach(benchId);
    const scaleLink = new ScaleLink(
      benchId,
      link,
      this.transportFactory(benchId, link),
      this.timings,
    );
    this.links.set(benchId, scaleLink);
    scaleLink.onStatus((status) => this.events.emit('scale.status', status));
    for (const listener of this.attachListeners) listener(benchId);
    scaleLink.start();
    this.logger.log(`${benchId}: reading ${scaleLink.transport.description}`);
  }

  /** Called with the bench id each time a bench gets a (new) scale link, before it starts. */
  onAttach(listener: (benchId: string) => void): () => void {
    this.attachListeners.add(listener);
    return () => this.attachListeners.delete(listener);
  }

  async detach(benchId: string): Promise<void> {
    const link = this.links.get(benchId);
    if (!link) return;
    this.links.delete(benchId);
    await link.stop();
  }

  has(benchId: string): boolean {
    return this.links.has(benchId);
  }

  benchIds(): string[] {
    return [...this.links.keys()];
  }

  status(benchId: string): ScaleStatusEvent {
    return this.link(benchId).status();
  }

  latest(benchId: string): ReadingEvent | undefined {
    return this.link(benchId).latest();
  }

  onReading(benchId: string, listener: (r: ReadingEvent) => void): () => void {
    return this.link(benchId).onReading(listener);
  }

  onStatus(benchId: string, listener: (s: ScaleStatusEvent) => void): () => void {
    return this.link(benchId).onStatus(listener);
  }

  /** Tares (scale command where the format has one, else software); resolves at net ≈ 0. */
  tare(benchId: string): Promise<void> {
    return this.link(benchId).tare();
  }

  zero(benchId: string): Promise<void> {
    return this.link(benchId).zero();
  }

  /** What the bench's latest reading is measured from (see `ScaleLink.frame`). */
  frame(benchId: string): ReturnType<ScaleLink['frame']> {
    return this.link(benchId).frame();
  }

  readabilityG(benchId: string): number {
    return this.link(benchId).readabilityG();
  }

  /** Maximum load in grams where the hub knows it (the simulator's); a real scale does not say. */
  capacityG(benchId: string): number | undefined {
    return this.simulator(benchId)?.options.capacityG;
  }

  transport(benchId: string): ScaleTransportKind {
    return this.link(benchId).transport.kind;
  }

  /** The in-process simulator of a simulated bench. */
  simulator(benchId: string): SimulatedScale | undefined {
    const transport = this.link(benchId).transport;
    return transport instanceof SimulatedTransport ? transport.simulator : undefined;
  }

  async onApplicationShutdown(): Promise<void> {
    await Promise.all(this.benchIds().map((id) => this.detach(id)));
  }

  private link(benchId: string): ScaleLink {
    const link = this.links.get(benchId);
    if (!link) throw new UnknownBenchError(benchId);
    return link;
  }
}
