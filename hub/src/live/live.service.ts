import { Inject, Injectable, OnApplicationShutdown, OnModuleInit } from '@nestjs/common';
import type { BatchEvent, PourEvent, ReadingEvent, ScaleStatusEvent } from '@tareline/protocol';
import { OnHubEvent, type HubEventMap } from '../events/hub-events.js';
import { goneStatus } from '../hubs/hub-directory.js';
import { ScalesService } from '../scales/scales.service.js';
import { LiveGateway } from './live.gateway.js';
import { TrailingThrottle } from './reading-throttle.js';

/** 25 readings a second per bench at most: more than a screen can show, and it never drops the newest. */
export const MAX_READINGS_PER_S = 25;

/**
 * Forwards to each bench's room on the live socket: its scale's readings (throttled) and the hub
 * events about it (scale state, batch changes, judged pours).
 */
@Injectable()
export class LiveService implements OnModuleInit, OnApplicationShutdown {
  private readonly throttles = new Map<string, TrailingThrottle<ReadingEvent>>();

  constructor(
    @Inject(ScalesService) private readonly scales: ScalesService,
    @Inject(LiveGateway) private readonly gateway: LiveGateway,
  ) {}

  onModuleInit(): void {
    // Benches attach their scales at bootstrap, after this: follow each link as it comes.
    this.scales.onAttach((benchId) => this.follow(benchId));
    for (const benchId of this.scales.benchIds()) this.follow(benchId);
  }

  private follow(benchId: string): void {
    this.throttles.get(benchId)?.dispose();
    const throttle = new TrailingThrottle<ReadingEvent>(1000 / MAX_READINGS_PER_S, (reading) =>
      this.gateway.emitReading(reading),
    );
    this.throttles.set(benchId, throttle);
    this.scales.onReading(benchId, (reading) => throttle.push(reading));
  }

  @OnHubEvent('scale.status')
  onScaleStatus(status: ScaleStatusEvent): void {
    this.gateway.emitToBench(status.benchId, 'scaleStatus', status);
  }

  @OnHubEvent('batch.changed')
  onBatchChanged(event: BatchEvent): void {
    this.gateway.emitToBench(event.benchId, 'batch', event);
  }

  @OnHubEvent('pour.judged')
  onPourJudged(event: PourEvent): void {
    this.gateway.emitToBench(event.benchId, 'pour', event);
  }

  /** A silent hub's benches, watched through this hub, go offline on the screens at once. */
  @OnHubEvent('hub.lost')
  onHubLost(event: HubEventMap['hub.lost']): void {
    if (event.self) return;
    for (const benchId of event.benchIds) {
      this.gateway.emitToBenchHere(benchId, 'scaleStatus', goneStatus(benchId, event.hubId));
    }
  }

  onApplicationShutdown(): void {
    for (const throttle of this.throttles.values()) throttle.dispose();
    this.gateway.close();
  }
}
