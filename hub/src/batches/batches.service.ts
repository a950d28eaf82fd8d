import {
  ConflictException,
  ForbiddenException,
  Inject,
  Injectable,
  Logger,
  NotFoundException,
  ServiceUnavailableException,
  type OnApplicationBootstrap,
  type OnApplicationShutdown,
} from '@nestjs/common';
import {
  WEIGHING_STATES,
  type Batch,
  type BatchState,
  type CreateBatch,
  type PourVerdict,
  type ReadingEvent,
  type ScaleStatusEvent,
} from '@tareline/protocol';
import { and, desc, eq, inArray, type SQL } from 'drizzle-orm';
import type { AuthUser } from '../auth/auth-user.js';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { Database } from '../database/database.js';
import { batches } from '../database/schema/index.js';
import { LiveGateway } from '../live/live.gateway.js';
import { MaterialsService } from '../materials/materials.service.js';
import { ScalesService } from '../scales/scales.service.js';
import {
  abandon,
  BatchRefusal,
  confirmPour,
  interrupt,
  isWeighing,
  judge,
  markTared,
  proposeRescue,
  resume,
  saveNoGo,
  startBatch,
  takeRescue,
  type BatchRecord,
  type NetReading,
} from './batch-machine.js';
import { decodeTrace, encodeTrace, type TracePoint } from './pour-trace.js';

type BatchRow = typeof batches.$inferSelect;

/** What a batch row keeps in its `detail` column. */
type BatchDetail = Pick<
  BatchRecord,
  'parts' | 'active' | 'topUpQueue' | 'rescue' | 'steps' | 'lots'
> & {
  potLifeMin: number | null;
  potLifeMassG: number | null;
  handledBy?: NonNullable<Batch['handledBy']>;
};

/** A bench's batch in progress (weighing or interrupted), held in memory beside its row. */
interface BenchSession {
  id: number;
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
  lastVerdict: PourVerdict | null;
  /** Serialises every change to this batch: auto-save and operator intents never race. */
  queue: Promise<unknown>;
}

/** Pour events to the station at most this often (readings between are judged, not all sent). */
const POUR_EMIT_MS = 40;

const nowIso = () => new Date().toISOString();

/**
 * Runs every bench's batch: holds it in memory while it is weighed, judges each reading, saves
 * itself after the dwell inside the band, and writes the row at every change before telling the
 * station. A hub restart turns a batch being weighed into `interrupted`; nothing is dropped.
 */
@Injectable()
export class BatchesService implements OnApplicationBootstrap, OnApplicationShutdown {
  private readonly logger = new Logger('Batches');
  private readonly sessions = new Map<string, BenchSession>();
  private readonly unsubscribes = new Map<string, Array<() => void>>();
  private flushTimer: NodeJS.Timeout | undefined;
  private readonly dwellMs: number;

  constructor(
    @Inject(Database) private readonly database: Database,
    @Inject(ScalesService) private readonly scales: ScalesService,
    @Inject(LiveGateway) private readonly live: LiveGateway,
    @Inject(MaterialsService) private readonly materials: MaterialsService,
    @Inject(APP_CONFIG) config: AppConfig,
  ) {
    this.dwellMs = config.batches.saveDwellMs;
  }

  async onApplicationBootstrap(): Promise<void> {
    const open = await this.database.db
      .select()
      .from(batches)
      .where(inArray(batches.state, [...WEIGHING_STATES, 'interrupted']));
    for (const row of open) {
      const session = this.sessionFromRow(row);
      this.sessions.set(row.benchId, session);
      if (isWeighing(session.rec.state)) {
        const rec = interrupt(session.rec, 'The hub restarted during the pour', nowIso());
        await this.persist(session, rec, { tareLost: true });
        session.rec = rec;
        this.logger.warn(`Batch ${row.id} on ${row.benchId} interrupted by a hub restart`);
      }
    }
    for (const benchId of this.scales.benchIds()) this.watchBench(benchId);
    this.scales.onAttach((benchId) => this.watchBench(benchId));
    this.flushTimer = setInterval(() => void this.flushTraces(), 2000);
  }

