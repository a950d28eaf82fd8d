/**
 * Time as the hub's rules see it (lockout expiry, session expiry, batch timers): a provider under
 * {@link CLOCK}, so tests can move it instead of waiting.
 */
export interface Clock {
  now(): number;
}

export const CLOCK = Symbol('CLOCK');

export const systemClock: Clock = { now: () => Date.now() };
