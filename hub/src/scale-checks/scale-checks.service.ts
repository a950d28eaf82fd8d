import {
  Inject,
  Injectable,
  Logger,
  type BeforeApplicationShutdown,
  type OnApplicationBootstrap,
} from '@nestjs/common';
import { type ReadingEvent, type ScaleStatusEvent } from '@tareline/protocol';
import {
  checkToleranceG,
  judgeRoutineCheck,
  repeatabilityOf,
  REPEATABILITY_PLACEMENTS,
  type BenchCheckStatus,
  type BenchPolicyPatch,
  type ScaleCheck,
  type ScaleCheckStarted,
  type ScaleCheckStep,
  type StartScaleCheck,
} from '@tareline/protocol/scale-checks';
import { actorOf, AuditRepository } from '../audit/audit.repository.js';
import type { AuthUser } from '../auth/auth-user.js';
import { BatchesService } from '../batches/batches.service.js';
import { CLOCK, type Clock } from '../common/clock.js';
import {
  BenchBusy,
  Conflict,
  InvalidInput,
  NotAllowed,
  NotFound,
} from '../common/domain-errors.js';
import { ScalesService } from '../scales/scales.service.js';
import { formatGrams } from './check-words.js';
import { ScaleCheckGate } from './scale-check-gate.js';
import {
  ScaleChecksRepository,
  type NewScaleCheckRow,
  type ScaleCheckRow,
} from './scale-checks.repository.js';

/** Stable readings in a row, agreeing within one scale interval, before one is taken. */
const STABLE_RUN = 3;
/** A placement counts once the net reading is above this share of the reference. */
const PLACED_SHARE = 0.5;
/** A check nobody finishes is given up after this long. */
export const CHECK_TIMEOUT_MS = 20 * 60_000;
/** The band a minimum net mass is worked out for when no material is in use: about 1 %. */
const FALLBACK_BAND_PCT = 1;

interface RunningCheck {
  id: number;
  benchId: string;
  kind: ScaleCheckRow['kind'];
  referenceG: number;
  readabilityG: number;
  toleranceG: number | null;
  startedMs: number;
  step: ScaleCheckStep;
  readings: number[];
  /** The stable readings in a row so far at the current placement. */
  run: number[];
  finishing: boolean;
  unsubscribe: () => void;
  /** Writes of this check, one after the other. */
  writes: Promise<unknown>;
}

/**
 * Scale checks at a bench: the hub zeroes the empty pan, waits for the reference weight, and
 * takes the stable reading itself (never a typed value). A routine check passes or fails on the
 * bench's tolerance; a repeatability test takes ten placements and stores s on the bench.
 */
@Injectable()
export class ScaleChecksService implements OnApplicationBootstrap, BeforeApplicationShutdown {
  private readonly logger = new Logger('ScaleChecks');
  private readonly checks = new Map<number, RunningCheck>();

  constructor(
    @Inject(ScaleChecksRepository) private readonly repository: ScaleChecksRepository,
    @Inject(ScaleCheckGate) private readonly gate: ScaleCheckGate,
    @Inject(ScalesService) private readonly scales: ScalesService,
    @Inject(BatchesService) private readonly batches: BatchesService,
    @Inject(CLOCK) private readonly clock: Clock,
    @Inject(AuditRepository) private readonly audit: AuditRepository,
  ) {}

  async onApplicationBootstrap(): Promise<void> {
    const left = await this.repository.interruptWaiting(
      'The hub stopped during the check',
      new Date(this.clock.now()),
    );
    if (left > 0) this.logger.warn(`${left} scale check(s) left waiting were marked interrupted`);
  }

  beforeApplicationShutdown(): void {
    for (const check of this.checks.values()) check.unsubscribe();
    this.checks.clear();
  }

  // ---- people's requests -------------------------------------------------------------------