  async onApplicationShutdown(): Promise<void> {
    clearInterval(this.flushTimer);
    for (const unsubs of this.unsubscribes.values()) unsubs.forEach((u) => u());
    this.unsubscribes.clear();
    await this.flushTraces();
  }

  // ---- queries ---------------------------------------------------------------------------

  async get(id: number, withTrace = true): Promise<Batch> {
    const [row] = await this.database.db.select().from(batches).where(eq(batches.id, id));
    if (!row) throw new NotFoundException({ message: `No batch ${id}`, errors: [] });
    const session = this.sessions.get(row.benchId);
    if (session?.id === id) {
      return this.toBatch(session.row, session.rec, withTrace ? session.trace : undefined);
    }
    return this.toBatch(row, this.recFromRow(row), withTrace ? decodeTrace(row.trace) : undefined);
  }

  /** The bench's batch in progress (being weighed or interrupted), if any. */
  current(benchId: string): Batch | null {
    const session = this.sessions.get(benchId);
    return session ? this.toBatch(session.row, session.rec) : null;
  }

  async list(filter: { benchId?: string; state?: BatchState; limit: number }): Promise<Batch[]> {
    const where: SQL[] = [];
    if (filter.benchId) where.push(eq(batches.benchId, filter.benchId));
    if (filter.state) where.push(eq(batches.state, filter.state));
    const rows = await this.database.db
      .select()
      .from(batches)
      .where(where.length ? and(...where) : undefined)
      .orderBy(desc(batches.id))
      .limit(filter.limit);
    return rows.map((row) => this.toBatch(row, this.recFromRow(row)));
  }

  // ---- operator intents --------------------------------------------------------------------

  async create(input: Required<CreateBatch>, user: AuthUser): Promise<Batch> {
    this.requireBenchAccess(user, input.benchId);
    if (!this.scales.has(input.benchId)) {
      throw new NotFoundException({
        message: `No bench ${input.benchId}`,
        errors: [{ path: 'benchId', message: 'Choose a bench that exists' }],
      });
    }
    const busy = this.sessions.get(input.benchId);
    if (busy) {
      throw new ConflictException({
        message: `Batch ${busy.id} is still open on this bench: finish or abandon it first`,
        errors: [],
      });
    }
    const material = await this.materials.get(input.materialId).catch(() => {
      throw new NotFoundException({
        message: `No material ${input.materialId}`,
        errors: [{ path: 'materialId', message: 'Choose a material from the list' }],
      });
    });
    if (!material.active) {
      throw new ConflictException({
        message: `${material.name} is retired`,
        errors: [{ path: 'materialId', message: 'Choose a material in use' }],
      });
    }
    const lots = [];
    for (const scanned of input.lots) {
      if (scanned.part >= material.weightRatio.length) {
        throw new ConflictException({
          message: `${material.name} has no part ${'ABC'[scanned.part]}`,
          errors: [{ path: 'lots', message: 'A lot was given for a part this material lacks' }],
        });
      }
      const lot = await this.materials.findLot(material.id, scanned.part, scanned.code);
      lots.push({
        part: scanned.part,
        code: scanned.code,
        lotId: lot?.id ?? null,
        warnings: lot
          ? lot.warnings
          : [
              {
                code: 'LOT_UNKNOWN' as const,
                message: `Lot ${scanned.code} is not registered: it is recorded as scanned`,
              },
            ],
      });
    }
    const now = nowIso();
    const rec = startBatch({
      weightRatio: material.weightRatio,
      partLabels: material.partLabels,
      tolerancePct: material.tolerancePct,
      readabilityG: this.scales.readabilityG(input.benchId),
      totalMassG: input.totalMassG,
      lots,
      now,
    });
    const detail: BatchDetail = {
      parts: rec.parts,
      active: rec.active,
      topUpQueue: rec.topUpQueue,
      rescue: rec.rescue,
      steps: rec.steps,
      lots: rec.lots,
      potLifeMin: material.potLifeMin ?? null,
      potLifeMassG: material.potLifeMassG ?? null,
    };
    const [row] = await this.database.db
      .insert(batches)
      .values({
        benchId: input.benchId,
        operatorId: user.id,
        operatorName: user.name,
        materialId: material.id,
        materialName: material.name,
        state: rec.state,
        totalMassG: rec.totalMassG,
        weightRatio: rec.weightRatio,
        tolerancePct: rec.tolerancePct,
        readabilityG: rec.readabilityG,
        detail,
      })
      .returning();
    const session = this.sessionFromRow(row!);
    this.sessions.set(input.benchId, session);
    this.logger.log(`Batch ${row!.id} started on ${input.benchId} by ${user.name}`);
    this.emitBatch(session);
    return this.toBatch(session.row, session.rec);
  }

