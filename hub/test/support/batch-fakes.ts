import type { ReadingEvent, ScaleStatusEvent } from '@tareline/protocol';
import type { HubEventMap, HubEventName } from '../../src/events/hub-events.js';
import type { BatchRecord } from '../../src/batches/batch-machine.js';
import type {
  BatchDetail,
  BatchListFilter,
  BatchRow,
  BatchStore,
  NewBatchRow,
} from '../../src/batches/batches.repository.js';
import type { BenchScales } from '../../src/batches/bench-sessions.js';
import type { TracePoint } from '../../src/batches/pour-trace.js';
import { encodeTrace } from '../../src/batches/pour-trace.js';

/** Batch rows in memory; `refuseWrites` makes the next record writes fail as a full disk would. */
export class FakeBatchStore implements BatchStore {
  readonly rows = new Map<number, BatchRow>();
  readonly traceWrites: Array<{ id: number; points: number }> = [];
  refuseWrites = 0;
  private nextId = 1;

  async insert(values: NewBatchRow): Promise<BatchRow> {
    const now = new Date();
    const row = {
      id: this.nextId++,
      resumeState: null,
      verdict: null,
      ratioDeviationPct: null,
      abandonReason: null,
      interruptedReason: null,
      trace: null,
      createdAt: now,
      updatedAt: now,
      savedAt: null,
      ...values,
    } as BatchRow;
    this.rows.set(row.id, row);
    return row;
  }

  async writeRecord(
    id: number,
    rec: BatchRecord,
    detail: BatchDetail,
    trace: readonly TracePoint[],
  ): Promise<BatchRow> {
    this.refuse();
    const row: BatchRow = {
      ...this.rows.get(id)!,
      state: rec.state,
      resumeState: rec.resumeState,
      verdict: rec.verdict,
      ratioDeviationPct: rec.ratioDeviationPct,
      abandonReason: rec.abandonReason,
      interruptedReason: rec.interruptedReason,
      detail,
      trace: encodeTrace(trace),
    };
    this.rows.set(id, row);
    return row;
  }

  async writeTrace(id: number, trace: readonly TracePoint[]): Promise<void> {
    this.rows.set(id, { ...this.rows.get(id)!, trace: encodeTrace(trace) });
    this.traceWrites.push({ id, points: trace.length });
  }

  async findById(id: number): Promise<BatchRow | undefined> {
    return this.rows.get(id);
  }

  async findOpen(): Promise<BatchRow[]> {
    return [...this.rows.values()].filter(
      (r) => r.state.startsWith('weighing-') || r.state === 'interrupted',
    );
  }

  async list(filter: BatchListFilter): Promise<BatchRow[]> {
    return [...this.rows.values()]
      .filter((r) => filter.benchId === undefined || r.benchId === filter.benchId)
      .reverse()
      .slice(0, filter.limit);
  }

  private refuse(): void {
    if (this.refuseWrites > 0) {
      this.refuseWrites -= 1;
      throw new Error('could not extend file: No space left on device');
    }
  }
}

/**
 * One bench's balance as the batch rooms see it, driven by the test: a 40 g cup on the pan, a
 * tare the balance holds, and lines that say net or gross (or not). It outlives a hub restart,
 * as a real balance does: `hubRestarted()` forgets what the hub knew of its tare.
 */
export class FakeScales implements BenchScales {
  state: ScaleStatusEvent['state'] = 'online';
  reading: ReadingEvent | undefined;
  tares = 0;
  /** What is physically on the pan. */
  panG = 40;
  /** The balance's own tare. */
  tareG = 0;
  lineMode: 'gross' | 'net' | 'unknown' = 'net';
  softwareTare = false;
  /** The hub that reads it knows the tare it gave (false after a restart, until it tares). */
  private hubKnowsTare = true;
  private readonly readingListeners = new Set<(r: ReadingEvent) => void>();
  private seq = 0;

  constructor(
    readonly benchId = 'bench-1',
    private readonly now: () => number = () => Date.now(),
  ) {}

  has = (benchId: string) => benchId === this.benchId;
  benchIds = () => [this.benchId];
  status = (benchId: string): ScaleStatusEvent => ({ benchId, state: this.state, detail: '' });
  latest = () => this.reading;
  capacityG = () => undefined;
  readabilityG = () => 0.01;
  frame = () => ({ lineMode: this.lineMode, softwareTare: this.softwareTare });
  onAttach = () => () => undefined;

  tare = async (): Promise<void> => {
    this.tares += 1;
    this.tareG = this.panG;
    this.hubKnowsTare = true;
    this.publish(true);
  };

  onReading = (_benchId: string, listener: (r: ReadingEvent) => void) => {
    this.readingListeners.add(listener);
    return () => this.readingListeners.delete(listener);
  };

  /** The pour since the last tare reaches `netG` and the balance prints it. */
  print(netG: number, stable = true): ReadingEvent {
    this.panG = this.tareG + netG;
    return this.publish(stable);
  }

  /** The new hub knows nothing of the old one's tare; `balanceKeepsTare: false` is a power cycle. */
  hubRestarted(balanceKeepsTare: boolean): void {
    this.hubKnowsTare = false;
    if (!balanceKeepsTare) this.tareG = 0;
  }

  private publish(stable: boolean): ReadingEvent {
    const displayG = this.panG - this.tareG;
    this.reading = {
      benchId: this.benchId,
      seq: this.seq++,
      t: this.now(),
      // In the hub's frame: gross as it knows it, net of the tare it gave.
      grossG: this.hubKnowsTare ? this.panG : displayG,
      netG: displayG,
      stable,
    };
    for (const listener of this.readingListeners) listener(this.reading);
    return this.reading;
  }
}

/** Everything the hub's event bus carried, by name. */
export class RecordingEvents {
  readonly seen: Array<
    { [E in HubEventName]: { event: E; payload: HubEventMap[E] } }[HubEventName]
  > = [];

  emit<E extends HubEventName>(event: E, payload: HubEventMap[E]): void {
    this.seen.push({ event, payload } as (typeof this.seen)[number]);
  }

  of<E extends HubEventName>(event: E): HubEventMap[E][] {
    return this.seen.filter((s) => s.event === event).map((s) => s.payload as HubEventMap[E]);
  }
}
