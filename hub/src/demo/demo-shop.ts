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