  /** Tares the scale for the active pour (the empty lined cup, or the cup with earlier parts). */
  tare(id: number, user: AuthUser): Promise<Batch> {
    return this.act(id, user, async (session) => {
      const rec = session.rec;
      if (!isWeighing(rec.state) || !rec.active) return markTared(rec, nowIso());
      const latest = this.scales.latest(session.row.benchId);
      const poured = rec.active.tared && latest ? latest.netG : 0;
      // A re-tare mid-pour would silently drop what is in this pour already, part A included:
      // the record would then hold only what is poured after it. An empty cup swapped for
      // another reads at or below zero and may be tared again.
      if (poured > Math.max(0.5, 10 * rec.readabilityG)) {
        throw new BatchRefusal(
          `${poured.toFixed(2)} g are in this pour already: taring now would lose them`,
          'WRONG_STATE',
        );
      }
      await this.tareScale(session.row.benchId);
      return markTared(rec, nowIso());
    });
  }

  next(id: number, user: AuthUser): Promise<Batch> {
    return this.act(id, user, async (session) =>
      confirmPour(session.rec, this.reading(session), nowIso()),
    );
  }

  rescue(id: number, user: AuthUser): Promise<Batch> {
    return this.act(id, user, async (session) =>
      takeRescue(session.rec, this.reading(session), nowIso(), this.capacity(session)),
    );
  }

  saveNoGo(id: number, user: AuthUser): Promise<Batch> {
    return this.act(id, user, async (session) =>
      saveNoGo(session.rec, this.reading(session), nowIso()),
    );
  }

  abandon(id: number, reason: string, user: AuthUser): Promise<Batch> {
    return this.act(id, user, async (session) => {
      const latest = this.scales.has(session.row.benchId)
        ? this.scales.latest(session.row.benchId)
        : undefined;
      return abandon(session.rec, reason, latest, nowIso());
    });
  }

  resume(id: number, user: AuthUser): Promise<Batch> {
    return this.act(id, user, async (session) => {
      const status = this.scales.status(session.row.benchId);
      if (status.state !== 'online') {
        throw new BatchRefusal(
          `The scale is ${status.state}: wait until it is back`,
          'WRONG_STATE',
        );
      }
      const tareLost = (session.row.detail as { tareLost?: boolean }).tareLost === true;
      const lastNetG = session.trace.at(-1)?.[1];
      return resume(session.rec, tareLost ? { lost: true, lastNetG } : { lost: false }, nowIso());
    });
  }

  // ---- internals -----------------------------------------------------------------------------

  private requireBenchAccess(user: AuthUser, benchId: string): void {
    if (user.role === 'operator' && user.benchId !== benchId) {
      throw new ForbiddenException({
        message: 'Operators pour only at the bench they signed in at',
        errors: [],
      });
    }
  }

