import { sql } from 'drizzle-orm';
import { boolean, integer, pgTable, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core';
import type { Role } from '@tareline/protocol';

/**
 * Everyone who may sign in. Secrets are never stored as given: the badge code as a keyed hash
 * (HMAC-SHA-256, so a badge can be looked up), the PIN and password with scrypt.
 */
export const people = pgTable(
  'people',
  {
    id: text('id')
      .primaryKey()
      .default(sql`gen_random_uuid()::text`),
    name: text('name').notNull(),
    role: text('role').$type<Role>().notNull(),
    active: boolean('active').notNull().default(true),
    /** Lower-case; leads and admins sign in with it at a desk. */
    email: text('email'),
    passwordHash: text('password_hash'),
    /** Hex HMAC-SHA-256 of the badge code under the hub's badge key. */
    badgeHash: text('badge_hash'),
    pinHash: text('pin_hash'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('people_email_unique').on(t.email),
    uniqueIndex('people_badge_hash_unique').on(t.badgeHash),
  ],
);

/**
 * Wrong PINs per badge (keyed by the badge hash, known badge or not, so an unknown badge behaves
 * exactly like a known one). Five in a row lock the badge for five minutes.
 */
export const badgeLocks = pgTable('badge_locks', {
  badgeHash: text('badge_hash').primaryKey(),
  failures: integer('failures').notNull().default(0),
  lockedUntil: timestamp('locked_until', { withTimezone: true }),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/** Tokens signed out before they ran out; rows can go once `expiresAt` has passed. */
export const revokedTokens = pgTable('revoked_tokens', {
  tokenId: text('token_id').primaryKey(),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
});
