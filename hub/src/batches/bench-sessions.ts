import { Inject, Injectable, Logger } from '@nestjs/common';
import type { Batch, ReadingEvent, ScaleStatusEvent } from '@tareline/protocol';
import type { AuthUser } from '../auth/auth-user.js';
import { CLOCK, type Clock } from '../common/clock.js';
import { ScaleCommandFailed, StoreUnavailable } from '../common/domain-errors.js';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { HubEvents, OnHubEvent, type HubEventMap } from '../events/hub-events.js';
import { ScaleCommandError } from '../scales/scale-link.js';
import { ScalesService } from '../scales/scales.service.js';
import {
  BatchRefusal,
  interrupt,
  isWeighing,
  markTared,
  type BatchRecord,
  type NetReading,
  type HeldZone,
} from './batch-machine.js';
import {
  BatchesRepository,
  detailFor,
  detailOf,
  recordOf,
  toBatch,
  type BatchRow,
  type BatchStore,
} from './batches.repository.js';
import { contentsAfterRestart, type CupContents } from './cup-contents.js';
import { decodeTrace, type TracePoint } from './pour-trace.js';

/** What the batch rooms ask of a bench's scale; `ScalesService` in the hub, a fake in tests. */
export type BenchScales = Pick<
  ScalesService,
  | 'has'
  | 'benchIds'
  | 'status'
  | 'latest'
  | 'tare'
  | 'capacityG'
  | 'readabilityG'
  | 'frame'
  | 'onReading'
  | 'onAttach'
>;

/** A bench's batch in progress (weighing or interrupted), held in memory beside its row. */
export interface BenchSession {
  id: number;
  benchId: string;
  row: BatchRow;
  rec: BatchRecord;
  startedMs: number;
  trace: TracePoint[];
  traceDirty: boolean;
  /** When the current reading first went GO (ms), for the dwell before saving. */
  goSince: number | null;
  /** Why the last automatic save failed to reach the database; undefined once one succeeds. */
  saveProblem?: string;
  lastPourEmitMs: number;
  lastVerdict: string | null;
  /** The zone the gauge shows for the active pour (see `judgeSteady`), and the pour it is for. */
  held?: { active: BatchRecord['active']; zone: HeldZone } | undefined;
  /** Serialises every change to this batch: auto-save and operator intents never race. */
  queue: Promise<unknown>;
}

/**
 * The open batch of every bench. Every change to one goes through its queue, is written to the
 * database first and announced (`batch.changed`) only once it is stored; a pour that moves on to
 * a cup holding earlier parts is tared for the operator.
 */
@Injectable()
export class BenchSessions {
  private readonly logger = new Logger('Batches');
  private readonly sessions = new Map<string, BenchSession>();

  constructor(
    @Inject(BatchesRepository) private readonly store: BatchStore,
    @Inject(ScalesService) private readonly scales: BenchScales,
    @Inject(HubEvents) private readonly events: Pick<HubEvents, 'emit'>,
    @Inject(CLOCK) private readonly clock: Clock,
    @Inject(APP_CONFIG) private readonly config: Pick<AppConfig, 'hub' | 'database'>,
  ) {}

  /** Hubs sharing a server each take back the open batches of their own benches only. */
  private get ownOnly(): string | undefined {
    return this.config.database.url ? this.config.hub.id : undefined;
  }

  nowIso(): string {
    return new Date(this.clock.now()).toISOString();
  }

  /** Takes back the open batches after a start; one being weighed is interrupted, not lost. */
  async restore(): Promise<void> {
    for (const row of await this.store.findOpen(this.ownOnly)) {
      const session = sessionFromRow(row);
      this.sessions.set(row.benchId, session);
      if (isWeighing(session.rec.state)) {
        await this.interruptStored(session, 'The hub restarted during the pour');
        this.logger.warn(`Batch ${row.id} on ${row.benchId} interrupted by a hub restart`);
      }
    }
  }

  /** Writes a batch interrupted by its hub's going away; the balance's tare is lost with it. */
  private async interruptStored(session: BenchSession, why: string): Promise<void> {
    const rec = interrupt(session.rec, why, this.nowIso());
    session.row = await this.store.writeRecord(
      session.id,
      rec,
      { ...detailFor(rec, detailOf(session.row)), tareLost: true },
      session.trace,
    );
    session.rec = rec;
  }

  /**
   * Another hub sharing the server went silent with batches being weighed at its benches: the
   * one hub that noted it interrupts them (kept, not lost), and the benches' screens hear of it.
   * Its own hub resumes them after its restart as any interrupted batch. This hub found silent
   * itself reads its open batches back, as the others wrote them.
   */
  @OnHubEvent('hub.lost')
  async onHubLost(event: HubEventMap['hub.lost']): Promise<void> {
    try {
      if (event.self) {
        await this.reloadOwn();
        return;
      }
      if (!event.takenOver) return;
      for (const row of await this.store.findOpen(event.hubId)) {
        const session = sessionFromRow(row);
        if (!isWeighing(session.rec.state)) continue;
        await this.interruptStored(
          session,
          `The hub "${event.hubId}" that reads this scale stopped answering`,
        );
        this.logger.warn(
          `Batch ${row.id} on ${row.benchId} interrupted: hub ${event.hubId} silent`,
        );
        this.announce(session);
      }
    } catch (err) {
      this.logger.error(`Batches of hub ${event.hubId} not interrupted: ${(err as Error).message}`);
    }
  }