  /** Runs one change on a bench's open batch, in order, persisted before it is announced. */
  private async act(
    id: number,
    user: AuthUser,
    change: (session: BenchSession) => Promise<BatchRecord>,
  ): Promise<Batch> {
    const session = [...this.sessions.values()].find((s) => s.id === id);
    if (!session) {
      const batch = await this.get(id, false);
      throw new ConflictException({
        message: `Batch ${id} is ${batch.state}: it takes no more changes`,
        errors: [],
      });
    }
    this.requireBenchAccess(user, session.row.benchId);
    return this.enqueue(session, async () => {
      const before = session.rec;
      const next = await change(session);
      this.noteHandler(session, user);
      await this.commit(session, next);
      await this.tareIfNeeded(session, before);
      return this.toBatch(session.row, session.rec);
    });
  }

  /**
   * Someone other than the operator who started the batch acts on it: they are named with the
   * batch from then on, so a batch handed over at a shift change is not credited to one person.
   */
  private noteHandler(session: BenchSession, user: AuthUser): void {
    const detail = session.row.detail as BatchDetail;
    const handledBy = detail.handledBy ?? [];
    if (user.id === session.row.operatorId || handledBy.some((h) => h.id === user.id)) return;
    session.row = {
      ...session.row,
      detail: {
        ...detail,
        handledBy: [...handledBy, { id: user.id, name: user.name, role: user.role, at: nowIso() }],
      },
    };
  }

  private enqueue<T>(session: BenchSession, task: () => Promise<T>): Promise<T> {
    const run = session.queue.then(task, task);
    session.queue = run.catch(() => undefined);
    return run;
  }

  /** Persists a new record, then (and only then) updates memory and tells the bench. */
  private async commit(session: BenchSession, rec: BatchRecord): Promise<void> {
    try {
      await this.persist(session, rec);
    } catch (err) {
      this.logger.error(err instanceof Error ? err : String(err));
      throw new ServiceUnavailableException({
        message: 'The batch could not be written to the database: nothing changed, try again',
        errors: [],
      });
    }
    session.rec = rec;
    session.goSince = null;
    session.saveProblem = undefined;
    if (!isWeighing(rec.state) && rec.state !== 'interrupted') {
      this.sessions.delete(session.row.benchId);
      this.logger.log(
        `Batch ${session.id} ${rec.state}${rec.verdict ? ` ${rec.verdict}` : ''} (deviation ${rec.ratioDeviationPct?.toFixed(2) ?? '–'} %)`,
      );
    }
    this.emitBatch(session);
  }

  /** A new pour on a cup that holds earlier parts: tare it for the operator. */
  private async tareIfNeeded(session: BenchSession, before: BatchRecord): Promise<void> {
    const active = session.rec.active;
    const movedOn =
      active && !active.tared && isWeighing(session.rec.state) && before.active !== active;
    if (!movedOn || (active.part === 0 && active.kind === 'first')) return;
    try {
      await this.tareScale(session.row.benchId);
      await this.commit(session, markTared(session.rec, nowIso()));
    } catch (err) {
      // The operator sees an untared pour and a Tare button; nothing is lost.
      this.logger.warn(
        `Automatic tare on ${session.row.benchId} failed: ${(err as Error).message}`,
      );
    }
  }

  private async tareScale(benchId: string): Promise<void> {
    const status = this.scales.status(benchId);
    if (status.state !== 'online') {
      throw new BatchRefusal(`The scale is ${status.state}: it cannot tare now`, 'WRONG_STATE');
    }
    await this.scales.tare(benchId);
  }

  private reading(session: BenchSession): NetReading | undefined {
    const benchId = session.row.benchId;
    if (this.scales.status(benchId).state !== 'online') return undefined;
    const latest = this.scales.latest(benchId);
    if (!latest || latest.outOfRange) return undefined;
    return { netG: latest.netG, stable: latest.stable };
  }

  private capacity(session: BenchSession): { capacityG: number; grossG: number } | undefined {
    const capacityG = this.scales.capacityG(session.row.benchId);
    const latest = this.scales.latest(session.row.benchId);
    return capacityG && latest ? { capacityG, grossG: latest.grossG } : undefined;
  }

  private proposal(session: BenchSession, reading: ReadingEvent) {
    try {
      return proposeRescue(session.rec, reading, this.capacity(session));
    } catch {
      return null;
    }
  }

