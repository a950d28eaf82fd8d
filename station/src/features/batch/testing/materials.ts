import type { Lot, Material } from '@tareline/protocol';

/** The demo shop's filled surface-coat epoxy (invented), as `GET /api/materials` lists it. */
export const sc14: Material = {
  id: 'mat-sc14',
  name: 'Grey surface-coat epoxy SC-14',
  ratio: { basis: 'weight', parts: [100, 14] },
  specificGravity: 1.65,
  weightRatio: [100, 14],
  partLabels: ['Resin', 'Hardener'],
  tolerancePct: 1,
  potLifeMin: 25,
  potLifeMassG: 100,
  agitateMin: 3,
  cautions: ['Amine hardeners can sensitise skin: wear nitrile gloves.'],
  sdsRef: 'SDS binder, tab 3',
  active: true,
};

export const retired: Material = {
  ...sc14,
  id: 'mat-old',
  name: 'Old tooling epoxy TE-1',
  active: false,
};

export const sc14Lots: Lot[] = [
  {
    id: 'lot-r',
    materialId: sc14.id,
    part: 0,
    code: 'SC14R-2609',
    expiresOn: '2027-09-30',
    warnings: [],
  },
  {
    id: 'lot-h',
    materialId: sc14.id,
    part: 1,
    code: 'SC14H-2511',
    expiresOn: '2026-11-30',
    warnings: [{ code: 'LOT_EXPIRED', message: 'Lot SC14H-2511 expired on 2026-11-30' }],
  },
];