  async start(benchId: string, body: StartScaleCheck, user: AuthUser): Promise<ScaleCheckStarted> {
    // The bench first: a bench that does not exist is a 404 to everyone.
    if (!this.scales.has(benchId) || !(await this.repository.policy(benchId))) {
      throw new NotFound(`There is no bench "${benchId}"`);
    }
    requireChecker(user, benchId);
    if (this.gate.running.has(benchId)) {
      throw new BenchBusy('A scale check is already running at this bench: finish or cancel it');
    }
    this.refuseOpenBatch(benchId);
    const { state } = this.scales.status(benchId);
    if (state !== 'online') {
      throw new Conflict(`The scale is ${state}: a check needs a scale that is reading`);
    }
    const readabilityG = this.scales.readabilityG(benchId);
    const minimumG = 20 * readabilityG;
    if (body.referenceG < minimumG) {
      const message = `Use a reference weight of ${formatGrams(minimumG)} at least (20 scale intervals)`;
      throw new InvalidInput(message, [{ path: 'referenceG', message }]);
    }
    const capacityG = this.scales.capacityG(benchId);
    if (capacityG !== undefined && body.referenceG > capacityG) {
      const message = `This scale weighs up to ${formatGrams(capacityG)}`;
      throw new InvalidInput(message, [{ path: 'referenceG', message }]);
    }
    const policy = (await this.repository.policy(benchId))!;
    const toleranceG =
      body.kind === 'routine'
        ? checkToleranceG(body.referenceG, readabilityG, policy.checkToleranceG)
        : null;
    // Claimed before the first await that writes, so two starts cannot both pass.
    if (this.gate.running.has(benchId)) {
      throw new BenchBusy('A scale check is already running at this bench: finish or cancel it');
    }
    this.gate.running.set(benchId, 0);
    try {
      // A batch started while the bench's policy was read keeps the bench.
      this.refuseOpenBatch(benchId);
    } catch (err) {
      this.gate.running.delete(benchId);
      throw err;
    }
    let row: ScaleCheckRow;
    try {
      row = await this.repository.insert({
        benchId,
        kind: body.kind,
        state: 'waiting',
        referenceG: body.referenceG,
        readabilityG,
        toleranceG,
        byId: user.id,
        byName: user.name,
        startedAt: new Date(this.clock.now()),
      });
    } catch (err) {
      this.gate.running.delete(benchId);
      throw err;
    }
    const check: RunningCheck = {
      id: row.id,
      benchId,
      kind: body.kind,
      referenceG: body.referenceG,
      readabilityG,
      toleranceG,
      startedMs: this.clock.now(),
      step: 'zeroing',
      readings: [],
      run: [],
      finishing: false,
      unsubscribe: () => undefined,
      writes: Promise.resolve(),
    };
    this.gate.running.set(benchId, row.id);
    this.checks.set(row.id, check);
    const offReading = this.scales.onReading(benchId, (r) => this.onReading(check, r));
    const offStatus = this.scales.onStatus(benchId, (s) => this.onStatus(check, s));
    check.unsubscribe = () => {
      offReading();
      offStatus();
    };
    this.logger.log(
      `${benchId}: ${body.kind} check ${row.id} with ${formatGrams(body.referenceG)} started by ${user.name}`,
    );
    void this.zero(check);
    return { id: row.id, state: 'waiting' };
  }

  async get(benchId: string, id: number, user: AuthUser): Promise<ScaleCheck> {
    await this.requireBench(benchId);
    requireReader(user, benchId);
    const check = this.checks.get(id);
    // A running check is read after its pending writes, so what is shown is what is stored.
    if (check) await check.writes;
    const row = await this.repository.find(benchId, id);
    if (!row) throw new NotFound(`No scale check ${id} at this bench`);
    return this.toScaleCheck(row);
  }

  async list(benchId: string, user: AuthUser): Promise<ScaleCheck[]> {
    await this.requireBench(benchId);
    requireReader(user, benchId);
    const rows = await this.repository.list(benchId, 100);
    return rows.map((row) => this.toScaleCheck(row));
  }

  async cancel(benchId: string, id: number, user: AuthUser): Promise<ScaleCheck> {
    await this.requireBench(benchId);
    requireChecker(user, benchId);
    const check = this.checks.get(id);
    if (!check || check.benchId !== benchId || check.finishing) {
      const row = await this.repository.find(benchId, id);
      if (!row) throw new NotFound(`No scale check ${id} at this bench`);
      if (row.state !== 'waiting') throw new Conflict(`Scale check ${id} is ${row.state} already`);
    } else {
      await this.end(check, { state: 'cancelled', note: `Cancelled by ${user.name}` });
    }
    return this.get(benchId, id, user);
  }

