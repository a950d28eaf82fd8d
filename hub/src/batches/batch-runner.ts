import {
  Inject,
  Injectable,
  Logger,
  type BeforeApplicationShutdown,
  type OnApplicationBootstrap,
  type OnApplicationShutdown,
} from '@nestjs/common';
import type { ReadingEvent, ScaleStatusEvent } from '@tareline/protocol';
import { CLOCK, type Clock } from '../common/clock.js';
import { StoreUnavailable } from '../common/domain-errors.js';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { HubEvents, OnHubEvent } from '../events/hub-events.js';
import { ScalesService } from '../scales/scales.service.js';
import {
  confirmPour,
  interrupt,
  isAdvisoryPour,
  isWeighing,
  judge,
  judgeSteady,
  proposeRescue,
  type BatchRecord,
} from './batch-machine.js';
import { BenchSessions, type BenchScales, type BenchSession } from './bench-sessions.js';

/** Pour events to the station at most this often (readings between are judged, not all sent). */
export const POUR_EMIT_MS = 40;
/**
 * How often a growing pour trace is written: a crash loses at most this much of the trace (the
 * cup's contents themselves are read back from the balance after a restart).
 */
export const TRACE_FLUSH_MS = 400;

/**
 * Readings in, verdicts out: judges every reading against its bench's open batch, keeps the pour
 * trace, confirms a pour that stays steady inside the band for the dwell (saving after the last
 * part), and interrupts a batch whose scale goes away. Publishes `pour.judged`.
 */
