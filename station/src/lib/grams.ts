/** Decimal places that show a scale interval d: 0.01 g → 2, 0.1 g → 1, 1 g → 0, 0.005 g → 3. */
export function decimalsForReadability(readabilityG: number): number {
  if (!(readabilityG > 0)) return 2;
  return Math.max(0, Math.ceil(-Math.log10(readabilityG) - 1e-9));
}

/** Grams as the gauge prints them: fixed decimals, a true minus sign, no `-0.00`. */
export function formatGrams(grams: number, decimals: number): string {
  const text = grams.toFixed(decimals);
  const isZero = Number(text) === 0;
  return isZero ? (0).toFixed(decimals) : text.replace('-', '\u2212');
}

/** Grams with their unit, to the decimals a scale of that readability shows: "14.10 g". */
export function gramsText(grams: number, readabilityG: number): string {
  return `${formatGrams(grams, decimalsForReadability(readabilityG))} g`;
}

/** A stock quantity: kilograms from 1 kg up ("4.21 kg"), grams below ("380.5 g"). */
export function stockText(grams: number): string {
  return Math.abs(grams) >= 1000
    ? `${formatGrams(Number((grams / 1000).toFixed(2)), 2).replace(/\.?0+$/, '')} kg`
    : `${formatGrams(Number(grams.toFixed(1)), 1).replace(/\.0$/, '')} g`;
}
