import { Inject, Injectable } from '@nestjs/common';
import {
  fieldErrors,
  lotAdjustmentInputSchema,
  lotInputSchema,
  lotWarnings,
  lowStockWarning,
  materialInputSchema,
  materialPatchSchema,
  toMg,
  weightRatio,
  type Lot,
  type Material,
  type MaterialImportResult,
  type StockMovement,
} from '@tareline/protocol';
import type { z } from 'zod';
import { AuditRepository, type Actor, type AuditInput } from '../audit/audit.repository.js';
import { CLOCK, type Clock } from '../common/clock.js';
import { Conflict, InvalidInput, NotFound } from '../common/domain-errors.js';
import { libraryToCsv, parseLibraryCsv, type LibraryEntry } from './materials-csv.js';
import {
  MaterialsRepository,
  type LotRow,
  type MaterialRow,
  type NewMaterialRow,
  type StockMovementRow,
} from './materials.repository.js';

type MaterialFields = z.output<typeof materialInputSchema>;

const gramsOf = (mg: number) => mg / 1000;

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
    ...(row.alsoStatedRatio !== null && { alsoStatedRatio: row.alsoStatedRatio }),
    ...(row.demoldMin !== null && { demoldMin: row.demoldMin }),
    ...(row.storageNote !== null && { storageNote: row.storageNote }),
    ...(row.costPerKg !== null && { costPerKg: row.costPerKg }),
    ...(row.lowStockG !== null && { lowStockG: row.lowStockG }),
    active: row.active,
  };
}

/** The material as its form holds it (what an edit starts from and the library file writes). */
function toFields(row: MaterialRow): MaterialFields {
  const fields = {
    name: row.name,
    ratio: { basis: row.ratioBasis, parts: row.ratioParts },
    specificGravity: row.specificGravity ?? undefined,
    yieldIn3PerLb: row.yieldIn3PerLb ?? undefined,
    partSpecificGravities: row.partSpecificGravities ?? undefined,
    partLabels: row.partLabels ?? undefined,
    tolerancePct: row.tolerancePct,
    potLifeMin: row.potLifeMin ?? undefined,
    potLifeMassG: row.potLifeMassG ?? undefined,
    agitateMin: row.agitateMin,
    cautions: row.cautions,
    sdsRef: row.sdsRef ?? undefined,
    openShelfLifeDays: row.openShelfLifeDays ?? undefined,
    alsoStatedRatio: row.alsoStatedRatio ?? undefined,
    demoldMin: row.demoldMin ?? undefined,
    storageNote: row.storageNote ?? undefined,
    costPerKg: row.costPerKg ?? undefined,
    lowStockG: row.lowStockG ?? undefined,
  };
  return Object.fromEntries(
    Object.entries(fields).filter(([, v]) => v !== undefined),
  ) as MaterialFields;
}

/** The columns a material's form fields are stored in (every one, so an edit can clear one). */
function toColumns(input: MaterialFields): NewMaterialRow {
  return {
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
    alsoStatedRatio: input.alsoStatedRatio ?? null,
    demoldMin: input.demoldMin ?? null,
    storageNote: input.storageNote ?? null,
    costPerKg: input.costPerKg ?? null,
    lowStockG: input.lowStockG ?? null,
  };
}

function toMovement(row: StockMovementRow): StockMovement {
  return {
    id: row.id,
    lotId: row.lotId,
    kind: row.kind,
    deltaG: gramsOf(row.deltaMg),
    ...(row.reason !== null && { reason: row.reason }),
    ...(row.batchId !== null && { batchId: row.batchId }),
    ...(row.personId !== null && { by: { id: row.personId, name: row.personName ?? '' } }),
    at: row.at.toISOString(),
  };
}

