import { PART_NAMES } from '@tareline/protocol';

/** "A", "B", "C" for part 0, 1, 2 (a fourth part, should one come, is "4"). */
export const partLetter = (part: number): string => PART_NAMES[part] ?? String(part + 1);

/**
 * How the station names a part: "Part A (Resin)", or the material's own name for it where that
 * already says "Part A" ("Part A (iso)"), or "Part A" without a name.
 */
export function partName(part: number, label: string | undefined): string {
  const plain = `Part ${partLetter(part)}`;
  if (!label) return plain;
  return label.toLowerCase().startsWith(plain.toLowerCase()) ? label : `${plain} (${label})`;
}