@Injectable()
export class BatchRunner
  implements OnApplicationBootstrap, BeforeApplicationShutdown, OnApplicationShutdown
{
  private readonly logger = new Logger('Batches');
  private readonly unsubscribes = new Map<string, () => void>();
  private stopFlushing: (() => void) | undefined;
  /** Set once the hub is closing: its scales going offline then is no interruption. */
  private closing = false;
  private readonly dwellMs: number;

  constructor(
    @Inject(BenchSessions) private readonly sessions: BenchSessions,
    @Inject(ScalesService) private readonly scales: BenchScales,
    @Inject(HubEvents) private readonly events: Pick<HubEvents, 'emit'>,
    @Inject(CLOCK) private readonly clock: Clock,
    @Inject(APP_CONFIG) config: Pick<AppConfig, 'batches'>,
  ) {
    this.dwellMs = config.batches.saveDwellMs;
  }

  async onApplicationBootstrap(): Promise<void> {
    await this.sessions.restore();
    for (const benchId of this.scales.benchIds()) this.watch(benchId);
    this.scales.onAttach((benchId) => this.watch(benchId));
    this.stopFlushing = this.clock.every(TRACE_FLUSH_MS, () => void this.sessions.flushTraces());
  }

  /** Before the scale links close: stop listening, so their closing is not taken as a fault. */
  beforeApplicationShutdown(): void {
    this.closing = true;
    this.stopFlushing?.();
    for (const unsubscribe of this.unsubscribes.values()) unsubscribe();
    this.unsubscribes.clear();
  }

  async onApplicationShutdown(): Promise<void> {
    await this.sessions.flushTraces();
  }

  watch(benchId: string): void {
    this.unsubscribes.get(benchId)?.();
    this.unsubscribes.set(
      benchId,
      this.scales.onReading(benchId, (r) => this.onReading(benchId, r)),
    );
  }

  onReading(benchId: string, reading: ReadingEvent): void {
    const session = this.sessions.of(benchId);
    if (!session || !isWeighing(session.rec.state) || !session.rec.active) return;
    const active = session.rec.active;
    if (active.tared && !reading.outOfRange) {
      session.trace.push([reading.t - session.startedMs, reading.netG]);
      session.traceDirty = true;
    }
    const online = this.scales.status(benchId).state === 'online';
    const verdict = online && !reading.outOfRange ? this.steadyVerdict(session, reading) : null;
    // The dwell runs only while the reading itself is inside the band: a verdict held over one
    // interval of dither is shown, never saved. Part A's band is advice: the operator confirms it.
    const savable =
      verdict === 'GO' && judge(session.rec, reading) === 'GO' && !isAdvisoryPour(active);
    let saveInMs: number | null = null;
    if (savable) {
      session.goSince ??= reading.t;
      saveInMs = Math.max(0, this.dwellMs - (reading.t - session.goSince));
      if (saveInMs === 0) this.autoConfirm(session);
    } else {
      session.goSince = null;
    }
    if (verdict !== session.lastVerdict || reading.t - session.lastPourEmitMs >= POUR_EMIT_MS) {
      session.lastVerdict = verdict;
      session.lastPourEmitMs = reading.t;
      this.events.emit('pour.judged', {
        benchId,
        batchId: session.id,
        part: active.part,
        netG: reading.netG,
        stable: reading.stable,
        verdict,
        saveInMs,
        rescue:
          verdict === 'OVER' && !isAdvisoryPour(active)
            ? this.proposal(session.rec, benchId, reading)
            : null,
        ...(session.saveProblem ? { saveProblem: session.saveProblem } : {}),
      });
    }
  }

  /** The verdict without flicker, held per pour: a new pour (or a new tare) starts afresh. */
  private steadyVerdict(session: BenchSession, reading: ReadingEvent) {
    const active = session.rec.active;
    if (!judge(session.rec, reading) || !active?.band) return null;
    const held = session.held?.active === active ? session.held.zone : null;
    const next = judgeSteady(held, reading, active.band, this.scales.readabilityG(session.benchId));
    session.held = { active, zone: next.held };
    return next.verdict;
  }

  /** A scale that goes away mid-pour interrupts the batch: no verdict without a scale. */
  @OnHubEvent('scale.status')
  onScaleStatus(status: ScaleStatusEvent): void {
    const session = this.sessions.of(status.benchId);
    if (this.closing || !session || !isWeighing(session.rec.state)) return;
    session.goSince = null;
    if (status.state !== 'offline' && status.state !== 'error') return;
    void this.sessions
      .enqueue(session, async () => {
        if (!isWeighing(session.rec.state)) return;
        await this.sessions.commit(
          session,
          interrupt(
            session.rec,
            `The scale went ${status.state}: ${withoutRetryNote(status.detail)}`,
            this.sessions.nowIso(),
          ),
        );
      })
      .catch((err: unknown) =>
        this.logger.error(
          `Batch ${session.id}: could not record the interruption: ${(err as Error).message}`,
        ),
      );
  }

  /** Steady inside the band for the dwell: confirm the pour (and save, after the last part). */
  private autoConfirm(session: BenchSession): void {
    const expected = session.rec;
    void this.sessions
      .enqueue(session, async () => {
        if (session.rec !== expected) return; // something else changed the batch meanwhile
        const next = confirmPour(
          session.rec,
          this.sessions.netReading(session.benchId),
          this.sessions.nowIso(),
        );
        await this.sessions.commit(session, next);
        await this.sessions.tareIfNeeded(session, expected);
      })
      .catch((err: unknown) => {
        // Not saved: the reading moved, or the database refused. The next steady reading
        // retries; a database failure is also told to the bench, which keeps waiting.
        session.goSince = null;
        if (err instanceof StoreUnavailable) {
          session.saveProblem =
            'The hub could not write the batch to its database; it keeps trying';
          session.lastPourEmitMs = 0;
        }
        this.logger.warn(`Batch ${session.id} not saved yet: ${(err as Error).message}`);
      });
  }

  private proposal(rec: BatchRecord, benchId: string, reading: ReadingEvent) {
    try {
      return proposeRescue(rec, reading, this.sessions.capacity(benchId));
    } catch {
      return null;
    }
  }
}

/** A scale state's detail names when the link retries; a batch record keeps only what happened. */
export function withoutRetryNote(detail: string): string {
  return detail.replace(/;?\s*trying again in [\d.]+ s\.?/u, '').trim();
}
