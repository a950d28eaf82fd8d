/** Grams as the check record words them: enough decimals for a 0.001 g scale, no float tails. */
export function formatGrams(grams: number | null): string {
  if (grams === null) return 'nothing';
  return `${Number(grams.toFixed(4))} g`;
}
