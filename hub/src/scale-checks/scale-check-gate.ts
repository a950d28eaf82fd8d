import { Inject, Injectable } from '@nestjs/common';
import {
  checkDue,
  SCALE_CHECK_DUE_PATH,
  type BenchCheckStatus,
} from '@tareline/protocol/scale-checks';
import { CLOCK, type Clock } from '../common/clock.js';
import { BenchBusy, Conflict, NotFound } from '../common/domain-errors.js';
import { formatGrams } from './check-words.js';
import { ScaleChecksRepository } from './scale-checks.repository.js';

/**
 * Whether a bench may start a batch as far as its scale checks go, and what the bench says about
 * them at sign-in. Small on purpose: the batches feature asks it before a batch starts.
 */
@Injectable()
export class ScaleCheckGate {
  /** Bench id → number of the check running there (0 while it is being written). */
  readonly running = new Map<string, number>();

  constructor(
    @Inject(ScaleChecksRepository) private readonly repository: ScaleChecksRepository,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  /** Refuses a batch while a check runs at the bench, or (with `blockWhenDue`) while one is due. */
  async assertMayStartBatch(benchId: string): Promise<void> {
    const running = this.running.get(benchId);
    if (running !== undefined) {
      throw new BenchBusy(
        `A scale check is running at this bench: finish or cancel it before starting a batch`,
      );
    }
    const status = await this.status(benchId).catch((err: unknown) => {
      // A bench the batches feature knows but this one does not has no policy to enforce.
      if (err instanceof NotFound) return null;
      throw err;
    });
    if (status?.blocked && status.message) {
      throw new Conflict(status.message, [{ path: SCALE_CHECK_DUE_PATH, message: status.message }]);
    }
  }

  /** The bench's last measured repeatability (sample standard deviation, g); null: none yet. */
  async repeatabilitySdG(benchId: string): Promise<number | null> {
    const policy = await this.repository.policy(benchId);
    return policy?.repeatabilitySdG ?? null;
  }

  async status(benchId: string): Promise<BenchCheckStatus> {
    const policy = await this.repository.policy(benchId);
    if (!policy) throw new NotFound(`There is no bench "${benchId}"`);
    const [lastRoutine, lastPassed, lastRepeatability] = await Promise.all([
      this.repository.latestFinished(benchId, 'routine'),
      this.repository.latestFinished(benchId, 'routine', ['passed']),
      this.repository.latestFinished(benchId, 'repeatability', ['passed']),
    ]);
    const now = this.clock.now();
    const lastPassedAt = lastPassed?.finishedAt?.getTime() ?? null;
    const due = checkDue(
      {
        checkEveryHours: policy.checkEveryHours,
        lastPassedAt,
        lastFailed: lastRoutine?.state === 'failed',
      },
      now,
    );
    let message: string | null = null;
    if (due.reason === 'last-failed' && lastRoutine) {
      message =
        `The last scale check at this bench failed: it read ${formatGrams(lastRoutine.readingG)} ` +
        `for the ${formatGrams(lastRoutine.referenceG)} weight. Check the scale before weighing`;
    } else if (due.reason === 'expired') {
      message = `A scale check is due at this bench: the last one passed more than ${policy.checkEveryHours} h ago`;
    } else if (due.reason === 'never-checked') {
      message = 'A scale check is due at this bench: none has passed here yet';
    }
    const blocked = policy.blockWhenDue && due.due;
    if (blocked && message) message += '. Batches wait until a check passes';
    const today = new Date(now).toISOString().slice(0, 10);
    const running = this.running.get(benchId);
    return {
      benchId,
      checkEveryHours: policy.checkEveryHours,
      blockWhenDue: policy.blockWhenDue,
      checkToleranceG: policy.checkToleranceG,
      calibrationDueOn: policy.calibrationDueOn,
      calibrationOverdue: policy.calibrationDueOn !== null && policy.calibrationDueOn <= today,
      due: due.due,
      reason: due.reason,
      message,
      blocked,
      lastPassedAt: lastPassedAt === null ? null : new Date(lastPassedAt).toISOString(),
      nextDueAt: due.nextDueAt === null ? null : new Date(due.nextDueAt).toISOString(),
      repeatabilitySdG: policy.repeatabilitySdG,
      repeatabilityAt: policy.repeatabilityAt?.toISOString() ?? null,
      minNetG: lastRepeatability?.minNetG ?? null,
      minNetBandPct: lastRepeatability?.bandPct ?? null,
      runningCheckId: running ? running : null,
    };
  }
}