  private watchBench(benchId: string): void {
    this.unsubscribes.get(benchId)?.forEach((u) => u());
    this.unsubscribes.set(benchId, [
      this.scales.onReading(benchId, (r) => this.onReading(benchId, r)),
      this.scales.onStatus(benchId, (s) => this.onStatus(benchId, s)),
    ]);
  }

  private onReading(benchId: string, reading: ReadingEvent): void {
    const session = this.sessions.get(benchId);
    if (!session || !isWeighing(session.rec.state) || !session.rec.active) return;
    const active = session.rec.active;
    if (active.tared && !reading.outOfRange) {
      session.trace.push([reading.t - session.startedMs, reading.netG]);
      session.traceDirty = true;
    }
    const online = this.scales.status(benchId).state === 'online';
    const verdict = online && !reading.outOfRange ? judge(session.rec, reading) : null;
    let saveInMs: number | null = null;
    if (verdict === 'GO') {
      session.goSince ??= reading.t;
      saveInMs = Math.max(0, this.dwellMs - (reading.t - session.goSince));
      if (saveInMs === 0) this.autoConfirm(session);
    } else {
      session.goSince = null;
    }
    if (verdict !== session.lastVerdict || reading.t - session.lastPourEmitMs >= POUR_EMIT_MS) {
      session.lastVerdict = verdict;
      session.lastPourEmitMs = reading.t;
      this.live.emitToBench(benchId, 'pour', {
        benchId,
        batchId: session.id,
        part: active.part,
        netG: reading.netG,
        stable: reading.stable,
        verdict,
        saveInMs,
        rescue: verdict === 'OVER' ? this.proposal(session, reading) : null,
        ...(session.saveProblem ? { saveProblem: session.saveProblem } : {}),
      });
    }
  }

  /** Steady inside the band for the dwell: confirm the pour (and save, after the last part). */
  private autoConfirm(session: BenchSession): void {
    const expected = session.rec;
    void this.enqueue(session, async () => {
      if (session.rec !== expected) return; // something else changed the batch meanwhile
      const next = confirmPour(session.rec, this.reading(session), nowIso());
      await this.commit(session, next);
      await this.tareIfNeeded(session, expected);
    }).catch((err: unknown) => {
      // Not saved: the reading moved, or the database refused. The next steady reading retries;
      // a database failure is also told to the bench, which keeps waiting for "saved".
      session.goSince = null;
      if (err instanceof ServiceUnavailableException) {
        session.saveProblem = 'The hub could not write the batch to its database; it keeps trying';
        session.lastPourEmitMs = 0;
      }
      this.logger.warn(`Batch ${session.id} not saved yet: ${(err as Error).message}`);
    });
  }

  private onStatus(benchId: string, status: ScaleStatusEvent): void {
    const session = this.sessions.get(benchId);
    if (!session || !isWeighing(session.rec.state)) return;
    session.goSince = null;
    if (status.state !== 'offline' && status.state !== 'error') return;
    void this.enqueue(session, async () => {
      if (!isWeighing(session.rec.state)) return;
      await this.commit(
        session,
        interrupt(session.rec, `The scale went ${status.state}: ${status.detail}`, nowIso()),
      );
    }).catch((err: unknown) =>
      this.logger.error(`Batch ${session.id}: could not record the interruption: ${String(err)}`),
    );
  }

  private async flushTraces(): Promise<void> {
    for (const session of this.sessions.values()) {
      if (!session.traceDirty) continue;
      session.traceDirty = false;
      try {
        await this.database.db
          .update(batches)
          .set({ trace: encodeTrace(session.trace), updatedAt: new Date() })
          .where(eq(batches.id, session.id));
      } catch (err) {
        // Kept in memory and written with the next flush or state change.
        session.traceDirty = true;
        this.logger.warn(`Trace of batch ${session.id} not written yet: ${String(err)}`);
      }
    }
  }

