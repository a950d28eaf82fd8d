import { Inject, Injectable } from '@nestjs/common';
import { and, asc, desc, eq, getTableColumns, inArray, sql } from 'drizzle-orm';
import { Database, type DbOrTx } from '../database/database.js';
import { lots, materials, stockMovements } from '../database/schema/index.js';

export type MaterialRow = typeof materials.$inferSelect;
export type NewMaterialRow = typeof materials.$inferInsert;
export type LotRow = typeof lots.$inferSelect & { onHandMg: number };
export type NewLotRow = typeof lots.$inferInsert;
export type StockMovementRow = typeof stockMovements.$inferSelect;
export type NewStockMovementRow = typeof stockMovements.$inferInsert;

/** A lot with the material it belongs to (its shelf life and threshold decide warnings). */
export interface LotWithMaterial {
  lot: LotRow;
  material: MaterialRow;
}

/** What a batch weighed from one lot, in milligrams taken (positive). */
export interface BatchDraw {
  lotId: string;
  takenMg: number;
}

/** One material of an import: `id` given and known updates it, otherwise it is added. */
export interface ImportRow {
  id?: string;
  values: NewMaterialRow;
}

/** Received plus every movement, in mg (sum over bigint is numeric in PostgreSQL: cast back). */
const onHandMg = sql<number>`(${lots.receivedMg} + coalesce((
  select sum(${stockMovements.deltaMg}) from ${stockMovements}
  where ${stockMovements.lotId} = ${lots.id}), 0))::bigint`.mapWith(Number);

const lotColumns = { ...getTableColumns(lots), onHandMg };

/** The only place that talks SQL about materials, lots and stock. */
@Injectable()
export class MaterialsRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  private get db() {
    return this.database.db;
  }

  list(includeRetired = true): Promise<MaterialRow[]> {
    return this.db
      .select()
      .from(materials)
      .where(includeRetired ? undefined : eq(materials.active, true))
      .orderBy(asc(materials.name), asc(materials.id));
  }

  async findById(id: string): Promise<MaterialRow | undefined> {
    const [row] = await this.db.select().from(materials).where(eq(materials.id, id));
    return row;
  }

  /** In the caller's transaction when given one (the audit trail appends in the same). */
  async insert(values: NewMaterialRow, db: DbOrTx = this.db): Promise<MaterialRow> {
    const [row] = await db.insert(materials).values(values).returning();
    return row!;
  }

  async update(
    id: string,
    values: Partial<NewMaterialRow>,
    db: DbOrTx = this.db,
  ): Promise<MaterialRow | undefined> {
    const [row] = await db.update(materials).set(values).where(eq(materials.id, id)).returning();
    return row;
  }

  /**
   * Adds or updates every material of an import in one transaction: one failing statement and
   * the library is as it was.
   */
  importAll(rows: readonly ImportRow[]): Promise<{ created: number; updated: number }> {
    return this.db.transaction(async (tx) => {
      const ids = rows.flatMap((r) => (r.id ? [r.id] : []));
      const known = new Set(
        ids.length
          ? (
              await tx
                .select({ id: materials.id })
                .from(materials)
                .where(inArray(materials.id, ids))
            ).map((r) => r.id)
          : [],
      );
      let created = 0;
      let updated = 0;
      for (const r of rows) {
        if (r.id && known.has(r.id)) {
          await tx.update(materials).set(r.values).where(eq(materials.id, r.id));
          updated += 1;
        } else {
          await tx.insert(materials).values(r.id ? { ...r.values, id: r.id } : r.values);
          created += 1;
        }
      }
      return { created, updated };
    });
  }

  listLots(materialId?: string): Promise<LotWithMaterial[]> {
    return this.db
      .select({ lot: lotColumns, material: materials })
      .from(lots)
      .innerJoin(materials, eq(lots.materialId, materials.id))
      .where(materialId ? eq(lots.materialId, materialId) : undefined)
      .orderBy(asc(lots.materialId), asc(lots.part), asc(lots.code));
  }

  async findLot(
    materialId: string,
    part: number,
    code: string,
  ): Promise<LotWithMaterial | undefined> {
    const [row] = await this.db
      .select({ lot: lotColumns, material: materials })
      .from(lots)
      .innerJoin(materials, eq(lots.materialId, materials.id))
      .where(and(eq(lots.materialId, materialId), eq(lots.part, part), eq(lots.code, code)));
    return row;
  }

  async findLotById(id: string): Promise<LotWithMaterial | undefined> {
    const [row] = await this.db
      .select({ lot: lotColumns, material: materials })
      .from(lots)
      .innerJoin(materials, eq(lots.materialId, materials.id))
      .where(eq(lots.id, id));
    return row;
  }

  async insertLot(values: NewLotRow, db: DbOrTx = this.db): Promise<LotRow> {
    const [row] = await db.insert(lots).values(values).returning();
    return { ...row!, onHandMg: row!.receivedMg };
  }

  async insertMovement(
    values: NewStockMovementRow,
    db: DbOrTx = this.db,
  ): Promise<StockMovementRow> {
    const [row] = await db.insert(stockMovements).values(values).returning();
    return row!;
  }

  listMovements(lotId: string): Promise<StockMovementRow[]> {
    return this.db
      .select()
      .from(stockMovements)
      .where(eq(stockMovements.lotId, lotId))
      .orderBy(desc(stockMovements.at), desc(stockMovements.id));
  }

  /**
   * Stores what a batch weighed from each lot, in the caller's transaction (the batch's write).
   * The (batch, lot) key makes a second write of the same batch replace its row, never add one.
   */
  async recordBatchDraws(db: DbOrTx, batchId: number, draws: readonly BatchDraw[]) {
    if (!draws.length) return;
    await db
      .insert(stockMovements)
      .values(
        draws.map((d) => ({
          lotId: d.lotId,
          kind: 'batch' as const,
          batchId,
          deltaMg: -d.takenMg,
        })),
      )
      .onConflictDoUpdate({
        target: [stockMovements.batchId, stockMovements.lotId],
        set: { deltaMg: sql`excluded.delta_mg` },
      });
  }
}
