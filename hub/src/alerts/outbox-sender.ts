import {
  Inject,
  Injectable,
  Logger,
  type OnApplicationBootstrap,
  type OnModuleDestroy,
} from '@nestjs/common';
import { CLOCK, type Clock } from '../common/clock.js';
import { nextAttemptAfterFailure } from './alert-rules.js';
import { renderDigest, type MailContent } from './alert-mail.js';
import { AlertsRepository, type OutboxRow } from './alerts.repository.js';
import { MAIL_TRANSPORT, SendFailure, type MailTransport } from './mail-transport.js';

/** How often the sender looks for rows whose time has come (retries, delayed alerts). */
export const OUTBOX_POLL_MS = 15_000;
/** More alerts than this for one person at once go as one digest mail. */
export const DIGEST_OVER = 10;
export const DIGEST_WINDOW_MS = 10 * 60_000;

/**
 * Takes queued outbox rows and sends them: marks them sent, or on failure schedules the retry
 * (1, 5, 30 minutes, then hourly for a day) and finally marks them failed with the server's words.
 * Rows live in the database, so what was queued when the hub died goes out after the restart.
 */
@Injectable()
export class OutboxSender implements OnApplicationBootstrap, OnModuleDestroy {
  private readonly logger = new Logger('Outbox');
  private stopPolling: (() => void) | undefined;
  private running: Promise<void> | undefined;
  private again = false;

  constructor(
    @Inject(AlertsRepository) private readonly repo: AlertsRepository,
    @Inject(MAIL_TRANSPORT) private readonly transport: MailTransport,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  onApplicationBootstrap(): void {
    this.stopPolling = this.clock.every(OUTBOX_POLL_MS, () => this.kick());
    this.kick();
  }

  async onModuleDestroy(): Promise<void> {
    this.stopPolling?.();
    await this.running;
    await this.transport.close();
  }

  /** Starts a pass in the background (new rows queued, a poll); its failure is logged. */
  kick(): void {
    this.flush().catch((err: unknown) =>
      this.logger.error(`Outbox pass failed: ${err instanceof Error ? err.message : String(err)}`),
    );
  }

  /**
   * Sends every row that is due. One pass at a time: a call during a pass waits for it and
   * runs one more, so a row is never picked up by two passes (and never sent twice).
   */
  async flush(): Promise<void> {
    if (this.running) {
      this.again = true;
      return this.running;
    }
    this.running = (async () => {
      try {
        do {
          this.again = false;
          // Hubs sharing a server take turns: a row is never sent by two of them.
          await this.repo.oneSenderAtATime(() => this.pass());
        } while (this.again);
      } finally {
        this.running = undefined;
      }
    })();
    return this.running;
  }

  private async pass(): Promise<void> {
    const due = await this.repo.due(new Date(this.clock.now()));
    const byAddress = new Map<string, OutboxRow[]>();
    for (const row of due) byAddress.set(row.to, [...(byAddress.get(row.to) ?? []), row]);
    for (const [to, rows] of byAddress) {
      if (rows.length > 1 && (await this.isFlooded(to))) {
        await this.deliver(to, rows, renderDigest(rows));
      } else {
        for (const row of rows) await this.deliver(to, [row], row);
      }
    }
  }

  /** More than {@link DIGEST_OVER} alerts for this address in the last 10 minutes. */
  private async isFlooded(to: string): Promise<boolean> {
    const since = new Date(this.clock.now() - DIGEST_WINDOW_MS);
    return (await this.repo.countSince(to, since)) > DIGEST_OVER;
  }

  private async deliver(to: string, rows: OutboxRow[], content: MailContent): Promise<void> {
    const ids = rows.map((r) => r.id);
    try {
      await this.transport.send({
        to,
        subject: content.subject,
        text: content.text,
        html: content.html,
      });
      await this.repo.markSent(ids, new Date(this.clock.now()));
    } catch (err) {
      const failure = err instanceof SendFailure ? err : new SendFailure(String(err), false);
      const now = this.clock.now();
      // A digest's rows fail together; its oldest row decides when the day of retries is over.
      const first = rows[0]!;
      const next = failure.permanent
        ? null
        : nextAttemptAfterFailure(first.attempts + 1, first.firstTriedAt?.getTime() ?? now, now);
      await this.repo.markFailed(
        ids,
        failure.message,
        new Date(now),
        next === null ? null : new Date(next),
      );
      this.logger.warn(
        `Alert mail to ${to} ${next === null ? 'failed for good' : 'will be retried'}: ${failure.message}`,
      );
    }
  }
}
