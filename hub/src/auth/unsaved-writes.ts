import { Logger } from '@nestjs/common';

/** How often writes the store refused are tried again. */
export const RETRY_UNSAVED_EVERY_MS = 5_000;

/**
 * Values the store would not take (a full disk, say), kept in memory by key and written again
 * every few seconds until it takes them. The newest value of a key wins. Readers ask
 * {@link get} first, so the rules see what the store will hold once it works again.
 */
export class UnsavedWrites<V> {
  private readonly values = new Map<string, V>();
  private timer: NodeJS.Timeout | undefined;
  private retrying: Promise<void> | undefined;
  private readonly logger: Logger;

  constructor(
    what: string,
    private readonly write: (key: string, value: V) => Promise<void>,
    /** Runs a retry of one key alone with other work on that key, when order matters. */
    private readonly exclusive: (key: string, task: () => Promise<void>) => Promise<void> = (
      _key,
      task,
    ) => task(),
  ) {
    this.logger = new Logger(what);
  }

  get(key: string): V | undefined {
    return this.values.get(key);
  }

  get size(): number {
    return this.values.size;
  }

  /** Writes at once; when the store refuses, keeps the value for later and rethrows. */
  async save(key: string, value: V): Promise<void> {
    try {
      await this.write(key, value);
      this.values.delete(key);
    } catch (err) {
      this.values.set(key, value);
      this.startRetrying();
      throw err;
    }
  }

  /** One round of retries (joins a round already running); what is refused waits for the next. */
  retry(): Promise<void> {
    this.retrying ??= this.retryRound().finally(() => {
      this.retrying = undefined;
    });
    return this.retrying;
  }

  private async retryRound(): Promise<void> {
    for (const key of [...this.values.keys()]) {
      await this.exclusive(key, async () => {
        const value = this.values.get(key);
        if (value === undefined) return;
        try {
          await this.write(key, value);
          if (this.values.get(key) === value) this.values.delete(key);
        } catch {
          // Still refused: the store's own log says why once per failure.
        }
      });
    }
    if (this.values.size === 0) this.stopRetrying();
    else this.logger.warn(`${this.values.size} change(s) still unsaved: the store refuses them`);
  }

  /** Last try before the hub stops, then no more timers. */
  async close(): Promise<void> {
    this.stopRetrying();
    if (this.values.size > 0) await this.retry();
    this.stopRetrying();
  }

  private startRetrying(): void {
    if (this.timer) return;
    this.timer = setInterval(() => {
      this.retry().catch((err: unknown) => this.logger.error(String(err)));
    }, RETRY_UNSAVED_EVERY_MS);
    this.timer.unref();
  }

  private stopRetrying(): void {
    clearInterval(this.timer);
    this.timer = undefined;
  }
}
