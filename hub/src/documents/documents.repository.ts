import { Inject, Injectable } from '@nestjs/common';
import { and, desc, eq } from 'drizzle-orm';
import { Database } from '../database/database.js';
import { materialDocuments } from '../database/schema/index.js';

export type DocumentRow = typeof materialDocuments.$inferSelect;
export type NewDocumentRow = typeof materialDocuments.$inferInsert;

/** The only place that talks SQL about data sheets. */
@Injectable()
export class DocumentsRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  private get db() {
    return this.database.db;
  }

  async insert(values: NewDocumentRow): Promise<DocumentRow> {
    const [row] = await this.db.insert(materialDocuments).values(values).returning();
    return row!;
  }

  async remove(id: string): Promise<void> {
    await this.db.delete(materialDocuments).where(eq(materialDocuments.id, id));
  }

  async findById(id: string): Promise<DocumentRow | undefined> {
    const [row] = await this.db
      .select()
      .from(materialDocuments)
      .where(eq(materialDocuments.id, id));
    return row;
  }

  /** Every version of a material's sheets, newest first. */
  listFor(materialId: string, kind?: 'sds' | 'tds'): Promise<DocumentRow[]> {
    return this.db
      .select()
      .from(materialDocuments)
      .where(
        and(
          eq(materialDocuments.materialId, materialId),
          kind ? eq(materialDocuments.kind, kind) : undefined,
        ),
      )
      .orderBy(desc(materialDocuments.uploadedAt), desc(materialDocuments.id));
  }
}
