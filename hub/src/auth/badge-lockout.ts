import { Inject, Injectable, type OnModuleDestroy } from '@nestjs/common';
import { CLOCK, type Clock } from '../common/clock.js';
import { LockedOut, StoreUnavailable } from '../common/domain-errors.js';
import { KeyedMutex } from './keyed-mutex.js';
import { SignInRepository, type BadgeLockState } from './sign-in.repository.js';
import { UnsavedWrites } from './unsaved-writes.js';

/** Wrong PINs in a row before a badge locks, and for how long. */
export const MAX_PIN_FAILURES = 5;
export const BADGE_LOCK_MS = 5 * 60_000;

const CLEAR: BadgeLockState = { failures: 0, lockedUntil: null };

/**
 * Counts wrong PINs per badge and locks a badge after {@link MAX_PIN_FAILURES} in a row. Attempts
 * on one badge run one at a time, from the lock check to the count, so PINs sent in parallel
 * cannot slip past a lock that an earlier one is about to set. A count the store refuses stays in
 * memory, still counts, and is written once the store takes it.
 */
@Injectable()
export class BadgeLockout implements OnModuleDestroy {
  private readonly turns = new KeyedMutex();
  private readonly unsaved: UnsavedWrites<BadgeLockState>;

  constructor(
    @Inject(SignInRepository) private readonly store: SignInRepository,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {
    this.unsaved = new UnsavedWrites(
      'BadgeLockout',
      (badgeHash, state) => this.store.saveBadgeLock(badgeHash, state),
      (badgeHash, task) => this.turns.run(badgeHash, task),
    );
  }

  /**
   * One sign-in attempt with a badge, alone on that badge. Throws {@link LockedOut} while the badge
   * is locked (or when this wrong PIN locks it). `checkPin` answers whether the PIN was right, or
   * null when no PIN was checked (none needed), which changes nothing; what it throws passes
   * through uncounted.
   */
  attempt(badgeHash: string, checkPin: () => Promise<boolean | null>): Promise<boolean | null> {
    return this.turns.run(badgeHash, async () => {
      const state = this.unsaved.get(badgeHash) ?? (await this.store.badgeLock(badgeHash)) ?? CLEAR;
      if (state.lockedUntil !== null && state.lockedUntil > this.clock.now()) {
        throw this.locked(state.lockedUntil);
      }
      const right = await checkPin();
      if (right === null) return null;
      if (right) {
        if (state.failures > 0 || state.lockedUntil !== null) {
          // A sign-in does not wait for the store: the cleared count is written when it can be.
          await this.unsaved.save(badgeHash, CLEAR).catch(() => undefined);
        }
        return true;
      }
      const failures = state.failures + 1;
      const next: BadgeLockState =
        failures >= MAX_PIN_FAILURES
          ? { failures: 0, lockedUntil: this.clock.now() + BADGE_LOCK_MS }
          : { failures, lockedUntil: state.lockedUntil };
      let saved = true;
      await this.unsaved.save(badgeHash, next).catch(() => {
        saved = false;
      });
      if (next.lockedUntil !== null && next.lockedUntil > this.clock.now()) {
        throw this.locked(next.lockedUntil);
      }
      if (!saved) {
        throw new StoreUnavailable(
          'Badge or PIN not recognised, and the hub could not save this attempt (its data ' +
            'store is failing; the disk may be full): tell an admin',
        );
      }
      return false;
    });
  }

  /** Writes counts the store refused earlier, now (tests; the timer does it every few seconds). */
  saveUnsaved(): Promise<void> {
    return this.unsaved.retry();
  }

  async onModuleDestroy(): Promise<void> {
    await this.unsaved.close();
  }

  private locked(until: number): LockedOut {
    const leftMs = until - this.clock.now();
    const minutes = Math.max(1, Math.ceil(leftMs / 60_000));
    return new LockedOut(
      `Too many wrong PINs: this badge is locked for ${minutes} more minute${minutes === 1 ? '' : 's'}`,
      [],
      Math.max(1, Math.ceil(leftMs / 1000)),
    );
  }
}
