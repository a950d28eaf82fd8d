import { Inject, Injectable } from '@nestjs/common';
import { EventEmitter2, OnEvent } from '@nestjs/event-emitter';
import type {
  BatchEvent,
  PourEvent,
  Role,
  ScaleStatusEvent,
  SimulatorStep,
} from '@tareline/protocol';

/**
 * What happens inside the hub that other rooms may want to hear about. Publishers do not know
 * their listeners: the live socket forwards these to the benches, and alerts or an audit trail
 * subscribe to the same names without the batch code changing.
 */
export interface HubEventMap {
  /**
   * A batch was written with a new state (created, a step, saved, interrupted…); `by` is the
   * person whose action it was, when one was (not an automatic save or a restart).
   */
  'batch.changed': BatchEvent & { by?: { id: string; name: string } };
  /** A reading was judged against the open batch of its bench. */
  'pour.judged': PourEvent;
  /** A bench's scale changed state (online, stale, offline, error). */
  'scale.status': ScaleStatusEvent;
  /** Someone drove a simulated bench's scale (what a real bench's operator does by hand). */
  'simulator.driven': {
    benchId: string;
    by: { id: string; name: string; role: Role };
    steps: SimulatorStep[];
    at: string;
  };
  /**
   * A hub sharing the database went silent (`self`: this hub was found silent by another). Its
   * benches are offline; `takenOver` for the one hub that interrupts its open batches.
   */
  'hub.lost': { hubId: string; benchIds: string[]; takenOver: boolean; self: boolean };
}

export type HubEventName = keyof HubEventMap;

/** The typed face of the in-process event bus (`@nestjs/event-emitter`). */
@Injectable()
export class HubEvents {
  constructor(@Inject(EventEmitter2) private readonly emitter: EventEmitter2) {}

  /** Delivers to every listener synchronously; a listener that throws is its own problem. */
  emit<E extends HubEventName>(event: E, payload: HubEventMap[E]): void {
    this.emitter.emit(event, payload);
  }
}

/**
 * Subscribes a provider method to a hub event; the payload type follows from the name:
 * `@OnHubEvent('batch.changed') onBatch(e: HubEventMap['batch.changed'])`.
 */
export function OnHubEvent<E extends HubEventName>(event: E): MethodDecorator {
  // Listener errors are logged by the bus and never reach the publisher.
  return OnEvent(event, { suppressErrors: true });
}
