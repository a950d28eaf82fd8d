import { sql } from 'drizzle-orm';
import { index, integer, pgTable, text, timestamp } from 'drizzle-orm/pg-core';
import { materials } from './materials.js';

/**
 * A material's data sheet as uploaded: every version is kept, the newest of a kind counts. The
 * PDF itself is a file under the data folder's `documents/`, named by the row's id.
 */
export const materialDocuments = pgTable(
  'material_documents',
  {
    id: text('id')
      .primaryKey()
      .default(sql`gen_random_uuid()::text`),
    materialId: text('material_id')
      .notNull()
      .references(() => materials.id),
    kind: text('kind', { enum: ['sds', 'tds'] }).notNull(),
    /** The name the file had on the lead's computer, for the download and the list. */
    fileName: text('file_name').notNull(),
    sizeBytes: integer('size_bytes').notNull(),
    /** Hex SHA-256 of the bytes, so a copy in a backup can be checked. */
    sha256: text('sha256').notNull(),
    uploadedById: text('uploaded_by_id').notNull(),
    uploadedByName: text('uploaded_by_name').notNull(),
    uploadedAt: timestamp('uploaded_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('material_documents_material').on(t.materialId, t.kind, t.uploadedAt)],
);