  private async persist(
    session: BenchSession,
    rec: BatchRecord,
    flags: { tareLost?: boolean } = {},
  ): Promise<void> {
    const tareLost =
      flags.tareLost ??
      (rec.state === 'interrupted'
        ? (session.row.detail as { tareLost?: boolean }).tareLost
        : false);
    const detail: BatchDetail & { tareLost?: boolean } = {
      parts: rec.parts,
      active: rec.active,
      topUpQueue: rec.topUpQueue,
      rescue: rec.rescue,
      steps: rec.steps,
      lots: rec.lots,
      potLifeMin: (session.row.detail as BatchDetail).potLifeMin,
      potLifeMassG: (session.row.detail as BatchDetail).potLifeMassG,
      ...((session.row.detail as BatchDetail).handledBy
        ? { handledBy: (session.row.detail as BatchDetail).handledBy }
        : {}),
      ...(tareLost ? { tareLost: true } : {}),
    };
    const [row] = await this.database.db
      .update(batches)
      .set({
        state: rec.state,
        resumeState: rec.resumeState,
        verdict: rec.verdict,
        ratioDeviationPct: rec.ratioDeviationPct,
        abandonReason: rec.abandonReason,
        interruptedReason: rec.interruptedReason,
        detail,
        trace: encodeTrace(session.trace),
        updatedAt: new Date(),
        savedAt: rec.state === 'saved' ? new Date(rec.steps.saved ?? Date.now()) : null,
      })
      .where(eq(batches.id, session.id))
      .returning();
    session.row = row!;
    session.traceDirty = false;
  }

  private sessionFromRow(row: BatchRow): BenchSession {
    return {
      id: row.id,
      row,
      rec: this.recFromRow(row),
      startedMs: row.createdAt.getTime(),
      trace: decodeTrace(row.trace),
      traceDirty: false,
      goSince: null,
      lastPourEmitMs: 0,
      lastVerdict: null,
      queue: Promise.resolve(),
    };
  }

  private recFromRow(row: BatchRow): BatchRecord {
    const d = row.detail as BatchDetail;
    return {
      state: row.state,
      resumeState: (row.resumeState as BatchState | null) ?? null,
      verdict: row.verdict ?? null,
      weightRatio: row.weightRatio,
      tolerancePct: row.tolerancePct,
      readabilityG: row.readabilityG,
      totalMassG: row.totalMassG,
      parts: d.parts,
      active: d.active,
      topUpQueue: d.topUpQueue,
      rescue: d.rescue,
      ratioDeviationPct: row.ratioDeviationPct ?? null,
      abandonReason: row.abandonReason ?? null,
      interruptedReason: row.interruptedReason ?? null,
      steps: d.steps,
      lots: d.lots,
    };
  }

  private toBatch(row: BatchRow, rec: BatchRecord, trace?: TracePoint[]): Batch {
    const d = row.detail as BatchDetail;
    return {
      id: row.id,
      state: rec.state,
      verdict: rec.verdict,
      benchId: row.benchId,
      materialId: row.materialId,
      materialName: row.materialName,
      operator: { id: row.operatorId, name: row.operatorName },
      ...(d.handledBy?.length ? { handledBy: d.handledBy } : {}),
      totalMassG: rec.totalMassG,
      weightRatio: rec.weightRatio,
      parts: rec.parts,
      active: rec.active,
      rescue: rec.rescue,
      ratioDeviationPct: rec.ratioDeviationPct,
      tolerancePct: rec.tolerancePct,
      readabilityG: rec.readabilityG,
      lots: rec.lots,
      potLifeMin: d.potLifeMin,
      potLifeMassG: d.potLifeMassG,
      abandonReason: rec.abandonReason,
      interruptedReason: rec.interruptedReason,
      steps: rec.steps,
      createdAt: row.createdAt.toISOString(),
      savedAt: rec.state === 'saved' ? (rec.steps.saved ?? null) : null,
      ...(trace ? { trace } : {}),
    };
  }

  private emitBatch(session: BenchSession): void {
    this.live.emitToBench(session.row.benchId, 'batch', {
      benchId: session.row.benchId,
      batch: this.toBatch(session.row, session.rec),
    });
  }
}
