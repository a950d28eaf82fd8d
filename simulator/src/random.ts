/**
 * A small seeded generator (mulberry32) so a simulator run with the same seed prints the same
 * lines. Not for anything secret.
 */
export class SeededRandom {
  private state: number;

  constructor(seed: number) {
    this.state = Math.trunc(seed) >>> 0;
  }

  /** Uniform in [0, 1). */
  next(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  /** Normally distributed with mean 0 and standard deviation `sigma` (Box–Muller). */
  gaussian(sigma: number): number {
    const u = 1 - this.next();
    const v = this.next();
    return sigma * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  }
}
