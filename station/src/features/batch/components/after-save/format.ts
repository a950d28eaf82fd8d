/** Grams with as many decimals as the scale reads (0.01 g → 2, 0.1 g → 1, 1 g → 0). */
export function gramsText(grams: number, readabilityG: number): string {
  const decimals = readabilityG > 0 ? Math.max(0, Math.ceil(-Math.log10(readabilityG) - 1e-9)) : 2;
  return `${grams.toFixed(decimals)} g`;
}

/** How the bench names a part: its letter, and the material's own name for it when it has one. */
export function partName(index: number, label: string | undefined): string {
  const letter = `Part ${'ABC'[index] ?? index + 1}`;
  return !label || label.startsWith(letter) ? (label ?? letter) : `${letter} (${label})`;
}

/** A signed percentage with two decimals, e.g. +0.71 %, kept on one line. */
export function signedPct(pct: number): string {
  return `${pct > 0 ? '+' : pct < 0 ? '\u2212' : '±'}${Math.abs(pct).toFixed(2)}\u00a0%`;
}
