import { pgTable, text, timestamp } from 'drizzle-orm/pg-core';

/** A mixing bench: one scale, one screen. The scale link columns come with the scale-link work. */
export const benches = pgTable('benches', {
  id: text('id').primaryKey(),
  name: text('name').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});
