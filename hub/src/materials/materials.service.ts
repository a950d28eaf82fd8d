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
    receivedG: 0,
    onHandG: 0,
  };
  return { ...lot, warnings: lotWarnings(lot, today(), material.openShelfLifeDays) };
}

/** Material systems and their lots. */
@Injectable()
export class MaterialsService {
  constructor(@Inject(MaterialsRepository) private readonly repository: MaterialsRepository) {}

  async list(): Promise<Material[]> {
    const rows = await this.repository.list();
    return rows.map(toMaterial);
  }

  async get(id: string): Promise<Material> {
    const row = await this.repository.findById(id);
    if (!row) throw new NotFound(`No material ${id}`);
    return toMaterial(row);
  }

  async create(input: z.output<typeof materialInputSchema>): Promise<Material> {
    const row = await this.repository.insert({
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
    });
    return toMaterial(row);
  }

  async listLots(materialId?: string): Promise<Lot[]> {
    const rows = await this.repository.listLots(materialId);
    return rows.map(({ lot, material }) => toLot(lot, toMaterial(material)));
  }

  async createLot(input: z.output<typeof lotInputSchema>): Promise<Lot> {
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
    const row = await this.repository.insertLot({
      materialId: input.materialId,
      part: input.part,
      code: input.code,
      expiresOn: input.expiresOn ?? null,
      openedOn: input.openedOn ?? null,
    });
    return toLot(row, material);
  }

  /** The registered lot with this code for this part, if any. */
  async findLot(materialId: string, part: number, code: string): Promise<Lot | undefined> {
    const row = await this.repository.findLot(materialId, part, code);
    return row ? toLot(row.lot, toMaterial(row.material)) : undefined;
  }
}
