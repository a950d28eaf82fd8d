/**
 * Stability judged from the readings themselves, for line formats that carry no stability flag:
 * stable once every reading over the last `windowMs` lies within ± `toleranceG` (the scale
 * interval d) of the newest one. Pure: the caller passes the time of each reading.
 */
export class StabilityWindow {
  private readonly samples: { t: number; g: number }[] = [];

  constructor(
    private readonly windowMs: number,
    private readonly toleranceG: number,
  ) {
    if (!(windowMs > 0)) throw new TypeError(`windowMs must be above 0, got ${windowMs}`);
    if (!(toleranceG > 0)) throw new TypeError(`toleranceG must be above 0, got ${toleranceG}`);
  }

  /** Adds a reading and says whether the scale is settled as of it. */
  push(tMs: number, grams: number): boolean {
    this.samples.push({ t: tMs, g: grams });
    // Keep one sample at or before the window's start, so a full window can be told apart from
    // a window that has only just begun to fill.
    while (this.samples.length > 2 && this.samples[1]!.t <= tMs - this.windowMs) {
      this.samples.shift();
    }
    const oldest = this.samples[0]!;
    if (tMs - oldest.t < this.windowMs) return false;
    // A hair of slack for floating-point values printed at exactly ± d.
    const limit = this.toleranceG * (1 + 1e-9);
    return this.samples.every((s) => Math.abs(s.g - grams) <= limit);
  }

  reset(): void {
    this.samples.length = 0;
  }
}
