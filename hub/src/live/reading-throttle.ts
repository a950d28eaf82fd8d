/**
 * At most one emit per `intervalMs` for one stream of values, and never loses the newest: a value
 * that arrives too soon is held and emitted when the interval is up (trailing emit), replaced by
 * any newer value in the meantime.
 */
export class TrailingThrottle<T> {
  private lastEmitAt = Number.NEGATIVE_INFINITY;
  private held: { value: T } | undefined;
  private timer: NodeJS.Timeout | undefined;

  constructor(
    private readonly intervalMs: number,
    private readonly emit: (value: T) => void,
    private readonly now: () => number = () => performance.now(),
  ) {
    if (!(intervalMs > 0)) throw new TypeError(`"intervalMs" must be above 0, got ${intervalMs}`);
  }

  push(value: T): void {
    const wait = this.lastEmitAt + this.intervalMs - this.now();
    if (wait <= 0 && !this.timer) {
      this.fire(value);
      return;
    }
    this.held = { value };
    this.timer ??= setTimeout(
      () => {
        this.timer = undefined;
        const held = this.held;
        this.held = undefined;
        if (held) this.fire(held.value);
      },
      Math.max(0, wait),
    );
  }

  /** Drops a held value and the timer (the stream is gone). */
  dispose(): void {
    clearTimeout(this.timer);
    this.timer = undefined;
    this.held = undefined;
  }

  private fire(value: T): void {
    this.lastEmitAt = this.now();
    this.emit(value);
  }
}