/** Material systems, their lots and what is on hand. */
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

  private today(): string {
    return new Date(this.clock.now()).toISOString().slice(0, 10);
  }

  private toLot(row: LotRow, material: MaterialRow): Lot {
    const lot = {
      id: row.id,
      materialId: row.materialId,
      part: row.part,
      code: row.code,
      ...(row.expiresOn !== null && { expiresOn: row.expiresOn }),
      ...(row.openedOn !== null && { openedOn: row.openedOn }),
      receivedG: gramsOf(row.receivedMg),
      onHandG: gramsOf(row.onHandMg),
    };
    const low = lowStockWarning(lot, material.lowStockG?.[row.part]);
    return {
      ...lot,
      warnings: [
        ...lotWarnings(lot, this.today(), material.openShelfLifeDays ?? undefined),
        ...(low ? [low] : []),
      ],
    };
  }

  async list(includeRetired = true): Promise<Material[]> {
    const rows = await this.repository.list(includeRetired);
    return rows.map(toMaterial);
  }

  private async row(id: string): Promise<MaterialRow> {
    const row = await this.repository.findById(id);
    if (!row) throw new NotFound(`No material ${id}`);
    return row;
  }

  async get(id: string): Promise<Material> {
    return toMaterial(await this.row(id));
  }

  /** Adds a material; `by` is who did (null: the demo shop on a first start). */
  async create(input: MaterialFields, by: Actor): Promise<Material> {
    const values = toColumns(input);
    const row = await this.audit.record(
      (tx) => this.repository.insert(values, tx),
      (stored) => this.entry(by, 'material', stored.id, 'material.created', values),
    );
    return toMaterial(row);
  }

  /**
   * Changes the fields given (null clears one) and checks the material again as a whole, so a
   * new ratio with the old SGs is caught. Batches keep their own copy of what they used.
   */
  async update(
    id: string,
    patch: z.output<typeof materialPatchSchema>,
    by: Actor,
  ): Promise<Material> {
    const current = await this.row(id);
    const { active, ...changes } = patch;
    const merged: Record<string, unknown> = { ...toFields(current) };
    for (const [key, value] of Object.entries(changes)) {
      if (value === undefined) continue;
      if (value === null) delete merged[key];
      else merged[key] = value;
    }
    const checked = materialInputSchema.safeParse(merged);
    if (!checked.success) {
      throw new InvalidInput('The material is not valid', fieldErrors(checked.error));
    }
    const values = { ...toColumns(checked.data), ...(active !== undefined && { active }) };
    const row = await this.audit.record(
      async (tx) => {
        const updated = await this.repository.update(id, values, tx);
        if (!updated) throw new NotFound(`No material ${id}`);
        return updated;
      },
      () =>
        this.entry(
          by,
          'material',
          id,
          active === false ? 'material.retired' : 'material.changed',
          patch,
        ),
    );
    return toMaterial(row);
  }

  async listLots(materialId?: string): Promise<Lot[]> {
    const rows = await this.repository.listLots(materialId);
    return rows.map(({ lot, material }) => this.toLot(lot, material));
  }

  async createLot(input: z.output<typeof lotInputSchema>, by: Actor): Promise<Lot> {
    const material = await this.row(input.materialId);
    if (input.part >= material.ratioParts.length) {
      throw new Conflict(`${material.name} has ${material.ratioParts.length} parts`, [
        { path: 'part', message: `Choose a part of ${material.name}` },
      ]);
    }
    const existing = await this.repository.findLot(input.materialId, input.part, input.code);
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
      receivedMg: toMg(input.receivedG),
    };
    const row = await this.audit.record(
      (tx) => this.repository.insertLot(values, tx),
      (stored) => this.entry(by, 'lot', stored.id, 'lot.created', values),
    );
    return this.toLot(row, material);
  }

  /** The registered lot with this code for this part, if any. */
  async findLot(materialId: string, part: number, code: string): Promise<Lot | undefined> {
    const row = await this.repository.findLot(materialId, part, code);
    return row ? this.toLot(row.lot, row.material) : undefined;
  }

  async getLot(id: string): Promise<Lot> {
    const row = await this.repository.findLotById(id);
    if (!row) throw new NotFound(`No lot ${id}`);
    return this.toLot(row.lot, row.material);
  }

  /** A spill, a count: recorded with who and why. Stock never goes below zero. */
  async adjustLot(
    id: string,
    input: z.output<typeof lotAdjustmentInputSchema>,
    by: NonNullable<Actor>,
  ): Promise<Lot> {
    const lot = await this.getLot(id);
    const deltaMg = toMg(input.deltaG);
    if (toMg(lot.onHandG) + deltaMg < 0) {
      throw new Conflict(`Lot ${lot.code} has only ${lot.onHandG} g on hand`, [
        { path: 'deltaG', message: `Take at most ${lot.onHandG} g` },
      ]);
    }
    await this.audit.record(
      (tx) =>
        this.repository.insertMovement(
          {
            lotId: id,
            kind: 'adjustment',
            deltaMg,
            reason: input.reason,
            personId: by.id,
            personName: by.name,
            at: new Date(this.clock.now()),
          },
          tx,
        ),
      () => this.entry(by, 'lot', id, 'lot.adjusted', input),
    );
    return this.getLot(id);
  }

  async movements(lotId: string): Promise<StockMovement[]> {
    await this.getLot(lotId);
    const rows = await this.repository.listMovements(lotId);
    return rows.map(toMovement);
  }

  /** The whole library, retired materials included, as the import reads it back. */
  async exportCsv(): Promise<string> {
    const rows = await this.repository.list(true);
    const entries: LibraryEntry[] = rows.map((r) => ({
      id: r.id,
      active: r.active,
      input: toFields(r),
    }));
    return libraryToCsv(entries);
  }

  /** Adds or updates every material of the file, or none when any row is bad. */
  async importCsv(csv: string): Promise<MaterialImportResult> {
    const parsed = parseLibraryCsv(csv);
    if (!parsed.ok) {
      throw new InvalidInput(
        'Nothing was imported: correct the rows named and import the file again',
        parsed.errors,
      );
    }
    return this.repository.importAll(
      parsed.entries.map((e) => ({
        ...(e.id !== undefined && { id: e.id }),
        values: { ...toColumns(e.input), active: e.active },
      })),
    );
  }
}
