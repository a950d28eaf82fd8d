/** Time as the sign-in rules see it; a provider so tests can move it (lockout expiry). */
export interface Clock {
  now(): number;
}

export const CLOCK = Symbol('CLOCK');

export const systemClock: Clock = { now: () => Date.now() };