  private async reloadOwn(): Promise<void> {
    for (const session of [...this.sessions.values()]) {
      await this.enqueue(session, async () => {
        const row = await this.store.findById(session.id);
        if (!row || row.state === session.row.state) return;
        Object.assign(session, { ...sessionFromRow(row), queue: session.queue });
        this.announce(session);
      });
    }
  }

  of(benchId: string): BenchSession | undefined {
    return this.sessions.get(benchId);
  }

  byBatchId(id: number): BenchSession | undefined {
    return [...this.sessions.values()].find((s) => s.id === id);
  }

  all(): IterableIterator<BenchSession> {
    return this.sessions.values();
  }

  /** A batch just inserted becomes its bench's open batch, and the bench hears of it. */
  open(row: BatchRow): BenchSession {
    const session = sessionFromRow(row);
    this.sessions.set(row.benchId, session);
    this.announce(session);
    return session;
  }

  enqueue<T>(session: BenchSession, task: () => Promise<T>): Promise<T> {
    const run = session.queue.then(task, task);
    session.queue = run.catch(() => undefined);
    return run;
  }

  /** Runs one person's change on an open batch, in order, stored before it is announced. */
  change(
    session: BenchSession,
    user: AuthUser,
    change: (session: BenchSession) => Promise<BatchRecord>,
  ): Promise<Batch> {
    return this.enqueue(session, async () => {
      const before = session.rec;
      const next = await change(session);
      this.noteHandler(session, user);
      await this.commit(session, next, user);
      await this.tareIfNeeded(session, before);
      return toBatch(session.row, session.rec);
    });
  }

  /** Stores a new record, then (and only then) updates memory and tells the bench. */
  async commit(
    session: BenchSession,
    rec: BatchRecord,
    by?: Pick<AuthUser, 'id' | 'name'>,
  ): Promise<void> {
    const keep = detailOf(session.row);
    // A restart's lost tare matters until the batch is resumed.
    const detail = detailFor(rec, {
      ...keep,
      tareLost: rec.state === 'interrupted' && keep.tareLost,
    });
    try {
      session.row = await this.store.writeRecord(session.id, rec, detail, session.trace);
    } catch (err) {
      this.logger.error(
        `Batch ${session.id} not written: ${(err as Error).message.split('\n')[0]}`,
      );
      throw new StoreUnavailable(
        'The batch could not be written to the database: nothing changed, try again',
      );
    }
    session.traceDirty = false;
    session.rec = rec;
    session.goSince = null;
    session.saveProblem = undefined;
    if (!isWeighing(rec.state) && rec.state !== 'interrupted') {
      this.sessions.delete(session.benchId);
      this.logger.log(
        `Batch ${session.id} ${rec.state}${rec.verdict ? ` ${rec.verdict}` : ''} (deviation ${rec.ratioDeviationPct?.toFixed(2) ?? '–'} %)`,
      );
    }
    this.announce(session, by);
  }

  /** A new pour on a cup that holds earlier parts: tare it for the operator. */
  async tareIfNeeded(session: BenchSession, before: BatchRecord): Promise<void> {
    const active = session.rec.active;
    const movedOn =
      active && !active.tared && isWeighing(session.rec.state) && before.active !== active;
    if (!movedOn) return;
    // The empty cup of part A is the operator's to tare; a cup that holds something (later parts,
    // or part A credited after a restart) is tared by the hub so nothing in it is counted twice.
    if (active.part === 0 && active.kind === 'first' && !session.rec.parts[0]!.actualG) return;
    try {
      await this.tareFor(session);
      await this.commit(session, markTared(session.rec, this.nowIso()));
    } catch (err) {
      // The operator sees an untared pour and a Tare button; nothing is lost.
      this.logger.warn(`Automatic tare on ${session.benchId} failed: ${(err as Error).message}`);
    }
  }

  /**
   * Tares the balance for the session's active pour and keeps the gross it then showed (the cup
   * and the earlier parts), written with the next commit: after a restart it tells what the
   * active pour holds.
   */
  async tareFor(session: BenchSession): Promise<void> {
    await this.tareScale(session.benchId);
    const latest = this.scales.latest(session.benchId);
    if (latest && !latest.outOfRange) {
      session.row = {
        ...session.row,
        detail: { ...detailOf(session.row), tareGrossG: latest.grossG },
      };
    }
  }

