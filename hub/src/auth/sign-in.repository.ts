import { Inject, Injectable } from '@nestjs/common';
import { eq, lt, sql } from 'drizzle-orm';
import { Database } from '../database/database.js';
import { badgeLocks, benches, revokedTokens } from '../database/schema/index.js';

export type BenchRow = typeof benches.$inferSelect;

/** Wrong-PIN counters, signed-out tokens and the bench a badge is scanned at. */
@Injectable()
export class SignInRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  private get db() {
    return this.database.db;
  }

  async findBench(id: string): Promise<BenchRow | undefined> {
    const [row] = await this.db.select().from(benches).where(eq(benches.id, id));
    return row;
  }

  async lockedUntil(badgeHash: string): Promise<Date | null> {
    const [row] = await this.db
      .select({ lockedUntil: badgeLocks.lockedUntil })
      .from(badgeLocks)
      .where(eq(badgeLocks.badgeHash, badgeHash));
    return row?.lockedUntil ?? null;
  }

  /** Counts one wrong PIN; at `maxFailures` in a row the badge locks until `lockUntil`. */
  async recordFailure(badgeHash: string, maxFailures: number, lockUntil: Date): Promise<boolean> {
    const [row] = await this.db
      .insert(badgeLocks)
      .values({ badgeHash, failures: 1 })
      .onConflictDoUpdate({
        target: badgeLocks.badgeHash,
        set: { failures: sql`${badgeLocks.failures} + 1`, updatedAt: sql`now()` },
      })
      .returning({ failures: badgeLocks.failures });
    if ((row?.failures ?? 0) < maxFailures) return false;
    await this.db
      .update(badgeLocks)
      .set({ failures: 0, lockedUntil: lockUntil })
      .where(eq(badgeLocks.badgeHash, badgeHash));
    return true;
  }

  async clearFailures(badgeHash: string): Promise<void> {
    await this.db.delete(badgeLocks).where(eq(badgeLocks.badgeHash, badgeHash));
  }

  async revokeToken(tokenId: string, expiresAt: Date, now: Date): Promise<void> {
    await this.db.insert(revokedTokens).values({ tokenId, expiresAt }).onConflictDoNothing();
    // Tokens past their expiry are refused anyway: forget them.
    await this.db.delete(revokedTokens).where(lt(revokedTokens.expiresAt, now));
  }

  async isRevoked(tokenId: string): Promise<boolean> {
    const [row] = await this.db
      .select({ tokenId: revokedTokens.tokenId })
      .from(revokedTokens)
      .where(eq(revokedTokens.tokenId, tokenId));
    return row !== undefined;
  }
}
