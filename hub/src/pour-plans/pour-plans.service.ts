import { Inject, Injectable } from '@nestjs/common';
import {
  MixInputError,
  pourPlanResult,
  type Material,
  type PourEstimate,
  type PourPlan,
  type pourPlanInputSchema,
  type pourPlanPatchSchema,
} from '@tareline/protocol';
import type { z } from 'zod';
import type { AuthUser } from '../auth/auth-user.js';
import { CLOCK, type Clock } from '../common/clock.js';
import { InvalidInput, NotFound } from '../common/domain-errors.js';
import { MaterialsService } from '../materials/materials.service.js';
import { PourPlansRepository, type PourPlanRow } from './pour-plans.repository.js';

/** A plan's total within a thousandth of a gram counts as unchanged (float noise, no more). */
const SAME_TOTAL_G = 1e-3;

/** What a batch from a plan starts with. */
export interface PlanForBatch {
  planId: string;
  materialId: string;
  totalMassG: number;
}

/**
 * Saved volume-estimator results, one per mold or part. The total is recomputed from the saved
 * estimate with the material as it is now, so an edited material gives the right batch.
 */
@Injectable()
export class PourPlansService {
  constructor(
    @Inject(PourPlansRepository) private readonly repository: PourPlansRepository,
    @Inject(MaterialsService) private readonly materials: MaterialsService,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  private async material(id: string): Promise<Material> {
    return this.materials.get(id).catch((err: unknown) => {
      if (!(err instanceof NotFound)) throw err;
      throw new NotFound(`No material ${id}`, [
        { path: 'materialId', message: 'Choose a material from the list' },
      ]);
    });
  }

  private totalOf(estimate: PourEstimate, material: Material): number {
    try {
      return pourPlanResult(estimate, material).totalMassG;
    } catch (err) {
      if (!(err instanceof MixInputError)) throw err;
      throw new InvalidInput('The pour plan has mistakes', [
        { path: err.field, message: err.message },
      ]);
    }
  }

  private toPlan(row: PourPlanRow, material: Material): PourPlan {
    const totalMassG = this.totalOf(row.estimate, material);
    return {
      id: row.id,
      name: row.name,
      moldRef: row.moldRef,
      materialId: row.materialId,
      materialName: material.name,
      estimate: row.estimate,
      savedTotalMassG: row.totalMassG,
      totalMassG,
      materialChanged: Math.abs(totalMassG - row.totalMassG) > SAME_TOTAL_G,
      createdBy: { id: row.createdById, name: row.createdByName },
      createdAt: row.createdAt.toISOString(),
      updatedAt: row.updatedAt.toISOString(),
    };
  }

  async list(): Promise<PourPlan[]> {
    const [rows, materials] = await Promise.all([this.repository.list(), this.materials.list()]);
    const byId = new Map(materials.map((m) => [m.id, m]));
    return rows.map((row) => this.toPlan(row, byId.get(row.materialId)!));
  }

  async get(id: string): Promise<PourPlan> {
    const row = await this.repository.findById(id);
    if (!row) throw new NotFound(`No pour plan ${id}`);
    const plan = this.toPlan(row, await this.material(row.materialId));
    const poured = await this.repository.batchesOf(id);
    return {
      ...plan,
      batches: poured.map((b) => ({
        ...b,
        verdict: b.verdict ?? null,
        createdAt: b.createdAt.toISOString(),
      })),
    };
  }

  async create(input: z.output<typeof pourPlanInputSchema>, user: AuthUser): Promise<PourPlan> {
    const material = await this.material(input.materialId);
    const row = await this.repository.insert({
      name: input.name,
      moldRef: input.moldRef || null,
      materialId: material.id,
      estimate: input.estimate,
      totalMassG: this.totalOf(input.estimate, material),
      createdById: user.id,
      createdByName: user.name,
    });
    return this.toPlan(row, material);
  }

  /** Changes a plan; its total is recomputed and saved with the material as it is now. */
  async update(id: string, patch: z.output<typeof pourPlanPatchSchema>): Promise<PourPlan> {
    const row = await this.repository.findById(id);
    if (!row) throw new NotFound(`No pour plan ${id}`);
    const material = await this.material(patch.materialId ?? row.materialId);
    const estimate = patch.estimate ?? row.estimate;
    const updated = await this.repository.update(id, {
      ...(patch.name !== undefined && { name: patch.name }),
      ...(patch.moldRef !== undefined && { moldRef: patch.moldRef || null }),
      materialId: material.id,
      estimate,
      totalMassG: this.totalOf(estimate, material),
      updatedAt: new Date(this.clock.now()),
    });
    if (!updated) throw new NotFound(`No pour plan ${id}`);
    return this.get(id);
  }

  /** The material and the total (recomputed now) a batch from this plan starts with. */
  async forBatch(id: string): Promise<PlanForBatch> {
    const row = await this.repository.findById(id);
    if (!row) {
      throw new NotFound(`No pour plan ${id}`, [
        { path: 'planId', message: 'Choose a pour plan from the list' },
      ]);
    }
    const plan = this.toPlan(row, await this.material(row.materialId));
    return { planId: plan.id, materialId: plan.materialId, totalMassG: plan.totalMassG };
  }
}
