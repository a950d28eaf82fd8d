/**
 * Activity at the bench that is not a touch on the screen: the scale moving under a pour. An
 * operator pouring with both hands must not be signed out for not touching the screen.
 */
export const BENCH_ACTIVITY_EVENT = 'tareline:bench-activity';

export function reportBenchActivity(): void {
  window.dispatchEvent(new Event(BENCH_ACTIVITY_EVENT));
}
