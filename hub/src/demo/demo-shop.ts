import type { Role } from '@tareline/protocol';

/**
 * The demo shop: Hollin Ridge Patternworks, an invented pattern shop with invented people.
 * README lists these badge codes, PINs and passwords; they are for trying Tareline out only.
 */
export const DEMO_PEOPLE: readonly {
  name: string;
  role: Role;
  badge: string;
  pin?: string;
  email?: string;
  password?: string;
}[] = [
  {
    name: 'Oda Fenwick',
    role: 'admin',
    badge: 'HR-0001',
    pin: '9012',
    email: 'oda.fenwick@hollin-ridge.example',
    password: 'ridge-admin-demo',
  },
  {
    name: 'Ilse Varga',
    role: 'lead',
    badge: 'HR-0002',
    pin: '4321',
    email: 'ilse.varga@hollin-ridge.example',
    password: 'ridge-lead-demo',
  },
  { name: 'Tomas Reyl', role: 'operator', badge: 'HR-1001', pin: '1357' },
  { name: 'Priya Sandell', role: 'operator', badge: 'HR-1002', pin: '2468' },
  // An operator without a PIN: signs in with the badge alone where the bench allows it.
  { name: 'Joss Whitcombe', role: 'operator', badge: 'HR-1003' },
];

export const DEMO_BENCHES = [
  { id: 'bench-1', name: 'Bench 1', pinRequired: false, idleSignOutMin: 5 },
  { id: 'bench-2', name: 'Casting bench', pinRequired: true, idleSignOutMin: 3 },
] as const;

const EPOXY_CAUTIONS = [
  'Amine hardeners can sensitise skin: wear nitrile gloves and long sleeves; change gloves that are wet with resin.',
  'Wear eye protection; keep an eyewash within reach.',
  'Mix only what you can pour within the pot life: a large mass in a cup heats itself and can smoke.',
];
const URETHANE_CAUTIONS = [
  'Isocyanates (part A) can sensitise lungs and skin: work under local exhaust ventilation and wear gloves.',
  'Wear eye protection.',
  'Keep containers closed: moisture spoils part A and makes the casting foam.',
];

/**
 * The demo shop's materials: invented systems with data-sheet-like figures (not any real
 * product's). Ratios, densities and pot lives are typical of their kind, chosen for the demo.
 */
export const DEMO_MATERIALS = [
  {
    name: 'Grey surface-coat epoxy SC-14',
    ratio: { basis: 'weight', parts: [100, 14] },
    specificGravity: 1.65,
    partLabels: ['Resin', 'Hardener'],
    tolerancePct: 1,
    potLifeMin: 25,
    potLifeMassG: 100,
    agitateMin: 3,
    cautions: [
      ...EPOXY_CAUTIONS,
      'The resin is filled and settles in the can: stir it from the bottom until the colour is even.',
    ],
    sdsRef: 'SDS binder, tab 3 (SC-14 resin and hardener)',
    openShelfLifeDays: 180,
    costPerKg: [38, 52],
    lowStockG: [1000, 150],
  },
  {
    name: 'Clear laminating epoxy LR-27',
    ratio: { basis: 'weight', parts: [100, 27] },
    specificGravity: 1.12,
    partLabels: ['Resin', 'Hardener'],
    tolerancePct: 1,
    potLifeMin: 40,
    potLifeMassG: 150,
    agitateMin: 0,
    cautions: EPOXY_CAUTIONS,
    sdsRef: 'SDS binder, tab 4 (LR-27)',
    costPerKg: [29, 41],
    lowStockG: [1000, 270],
  },
  {
    name: 'Amber casting urethane CU-11',
    ratio: { basis: 'volume', parts: [1, 1] },
    partSpecificGravities: [1.16, 1.04],
    partLabels: ['Part A (iso)', 'Part B (polyol)'],
    tolerancePct: 2,
    potLifeMin: 6,
    potLifeMassG: 100,
    agitateMin: 0,
    cautions: URETHANE_CAUTIONS,
    sdsRef: 'SDS binder, tab 7 (CU-11)',
    costPerKg: [21, 19],
    lowStockG: [800, 800],
  },
  {
    name: 'Shore 60A urethane rubber UR-60 with colour',
    ratio: { basis: 'weight', parts: [100, 80, 2] },
    specificGravity: 1.05,
    partLabels: ['Part A', 'Part B', 'Colour'],
    tolerancePct: 2,
    potLifeMin: 20,
    potLifeMassG: 200,
    agitateMin: 1,
    cautions: URETHANE_CAUTIONS,
    sdsRef: 'SDS binder, tab 8 (UR-60)',
    costPerKg: [24, 24, 90],
    lowStockG: [1000, 800, 50],
  },
] as const;

/**
 * Lots on the shelf, one expired and one open too long, so the warnings can be seen; the old
 * hardener is also below its material's low-stock threshold.
 */
export const DEMO_LOTS = [
  {
    material: 'Grey surface-coat epoxy SC-14',
    part: 0,
    code: 'SC14R-2609',
    receivedG: 4000,
    expiresOn: '2027-09-30',
    openedOn: '2026-11-02',
  },
  {
    material: 'Grey surface-coat epoxy SC-14',
    part: 1,
    code: 'SC14H-2608',
    receivedG: 560,
    expiresOn: '2027-08-31',
    openedOn: '2026-11-02',
  },
  {
    material: 'Grey surface-coat epoxy SC-14',
    part: 1,
    code: 'SC14H-2511',
    receivedG: 120,
    expiresOn: '2026-11-30',
    openedOn: '2026-03-10',
  },
  {
    material: 'Clear laminating epoxy LR-27',
    part: 0,
    code: 'LR27R-2607',
    receivedG: 4500,
    expiresOn: '2027-07-31',
  },
  {
    material: 'Clear laminating epoxy LR-27',
    part: 1,
    code: 'LR27H-2607',
    receivedG: 1215,
    expiresOn: '2027-07-31',
  },
  {
    material: 'Amber casting urethane CU-11',
    part: 0,
    code: 'CU11A-2610',
    receivedG: 3600,
    expiresOn: '2027-04-30',
    openedOn: '2026-10-20',
  },
  {
    material: 'Amber casting urethane CU-11',
    part: 1,
    code: 'CU11B-2610',
    receivedG: 3200,
    expiresOn: '2027-04-30',
    openedOn: '2026-10-20',
  },
] as const;
