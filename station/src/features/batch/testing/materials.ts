import type { Lot, Material } from '@tareline/protocol';
import { sc14 } from '../../../testing/fixtures';

export { sc14 };

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
    receivedG: 5000,
    onHandG: 4210.5,
    warnings: [],
  },
  {
    id: 'lot-h',
    materialId: sc14.id,
    part: 1,
    code: 'SC14H-2511',
    expiresOn: '2026-11-30',
    receivedG: 500,
    onHandG: 380,
    warnings: [{ code: 'LOT_EXPIRED', message: 'Lot SC14H-2511 expired on 2026-11-30' }],
  },
];