  /** Asks the balance to tare; a balance that will not is the operator's to wait out. */
  private async tareScale(benchId: string): Promise<void> {
    const status = this.scales.status(benchId);
    if (status.state !== 'online') {
      throw new BatchRefusal(`The scale is ${status.state}: it cannot tare now`, 'WRONG_STATE');
    }
    try {
      await this.scales.tare(benchId);
    } catch (err) {
      if (!(err instanceof ScaleCommandError)) throw err;
      throw new ScaleCommandFailed(
        `The scale did not tare: ${err.message}. Keep the cup still and try again`,
        [{ path: 'SCALE_COMMAND', message: err.message }],
        this.scales.status(benchId).state === 'online' ? 'busy' : 'away',
      );
    }
  }

  /** The reading the rules judge now, or none while the scale is away or out of range. */
  netReading(benchId: string): NetReading | undefined {
    if (this.scales.status(benchId).state !== 'online') return undefined;
    const latest = this.scales.latest(benchId);
    if (!latest || latest.outOfRange) return undefined;
    return { netG: latest.netG, stable: latest.stable };
  }

  hasBench(benchId: string): boolean {
    return this.scales.has(benchId);
  }

  readabilityG(benchId: string): number {
    return this.scales.readabilityG(benchId);
  }

  latest(benchId: string): ReadingEvent | undefined {
    return this.scales.has(benchId) ? this.scales.latest(benchId) : undefined;
  }

  /**
   * What the active pour of a batch interrupted by a restart holds, read from the balance (see
   * `cup-contents.ts`).
   */
  contentsAfterRestart(session: BenchSession): CupContents {
    const latest = this.scales.latest(session.benchId);
    if (!latest || latest.outOfRange) return { known: false, why: 'the scale gives no reading' };
    const frame = this.scales.frame(session.benchId);
    return contentsAfterRestart({
      tareGrossG: detailOf(session.row).tareGrossG,
      // The hub holds no tare of its own since the restart: gross is what the balance shows.
      displayG: latest.grossG,
      stable: latest.stable,
      lineMode: frame.lineMode,
      softwareTare: frame.softwareTare,
      lastTraceNetG: session.trace.at(-1)?.[1],
      readabilityG: this.scales.readabilityG(session.benchId),
    });
  }

  scaleStatus(benchId: string): ScaleStatusEvent {
    return this.scales.status(benchId);
  }

  capacity(benchId: string): { capacityG: number; grossG: number } | undefined {
    const capacityG = this.scales.capacityG(benchId);
    const latest = this.scales.latest(benchId);
    return capacityG && latest ? { capacityG, grossG: latest.grossG } : undefined;
  }

  /** Writes the traces that grew since the last write; a refused write is tried next time. */
  async flushTraces(): Promise<void> {
    for (const session of this.sessions.values()) {
      if (!session.traceDirty) continue;
      session.traceDirty = false;
      try {
        await this.store.writeTrace(session.id, session.trace);
      } catch (err) {
        session.traceDirty = true;
        this.logger.warn(
          `Trace of batch ${session.id} not written yet: ${(err as Error).message.split('\n')[0]}`,
        );
      }
    }
  }

  /** Whoever drives a simulated scale under an open batch is named with it, at once. */
  @OnHubEvent('simulator.driven')
  onSimulatorDriven(event: HubEventMap['simulator.driven']): void {
    const session = this.sessions.get(event.benchId);
    if (!session) return;
    void this.enqueue(session, async () => {
      if (!this.noteHandler(session, event.by)) return;
      await this.commit(session, session.rec);
    }).catch((err: unknown) =>
      this.logger.warn(`Batch ${session.id}: handler not written yet: ${(err as Error).message}`),
    );
  }

  announce(session: BenchSession, by?: Pick<AuthUser, 'id' | 'name'>): void {
    this.events.emit('batch.changed', {
      benchId: session.benchId,
      batch: toBatch(session.row, session.rec),
      ...(by ? { by: { id: by.id, name: by.name } } : {}),
    });
  }

  /**
   * Someone other than the operator who started the batch acts on it: they are named with the
   * batch from then on, so a batch handed over at a shift change is not credited to one person.
   */
  private noteHandler(
    session: BenchSession,
    user: Pick<AuthUser, 'id' | 'name' | 'role'>,
  ): boolean {
    const detail = detailOf(session.row);
    const handledBy = detail.handledBy ?? [];
    if (user.id === session.row.operatorId || handledBy.some((h) => h.id === user.id)) {
      return false;
    }
    session.row = {
      ...session.row,
      detail: {
        ...detail,
        handledBy: [
          ...handledBy,
          { id: user.id, name: user.name, role: user.role, at: this.nowIso() },
        ],
      },
    };
    return true;
  }
}

function sessionFromRow(row: BatchRow): BenchSession {
  return {
    id: row.id,
    benchId: row.benchId,
    row,
    rec: recordOf(row),
    startedMs: row.createdAt.getTime(),
    trace: decodeTrace(row.trace),
    traceDirty: false,
    goSince: null,
    lastPourEmitMs: 0,
    lastVerdict: null,
    queue: Promise.resolve(),
  };
}
