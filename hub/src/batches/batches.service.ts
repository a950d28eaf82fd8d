import { Inject, Injectable, Logger, Optional } from '@nestjs/common';
import {
  batchFitness,
  costPerKgOf,
  overdrawWarning,
  PART_NAMES,
  SCALE_TOO_COARSE_PATH,
  splitTotalG,
  type Batch,
  type CreateBatchBody,
} from '@tareline/protocol';
import { AuditRepository } from '../audit/audit.repository.js';
import type { AuthUser } from '../auth/auth-user.js';
import { SignInService } from '../auth/sign-in.service.js';
import { Conflict, BenchBusy, NotAllowed, NotFound } from '../common/domain-errors.js';
import { MaterialsService } from '../materials/materials.service.js';
import { PourPlansService } from '../pour-plans/pour-plans.service.js';
import { ScaleCheckGate } from '../scale-checks/scale-check-gate.js';
import {
  abandon,
  BatchRefusal,
  confirmPour,
  isWeighing,
  markTared,
  resume,
  saveNoGo,
  startBatch,
  takeRescue,
  type BatchRecord,
} from './batch-machine.js';
import {
  BatchesRepository,
  detailFor,
  detailOf,
  recordOf,
  toBatch,
  type BatchListFilter,
  type BatchStore,
} from './batches.repository.js';
import { BenchSessions, type BenchSession } from './bench-sessions.js';
import { UNCERTAIN_AFTER_RESTART } from './cup-contents.js';
import { decodeTrace } from './pour-trace.js';

/**
 * What people ask of batches: start one (after checking the bench, material and lots), act on
 * the open one (tare, next, rescue, NO-GO, abandon, resume), and read them back. The open batch
 * of each bench lives in {@link BenchSessions}; readings are judged by the batch runner.
 */
@Injectable()
export class BatchesService {
  private readonly logger = new Logger('Batches');

  constructor(
    @Inject(BatchesRepository) private readonly store: BatchStore,
    @Inject(BenchSessions) private readonly sessions: BenchSessions,
    @Inject(MaterialsService) private readonly materials: MaterialsService,
    @Inject(PourPlansService) private readonly plans: PourPlansService,
    @Inject(SignInService) private readonly signIn: Pick<SignInService, 'confirmLead'>,
    @Inject(AuditRepository) private readonly audit: Pick<AuditRepository, 'record'>,
    /** Refuses a batch while a scale check runs or (by the bench's policy) is due. */
    @Optional()
    @Inject(ScaleCheckGate)
    private readonly scaleChecks?: Pick<ScaleCheckGate, 'assertMayStartBatch' | 'repeatabilitySdG'>,
  ) {}

  // ---- queries ---------------------------------------------------------------------------

  /**
   * A batch by number, with its trace. An operator reads only the batches of the bench they
   * signed in at (as on the live socket); to them another bench's batch does not exist.
   */
  async get(id: number, user?: AuthUser, withTrace = true): Promise<Batch> {
    const session = this.sessions.byBatchId(id);
    const batch = session
      ? toBatch(session.row, session.rec, withTrace ? session.trace : undefined)
      : await this.store.findById(id).then((row) => {
          if (!row) return undefined;
          return toBatch(row, recordOf(row), withTrace ? decodeTrace(row.trace) : undefined);
        });
    if (!batch || (user && !mayRead(user, batch.benchId))) throw new NotFound(`No batch ${id}`);
    return batch;
  }

  /** The bench's batch in progress (being weighed or interrupted), if any. */
  current(benchId: string, user?: AuthUser): Batch | null {
    if (user) requireBenchAccess(user, benchId);
    const session = this.sessions.of(benchId);
    return session ? toBatch(session.row, session.rec) : null;
  }

  /** Batches, newest first; an operator's list is their own bench's. */
  async list(filter: BatchListFilter, user?: AuthUser): Promise<Batch[]> {
    if (user?.role === 'operator') {
      if (filter.benchId) requireBenchAccess(user, filter.benchId);
      filter = { ...filter, benchId: user.benchId ?? '' };
    }
    const rows = await this.store.list(filter);
    return rows.map((row) => toBatch(row, recordOf(row)));
  }

  // ---- operator intents --------------------------------------------------------------------

