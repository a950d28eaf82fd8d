/**
 * Bad input to the mix math, in words an operator understands. `field` names the input by the
 * dotted path it has in a plan request (`cavity.height`, `displacement.volume`), so the hub and
 * the volume estimator can put the message beside the right field.
 */
export class MixInputError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(message);
    this.name = 'MixInputError';
  }
}

/** Refuses NaN, infinities and values at or below zero. */
export function requirePositive(value: number, field: string, what: string): number {
  if (value === Number.POSITIVE_INFINITY) {
    throw new MixInputError(field, `The ${what} is too large: check the sizes and their units`);
  }
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new MixInputError(field, `The ${what} must be a number`);
  }
  if (value <= 0) throw new MixInputError(field, `The ${what} must be more than zero`);
  return value;
}

/** Refuses NaN, infinities and negative values; zero is allowed. */
export function requireNonNegative(value: number, field: string, what: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new MixInputError(field, `The ${what} must be a number`);
  }
  if (value < 0) throw new MixInputError(field, `The ${what} cannot be negative`);
  return value;
}
