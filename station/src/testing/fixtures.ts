import type { Batch, Material } from '@tareline/protocol';

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

/**
 * A batch of SC-14 as the hub answers it once saved GO: 100.00 g then 14.10 g, +0.714 % off
 * ratio ((14.10 / 100) / 0.14 − 1, worked by hand from the definition of parts by weight).
 */
export function savedBatch(over: Partial<Batch> = {}): Batch {
  const at = '2026-12-02T08:02:00.000Z';
  return {
    id: 42,
    state: 'saved',
    verdict: 'GO',
    benchId: 'bench-1',
    materialId: sc14.id,
    materialName: sc14.name,
    operator: { id: 'p-1', name: 'Wren Ashby' },
    totalMassG: 114.1,
    weightRatio: [100, 14],
    parts: [
      { label: 'Resin', targetG: 100, actualG: 100 },
      { label: 'Hardener', targetG: 14, actualG: 14.1 },
    ],
    active: null,
    rescue: null,
    ratioDeviationPct: 0.714,
    tolerancePct: 1,
    readabilityG: 0.01,
    lots: [
      { part: 0, code: 'HRP-R-2611', lotId: 'lot-1', warnings: [] },
      { part: 1, code: 'HRP-H-2702', lotId: 'lot-2', warnings: [] },
    ],
    potLifeMin: 25,
    potLifeMassG: 100,
    abandonReason: null,
    interruptedReason: null,
    steps: {},
    createdAt: at,
    savedAt: at,
    ...over,
  };
}