  /** A batch of a material and total, or from a pour plan (its total recomputed now). */
  async create(body: CreateBatchBody, user: AuthUser): Promise<Batch> {
    const plan = body.planId ? await this.plans.forBatch(body.planId) : undefined;
    const input = {
      benchId: body.benchId,
      lots: body.lots,
      materialId: plan?.materialId ?? body.materialId ?? '',
      totalMassG: plan?.totalMassG ?? body.totalMassG ?? 0,
      override: body.override,
    };
    requireBenchAccess(user, input.benchId);
    if (!this.sessions.hasBench(input.benchId)) {
      throw new NotFound(`No bench ${input.benchId}`, [
        { path: 'benchId', message: 'Choose a bench that exists' },
      ]);
    }
    const busy = this.sessions.of(input.benchId);
    if (busy) {
      throw new BenchBusy(
        `Batch ${busy.id} is still open on this bench: finish or abandon it first`,
      );
    }
    await this.scaleChecks?.assertMayStartBatch(input.benchId);
    const material = await this.materials.get(input.materialId).catch((err: unknown) => {
      // Only a material that is not there is the operator's to fix; an outage stays an outage.
      if (!(err instanceof NotFound)) throw err;
      throw new NotFound(`No material ${input.materialId}`, [
        { path: 'materialId', message: 'Choose a material from the list' },
      ]);
    });
    if (!material.active) {
      throw new Conflict(`${material.name} is retired`, [
        { path: 'materialId', message: 'Choose a material in use' },
      ]);
    }
    const lots = [];
    // What each part will take, so a lot that holds less warns before anything is weighed.
    const plannedG = splitTotalG(input.totalMassG, material.weightRatio);
    for (const scanned of input.lots) {
      if (scanned.part >= material.weightRatio.length) {
        throw new Conflict(`${material.name} has no part ${'ABC'[scanned.part]}`, [
          { path: 'lots', message: 'A lot was given for a part this material lacks' },
        ]);
      }
      const lot = await this.materials.findLot(material.id, scanned.part, scanned.code);
      lots.push({
        part: scanned.part,
        code: scanned.code,
        lotId: lot?.id ?? null,
        warnings: lot
          ? [
              ...lot.warnings,
              ...[overdrawWarning(lot, plannedG[scanned.part]!)].filter((w) => w !== undefined),
            ]
          : [
              {
                code: 'LOT_UNKNOWN' as const,
                message: `Lot ${scanned.code} is not registered: it is recorded as scanned`,
              },
            ],
      });
    }
    const scaleOverride = await this.checkScaleFitness(input, material, user);
    const rec = startBatch({
      weightRatio: material.weightRatio,
      partLabels: material.partLabels,
      tolerancePct: material.tolerancePct,
      readabilityG: this.sessions.readabilityG(input.benchId),
      totalMassG: input.totalMassG,
      lots,
      now: this.sessions.nowIso(),
    });
    const detail = detailFor(rec, {
      potLifeMin: material.potLifeMin ?? null,
      potLifeMassG: material.potLifeMassG ?? null,
      costPerKg: costPerKgOf(material) ?? null,
      ...(scaleOverride
        ? {
            scaleOverride,
            handledBy: [{ ...scaleOverride.by, role: 'lead' as const, at: scaleOverride.at }],
          }
        : {}),
    });
    const row = await this.store.insert({
      benchId: input.benchId,
      operatorId: user.id,
      operatorName: user.name,
      materialId: material.id,
      materialName: material.name,
      planId: plan?.planId ?? null,
      state: rec.state,
      totalMassG: rec.totalMassG,
      weightRatio: rec.weightRatio,
      tolerancePct: rec.tolerancePct,
      readabilityG: rec.readabilityG,
      detail,
    });
    const session = this.sessions.open(row);
    this.logger.log(`Batch ${row.id} started on ${input.benchId} by ${user.name}`);
    return toBatch(session.row, session.rec);
  }

  /**
   * Refuses a batch whose smallest part is below what the bench's scale weighs within the band
   * (USP General Chapter <41>, coverage 2: `batchFitness`), naming the smallest batch it can
   * weigh, unless a lead's e-mail and password come with it. An accepted override is audited
   * before the batch is stored, and kept with the batch.
   */
  private async checkScaleFitness(
    input: Pick<CreateBatchBody, 'benchId' | 'override'> & {
      materialId: string;
      totalMassG: number;
    },
    material: { name: string; weightRatio: number[]; partLabels: string[]; tolerancePct: number },
    user: AuthUser,
  ): Promise<NonNullable<Batch['scaleOverride']> | undefined> {
    const fit = batchFitness({
      weightRatio: material.weightRatio,
      totalMassG: input.totalMassG,
      tolerancePct: material.tolerancePct,
      readabilityG: this.sessions.readabilityG(input.benchId),
      // The bench's last measured repeatability; without one the fitness falls back to 0.41 d
      // (USP <41>).
      repeatabilitySdG: (await this.scaleChecks?.repeatabilitySdG(input.benchId)) ?? null,
    });
    const short = fit.tooSmall[0];
    if (!short) return undefined;
    const g = (v: number) => `${Number(v.toFixed(3))} g`;
    const part = `Part ${PART_NAMES[short.part]}`;
    const why =
      `${part} would be ${g(short.targetG)}, below the ${g(fit.minNetG)} this scale weighs within ` +
      `±${material.tolerancePct} %: the smallest batch it can weigh is ${g(fit.smallestBatchG)}`;
    if (!input.override) {
      throw new Conflict(`${why}. Make a larger batch, or ask a lead to allow it`, [
        { path: SCALE_TOO_COARSE_PATH, message: why },
      ]);
    }
    const lead = await this.signIn.confirmLead(input.override, 'a batch too small for this scale');
    const at = this.sessions.nowIso();
    const override = {
      by: { id: lead.id, name: lead.name },
      at,
      minNetG: fit.minNetG,
      smallestBatchG: fit.smallestBatchG,
    };
    await this.audit.record(
      async () => undefined,
      () => ({
        at,
        actor: { id: lead.id, name: lead.name },
        entity: 'bench',
        entityId: input.benchId,
        action: 'scale-fitness.override',
        data: {
          operator: { id: user.id, name: user.name },
          materialId: input.materialId,
          totalMassG: input.totalMassG,
          part: short.part,
          targetG: short.targetG,
          minNetG: fit.minNetG,
          smallestBatchG: fit.smallestBatchG,
        },
      }),
    );
    this.logger.log(
      `${lead.name} allowed a ${input.totalMassG} g batch on ${input.benchId}: ${why}`,
    );
    return override;
  }

