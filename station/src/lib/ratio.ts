/**
 * A mix ratio for people to read: each part to four significant figures, trailing zeros
 * dropped. A by-volume ratio turned into parts by weight carries the float of a division
 * (1 : 0.8965517241379312); a scale that reads 0.01 g cannot weigh to more than that anyway.
 */
export function ratioText(parts: readonly number[]): string {
  return parts.map((p) => String(Number(p.toPrecision(4)))).join(' : ');
}