  async status(benchId: string, user: AuthUser): Promise<BenchCheckStatus> {
    await this.requireBench(benchId);
    requireReader(user, benchId);
    return this.gate.status(benchId);
  }

  /** Changes a bench's check policy; the change and who made it join the audit trail. */
  async updatePolicy(
    benchId: string,
    patch: BenchPolicyPatch,
    user: AuthUser,
  ): Promise<BenchCheckStatus> {
    await this.requireBench(benchId);
    await this.audit.record(
      (tx) => this.repository.updatePolicy(benchId, patch, tx),
      () => ({
        at: new Date(this.clock.now()).toISOString(),
        actor: actorOf(user),
        entity: 'bench',
        entityId: benchId,
        action: 'bench.check-policy',
        data: patch,
      }),
    );
    this.logger.log(`${benchId}: check policy changed (${Object.keys(patch).join(', ')})`);
    return this.gate.status(benchId);
  }

  // ---- the scale's side --------------------------------------------------------------------

  private async zero(check: RunningCheck): Promise<void> {
    try {
      await this.scales.tare(check.benchId);
    } catch (err) {
      this.logger.warn(
        `${check.benchId}: check ${check.id} could not zero: ${err instanceof Error ? err.message : String(err)}`,
      );
      await this.end(check, {
        state: 'interrupted',
        note: 'The hub could not zero the empty pan (the scale was moving or busy): clear the pan, keep it still and start again',
      });
      return;
    }
    if (!check.finishing && check.step === 'zeroing') check.step = 'place';
  }

  private onReading(check: RunningCheck, r: ReadingEvent): void {
    if (check.finishing) return;
    if (this.clock.now() - check.startedMs > CHECK_TIMEOUT_MS) {
      void this.end(check, {
        state: 'interrupted',
        note: `Not finished within ${CHECK_TIMEOUT_MS / 60_000} minutes`,
      });
      return;
    }
    if (r.outOfRange || !r.stable) {
      check.run = [];
      return;
    }
    const d = check.readabilityG;
    if (check.step === 'lift') {
      // Back to near zero: the weight is off, the next placement may come.
      if (Math.abs(r.netG) <= Math.max(5 * d, 0.01 * check.referenceG)) {
        check.step = 'place';
        check.run = [];
      }
      return;
    }
    if (check.step !== 'place') return;
    if (r.netG < PLACED_SHARE * check.referenceG) {
      check.run = [];
      return;
    }
    if (check.run.length > 0 && Math.abs(r.netG - check.run[0]!) > d + 1e-9) {
      check.run = [r.netG];
      return;
    }
    check.run.push(r.netG);
    if (check.run.length < STABLE_RUN) return;
    const taken = [...check.run].sort((a, b) => a - b)[Math.floor(STABLE_RUN / 2)]!;
    check.run = [];
    this.take(check, taken);
  }

  private take(check: RunningCheck, readingG: number): void {
    if (check.kind === 'routine') {
      const { errorG, passed } = judgeRoutineCheck(readingG, check.referenceG, check.toleranceG!);
      void this.end(check, {
        state: passed ? 'passed' : 'failed',
        readingG,
        errorG,
        note: passed
          ? null
          : `Read ${formatGrams(readingG)} for the ${formatGrams(check.referenceG)} weight: ` +
            `${formatGrams(Math.abs(errorG))} ${errorG > 0 ? 'over' : 'under'}, more than the ` +
            `${formatGrams(check.toleranceG)} allowed`,
      });
      return;
    }
    check.readings.push(readingG);
    if (check.readings.length >= REPEATABILITY_PLACEMENTS) {
      void this.finishRepeatability(check);
      return;
    }
    check.step = 'lift';
    const readings = [...check.readings];
    this.write(check, () => this.repository.update(check.id, { readings }));
  }

