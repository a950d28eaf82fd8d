import {
  Inject,
  Injectable,
  Logger,
  type OnApplicationBootstrap,
  type OnModuleDestroy,
} from '@nestjs/common';
import { BatchesRepository } from '../batches/batches.repository.js';
import { CLOCK, type Clock } from '../common/clock.js';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { renderDailySummary } from './alert-mail.js';
import { AlertsRepository } from './alerts.repository.js';
import { chosenAlerts } from './alerts.service.js';
import { OutboxSender } from './outbox-sender.js';

const DAY_MS = 24 * 60 * 60_000;

/** The hub's local calendar day of a time, as YYYY-MM-DD. */
function localDay(ms: number): string {
  const d = new Date(ms);
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

/**
 * Once a day, in the configured hour (the hub's local time), queues the summary mail for the
 * people who get it. Checked every minute on the injected clock; the outbox key names the day,
 * so a restart within the hour queues nothing twice. A hub that is off for the whole hour sends
 * no summary that day.
 */
@Injectable()
export class DailySummary implements OnApplicationBootstrap, OnModuleDestroy {
  private readonly logger = new Logger('DailySummary');
  private stop: (() => void) | undefined;
  private queuedDay: string | undefined;

  constructor(
    @Inject(AlertsRepository) private readonly repo: AlertsRepository,
    @Inject(BatchesRepository) private readonly batches: BatchesRepository,
    @Inject(OutboxSender) private readonly sender: OutboxSender,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  onApplicationBootstrap(): void {
    this.stop = this.clock.every(60_000, () => {
      this.tick().catch((err: unknown) =>
        this.logger.error(`Daily summary not queued: ${(err as Error).message}`),
      );
    });
  }

  onModuleDestroy(): void {
    this.stop?.();
  }

  /** Queues today's summaries if it is the hour and they are not queued yet; answers how many. */
  async tick(): Promise<number> {
    const now = this.clock.now();
    if (new Date(now).getHours() !== this.config.mail.summaryHour) return 0;
    const day = localDay(now);
    if (this.queuedDay === day) return 0;
    const people = (await this.repo.recipients()).filter(
      (p) => p.email && chosenAlerts(p).includes('summary.daily'),
    );
    const outcomes = await this.batches.outcomesSince(new Date(now - DAY_MS));
    const mail = renderDailySummary(day, outcomes, this.config.mail.publicUrl);
    const added = await this.repo.enqueue(
      people.map((p) => ({
        key: `summary:${day}:${p.id}`,
        event: 'summary.daily' as const,
        personId: p.id,
        to: p.email!,
        ...mail,
        createdAt: new Date(now),
        nextAttemptAt: new Date(now),
      })),
    );
    this.queuedDay = day;
    if (added) this.sender.kick();
    return added;
  }
}
