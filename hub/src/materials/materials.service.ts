import { Inject, Injectable } from '@nestjs/common';
import {
  lotInputSchema,
  lotWarnings,
  materialInputSchema,
  weightRatio,
  type Lot,
  type Material,
} from '@tareline/protocol';
import type { z } from 'zod';
import { AuditRepository, type Actor, type AuditInput } from '../audit/audit.repository.js';
import { CLOCK, type Clock } from '../common/clock.js';
import { Conflict, NotFound } from '../common/domain-errors.js';
import { MaterialsRepository, type LotRow, type MaterialRow } from './materials.repository.js';

const today = () => new Date().toISOString().slice(0, 10);

function toMaterial(row: MaterialRow): Material {
  const ratio = { basis: row.ratioBasis, parts: row.ratioParts };
  const partSGs = row.partSpecificGravities ?? undefined;
  return {
    id: row.id,
    name: row.name,
    ratio,
    ...(row.specificGravity !== null && { specificGravity: row.specificGravity }),
    ...(row.yieldIn3PerLb !== null && { yieldIn3PerLb: row.yieldIn3PerLb }),
    ...(partSGs && { partSpecificGravities: partSGs }),
    weightRatio: weightRatio(ratio, partSGs),
    partLabels: row.partLabels ?? row.ratioParts.map((_, i) => `Part ${'ABC'[i]}`),
    tolerancePct: row.tolerancePct,
    ...(row.potLifeMin !== null && { potLifeMin: row.potLifeMin }),
    ...(row.potLifeMassG !== null && { potLifeMassG: row.potLifeMassG }),
    agitateMin: row.agitateMin,
    cautions: row.cautions,
    ...(row.sdsRef !== null && { sdsRef: row.sdsRef }),
    ...(row.openShelfLifeDays !== null && { openShelfLifeDays: row.openShelfLifeDays }),
    active: row.active,
  };
}

function toLot(row: LotRow, material: Pick<Material, 'openShelfLifeDays'>): Lot {
  const lot = {
    id: row.id,
    materialId: row.materialId,
    part: row.part,
    code: row.code,
    ...(row.expiresOn !== null && { expiresOn: row.expiresOn }),
    ...(row.openedOn !== null && { openedOn: row.openedOn }),
  };
  return { ...lot, warnings: lotWarnings(lot, today(), material.openShelfLifeDays) };
}

/** Material systems and their lots. */
@Injectable()
export class MaterialsService {
  constructor(
    @Inject(MaterialsRepository) private readonly repository: MaterialsRepository,
    @Inject(AuditRepository) private readonly audit: AuditRepository,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  /** The audit entry of a change to a material or a lot, stored with it. */
  private entry(
    by: Actor,
    entity: 'material' | 'lot',
    id: string,
    action: string,
    data: unknown,
  ): AuditInput {
    return {
      at: new Date(this.clock.now()).toISOString(),
      actor: by,
      entity,
      entityId: id,
      action,
      data,
    };
  }

  async list(): Promise<Material[]> {
    const rows = await this.repository.list();
    return rows.map(toMaterial);
  }

  async get(id: string): Promise<Material> {
    const row = await this.repository.findById(id);
    if (!row) throw new NotFound(`No material ${id}`);
    return toMaterial(row);
  }

  /** Adds a material; `by` is who did (null: the demo shop on a first start). */
  async create(input: z.output<typeof materialInputSchema>, by: Actor): Promise<Material> {
    const values = {
      name: input.name,
      ratioBasis: input.ratio.basis,
      ratioParts: input.ratio.parts,
      specificGravity: input.specificGravity ?? null,
      yieldIn3PerLb: input.yieldIn3PerLb ?? null,
      partSpecificGravities: input.partSpecificGravities ?? null,
      partLabels: input.partLabels ?? null,
      tolerancePct: input.tolerancePct,
      potLifeMin: input.potLifeMin ?? null,
      potLifeMassG: input.potLifeMassG ?? null,
      agitateMin: input.agitateMin,
      cautions: input.cautions,
      sdsRef: input.sdsRef ?? null,
      openShelfLifeDays: input.openShelfLifeDays ?? null,
    };
    const row = await this.audit.record(
      (tx) => this.repository.insert(values, tx),
      (stored) => this.entry(by, 'material', stored.id, 'material.created', values),
    );
    return toMaterial(row);
  }

  async listLots(materialId?: string): Promise<Lot[]> {
    const rows = await this.repository.listLots(materialId);
    return rows.map(({ lot, material }) => toLot(lot, toMaterial(material)));
  }

  async createLot(input: z.output<typeof lotInputSchema>, by: Actor): Promise<Lot> {
    const material = await this.get(input.materialId);
    if (input.part >= material.ratio.parts.length) {
      throw new Conflict(`${material.name} has ${material.ratio.parts.length} parts`, [
        { path: 'part', message: `Choose a part of ${material.name}` },
      ]);
    }
    const existing = await this.findLot(input.materialId, input.part, input.code);
    if (existing) {
      throw new Conflict(`Lot ${input.code} is already registered for this part`, [
        { path: 'code', message: 'This lot is already registered' },
      ]);
    }
    const values = {
      materialId: input.materialId,
      part: input.part,
      code: input.code,
      expiresOn: input.expiresOn ?? null,
      openedOn: input.openedOn ?? null,
    };
    const row = await this.audit.record(
      (tx) => this.repository.insertLot(values, tx),
      (stored) => this.entry(by, 'lot', stored.id, 'lot.created', values),
    );
    return toLot(row, material);
  }

  /** The registered lot with this code for this part, if any. */
  async findLot(materialId: string, part: number, code: string): Promise<Lot | undefined> {
    const row = await this.repository.findLot(materialId, part, code);
    return row ? toLot(row.lot, toMaterial(row.material)) : undefined;
  }
}
