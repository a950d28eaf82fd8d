import { Inject, Injectable } from '@nestjs/common';
import { and, asc, eq } from 'drizzle-orm';
import { Database, type DbOrTx } from '../database/database.js';
import { lots, materials } from '../database/schema/index.js';

export type MaterialRow = typeof materials.$inferSelect;
export type NewMaterialRow = typeof materials.$inferInsert;
export type LotRow = typeof lots.$inferSelect;
export type NewLotRow = typeof lots.$inferInsert;

/** A lot with the material it belongs to (its shelf life after opening decides warnings). */
export interface LotWithMaterial {
  lot: LotRow;
  material: MaterialRow;
}

/** The only place that talks SQL about materials and lots. */
@Injectable()
export class MaterialsRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  private get db() {
    return this.database.db;
  }

  list(): Promise<MaterialRow[]> {
    return this.db.select().from(materials).orderBy(asc(materials.name));
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

  listLots(materialId?: string): Promise<LotWithMaterial[]> {
    return this.db
      .select({ lot: lots, material: materials })
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
      .select({ lot: lots, material: materials })
      .from(lots)
      .innerJoin(materials, eq(lots.materialId, materials.id))
      .where(and(eq(lots.materialId, materialId), eq(lots.part, part), eq(lots.code, code)));
    return row;
  }

  async insertLot(values: NewLotRow, db: DbOrTx = this.db): Promise<LotRow> {
    const [row] = await db.insert(lots).values(values).returning();
    return row!;
  }
}