  private async finishRepeatability(check: RunningCheck): Promise<void> {
    check.finishing = true;
    const bandPct = (await this.repository.tightestTolerancePct()) ?? FALLBACK_BAND_PCT;
    const r = repeatabilityOf(check.readings, check.readabilityG, bandPct / 100);
    const at = new Date(this.clock.now());
    await this.finishWith(check, () =>
      this.repository.finishRepeatability(
        check.id,
        {
          state: 'passed',
          readings: check.readings,
          sdG: r.sdG,
          sdUsedG: r.sdUsedG,
          bandPct,
          minNetG: r.minNetG,
          finishedAt: at,
        },
        { benchId: check.benchId, sdG: r.sdUsedG, at },
      ),
    );
    this.logger.log(
      `${check.benchId}: repeatability ${check.id}: s = ${formatGrams(r.sdG)}, minimum net ${formatGrams(r.minNetG)} at ±${bandPct} %`,
    );
  }

  private onStatus(check: RunningCheck, status: ScaleStatusEvent): void {
    if (check.finishing) return;
    if (status.state === 'offline' || status.state === 'error') {
      void this.end(check, {
        state: 'interrupted',
        note: `The scale went ${status.state} during the check`,
      });
    }
  }

  private async end(
    check: RunningCheck,
    changes: Omit<Partial<NewScaleCheckRow>, 'state'> & { state: ScaleCheckRow['state'] },
  ): Promise<void> {
    if (check.finishing) return;
    check.finishing = true;
    const at = new Date(this.clock.now());
    await this.finishWith(check, () =>
      this.repository.update(check.id, { ...changes, finishedAt: at }),
    );
    this.logger.log(`${check.benchId}: ${check.kind} check ${check.id} ${changes.state}`);
  }

  /** The last write of a check; the bench is free for batches once it is stored. */
  private async finishWith(check: RunningCheck, write: () => Promise<unknown>): Promise<void> {
    check.unsubscribe();
    this.write(check, write);
    try {
      await check.writes;
    } finally {
      this.checks.delete(check.id);
      if (this.gate.running.get(check.benchId) === check.id) {
        this.gate.running.delete(check.benchId);
      }
    }
  }

  private write(check: RunningCheck, write: () => Promise<unknown>): void {
    check.writes = check.writes.then(write).catch((err: unknown) => {
      this.logger.error(
        `${check.benchId}: check ${check.id} not stored: ${err instanceof Error ? err.message : String(err)}`,
      );
    });
  }

  /** A check tares the scale: never under an open batch's cup. */
  private refuseOpenBatch(benchId: string): void {
    const batch = this.batches.current(benchId);
    if (batch) {
      throw new BenchBusy(
        `Batch ${batch.id} is open at this bench: finish or abandon it before a scale check`,
      );
    }
  }

  private async requireBench(benchId: string): Promise<void> {
    if (!(await this.repository.policy(benchId))) {
      throw new NotFound(`There is no bench "${benchId}"`);
    }
  }

  private toScaleCheck(row: ScaleCheckRow): ScaleCheck {
    const running = this.checks.get(row.id);
    return {
      id: row.id,
      benchId: row.benchId,
      kind: row.kind,
      state: row.state,
      step: row.state === 'waiting' ? (running?.step ?? null) : null,
      referenceG: row.referenceG,
      readabilityG: row.readabilityG,
      toleranceG: row.toleranceG,
      readingG: row.readingG,
      errorG: row.errorG,
      readings: running && row.state === 'waiting' ? [...running.readings] : row.readings,
      placementsNeeded: row.kind === 'routine' ? 1 : REPEATABILITY_PLACEMENTS,
      sdG: row.sdG,
      sdUsedG: row.sdUsedG,
      bandPct: row.bandPct,
      minNetG: row.minNetG,
      note: row.note,
      by: { id: row.byId, name: row.byName },
      startedAt: row.startedAt.toISOString(),
      finishedAt: row.finishedAt?.toISOString() ?? null,
    };
  }
}

/** A check is run by a lead, or by an operator signed in at that bench with their own badge. */
function requireChecker(user: AuthUser, benchId: string): void {
  if (user.role === 'lead') return;
  if (user.role === 'operator' && user.benchId === benchId) return;
  throw new NotAllowed(
    user.role === 'operator'
      ? 'Operators check only the scale of the bench they signed in at'
      : 'A scale check is run by a lead or by the operator signed in at the bench',
  );
}

/** Anyone but an operator of another bench may read a bench's checks. */
function requireReader(user: AuthUser, benchId: string): void {
  if (user.role === 'operator' && user.benchId !== benchId) {
    throw new NotAllowed('Operators see only the checks of the bench they signed in at');
  }
}
