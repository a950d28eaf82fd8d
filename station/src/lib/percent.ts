/** A ratio's deviation from plan is shown to hundredths of a percent, on the label and in review. */
const DEVIATION_PCT_DECIMALS = 2;

/**
 * A ratio deviation as a signed percentage with a true minus sign, e.g. "+0.71 %", "−0.36 %",
 * "0.00 %"; the space before % does not break, so it stays on one line of a label.
 */
export function deviationPctText(pct: number): string {
  const text = Math.abs(pct).toFixed(DEVIATION_PCT_DECIMALS);
  const sign = Number(text) === 0 ? '' : pct > 0 ? '+' : '\u2212';
  return `${sign}${text}\u00a0%`;
}
