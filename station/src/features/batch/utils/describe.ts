import { PART_NAMES, type Material } from '@tareline/protocol';

/** "A", "B", "C" for part 0, 1, 2. */
export const partLetter = (part: number): string => PART_NAMES[part] ?? String(part + 1);

/** "Part A (Resin)", or "Part A" where the material's own name for it says as much. */
export function partName(part: number, label: string | undefined): string {
  const plain = `Part ${partLetter(part)}`;
  return !label || label.toLowerCase().startsWith(plain.toLowerCase())
    ? plain
    : `${plain} (${label})`;
}

/** "100 : 14 by weight", as the data sheet gives it. */
export function ratioText(material: Pick<Material, 'ratio'>): string {
  return `${material.ratio.parts.join(' : ')} by ${material.ratio.basis}`;
}

/** "25 min at 100 g", or undefined without a pot life. */
export function potLifeText(material: Pick<Material, 'potLifeMin' | 'potLifeMassG'>) {
  if (material.potLifeMin === undefined) return undefined;
  return material.potLifeMassG === undefined
    ? `${material.potLifeMin} min`
    : `${material.potLifeMin} min at ${material.potLifeMassG} g`;
}

/** Seconds as m:ss for a countdown. */
export function clockText(totalS: number): string {
  const s = Math.max(0, Math.ceil(totalS));
  return `${Math.floor(s / 60)}:${String(s % 60).padStart(2, '0')}`;
}
