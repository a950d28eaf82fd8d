import type { Material } from '@tareline/protocol';

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