  /** Tares the scale for the active pour (the empty lined cup, or the cup with earlier parts). */
  tare(id: number, user: AuthUser): Promise<Batch> {
    return this.act(id, user, async (session) => {
      const rec = session.rec;
      const now = this.sessions.nowIso();
      if (!isWeighing(rec.state) || !rec.active) return markTared(rec, now);
      const latest = this.sessions.latest(session.benchId);
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
      await this.sessions.tareFor(session);
      return markTared(rec, this.sessions.nowIso());
    });
  }

  next(id: number, user: AuthUser): Promise<Batch> {
    return this.act(id, user, async (s) =>
      confirmPour(s.rec, this.sessions.netReading(s.benchId), this.sessions.nowIso()),
    );
  }

  rescue(id: number, user: AuthUser): Promise<Batch> {
    return this.act(id, user, async (s) =>
      takeRescue(
        s.rec,
        this.sessions.netReading(s.benchId),
        this.sessions.nowIso(),
        this.sessions.capacity(s.benchId),
      ),
    );
  }

  saveNoGo(id: number, user: AuthUser): Promise<Batch> {
    return this.act(id, user, async (s) =>
      saveNoGo(s.rec, this.sessions.netReading(s.benchId), this.sessions.nowIso()),
    );
  }

  abandon(id: number, reason: string, user: AuthUser): Promise<Batch> {
    return this.act(id, user, async (s) =>
      abandon(s.rec, reason, this.sessions.latest(s.benchId), this.sessions.nowIso()),
    );
  }

  /**
   * Back to weighing once the scale is back. After a hub restart the balance's tare may be gone:
   * what the active pour holds is read from the balance itself, never from the record's last
   * trace point; where it cannot be told within max(0.5 g, 2 d) the batch weighs on but can only
   * end NO-GO, "contents uncertain after a restart", for a lead to decide.
   */
  resume(id: number, user: AuthUser): Promise<Batch> {
    return this.act(id, user, async (session) => {
      const status = this.sessions.scaleStatus(session.benchId);
      if (status.state !== 'online') {
        throw new BatchRefusal(
          `The scale is ${status.state}: wait until it is back`,
          'WRONG_STATE',
        );
      }
      const now = this.sessions.nowIso();
      if (detailOf(session.row).tareLost !== true || !session.rec.active?.tared) {
        return resume(session.rec, { lost: false }, now);
      }
      const contents = this.sessions.contentsAfterRestart(session);
      if (!contents.known && /not steady/.test(contents.why)) {
        throw new BatchRefusal('Wait until the reading is steady, then resume', 'NOT_STABLE');
      }
      if (contents.known) {
        this.logger.log(
          `Batch ${id}: ${contents.pouredG.toFixed(2)} g in the pour after the restart (${contents.how})`,
        );
        return resume(session.rec, { lost: true, creditG: contents.pouredG }, now);
      }
      this.logger.warn(`Batch ${id}: ${UNCERTAIN_AFTER_RESTART}: ${contents.why}`);
      return resume(
        session.rec,
        {
          lost: true,
          creditG: session.trace.at(-1)?.[1] ?? 0,
          uncertain: `${UNCERTAIN_AFTER_RESTART}: ${contents.why}`,
        },
        now,
      );
    });
  }

  /** Runs one person's change on an open batch; a finished batch takes none. */
  private async act(
    id: number,
    user: AuthUser,
    change: (session: BenchSession) => Promise<BatchRecord>,
  ): Promise<Batch> {
    const session = this.sessions.byBatchId(id);
    if (!session) {
      const batch = await this.get(id, user, false);
      throw new Conflict(`Batch ${id} is ${batch.state}: it takes no more changes`);
    }
    requireBenchAccess(user, session.benchId);
    return this.sessions.change(session, user, change);
  }
}

const mayRead = (user: AuthUser, benchId: string) =>
  user.role !== 'operator' || user.benchId === benchId;

function requireBenchAccess(user: AuthUser, benchId: string): void {
  if (!mayRead(user, benchId)) {
    throw new NotAllowed('Operators pour only at the bench they signed in at');
  }
}
