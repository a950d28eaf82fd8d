import { Inject, Injectable } from '@nestjs/common';
import { eq, lt } from 'drizzle-orm';
import { Database } from '../database/database.js';
import { badgeLocks, benches, revokedTokens } from '../database/schema/index.js';
import { guardStore } from '../database/store-errors.js';

export type BenchRow = typeof benches.$inferSelect;

/** Wrong PINs in a row on one badge, and until when it is locked (epoch ms). */
export interface BadgeLockState {
  failures: number;
  lockedUntil: number | null;
}

/**
 * Wrong-PIN counters, signed-out tokens and the bench a badge is scanned at. Throws domain
 * errors only (StoreUnavailable when the database fails).
 */
@Injectable()
export class SignInRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  private get db() {
    return this.database.db;
  }

  findBench(id: string): Promise<BenchRow | undefined> {
    return guardStore(async () => {
      const [row] = await this.db.select().from(benches).where(eq(benches.id, id));
      return row;
    });
  }

  badgeLock(badgeHash: string): Promise<BadgeLockState | undefined> {
    return guardStore(async () => {
      const [row] = await this.db
        .select({ failures: badgeLocks.failures, lockedUntil: badgeLocks.lockedUntil })
        .from(badgeLocks)
        .where(eq(badgeLocks.badgeHash, badgeHash));
      return row && { failures: row.failures, lockedUntil: row.lockedUntil?.getTime() ?? null };
    });
  }

  /**
   * Stores a badge's count and lock in one statement. The caller decides the values, one attempt
   * per badge at a time, so writing them whole is what keeps the count exact.
   */
  saveBadgeLock(badgeHash: string, state: BadgeLockState): Promise<void> {
    return guardStore(async () => {
      if (state.failures === 0 && state.lockedUntil === null) {
        await this.db.delete(badgeLocks).where(eq(badgeLocks.badgeHash, badgeHash));
        return;
      }
      const values = {
        failures: state.failures,
        lockedUntil: state.lockedUntil === null ? null : new Date(state.lockedUntil),
        updatedAt: new Date(),
      };
      await this.db
        .insert(badgeLocks)
        .values({ badgeHash, ...values })
        .onConflictDoUpdate({ target: badgeLocks.badgeHash, set: values });
    });
  }

  revokeToken(tokenId: string, expiresAt: Date, now: Date): Promise<void> {
    return guardStore(async () => {
      await this.db.insert(revokedTokens).values({ tokenId, expiresAt }).onConflictDoNothing();
      // Tokens past their expiry are refused anyway: forget them.
      await this.db.delete(revokedTokens).where(lt(revokedTokens.expiresAt, now));
    });
  }

  isRevoked(tokenId: string): Promise<boolean> {
    return guardStore(async () => {
      const [row] = await this.db
        .select({ tokenId: revokedTokens.tokenId })
        .from(revokedTokens)
        .where(eq(revokedTokens.tokenId, tokenId));
      return row !== undefined;
    });
  }
}
