import type { Role } from '@steadyhand/shared';

/**
 * The demo hospital. Every name here is invented; the demo password is shown on the sign-in
 * page only while demo mode is on.
 */
export const DEMO_FACILITY = 'Harbourview General Hospital';
export const DEMO_PASSWORD = 'steady-hands-demo';

export const DEMO_UNITS = [
  '4 West Medical',
  'Cardiac Step-Down 3B',
  'Emergency Bay 2',
  'Pediatric Ward 5 East',
  'Intensive Care 6 North',
] as const;

export const DEMO_PEOPLE: { username: string; displayName: string; roles: Role[] }[] = [
  { username: 'maren.holt', displayName: 'Maren Holt, RN', roles: ['recorder'] },
  { username: 'kofi.asante', displayName: 'Dr Kofi Asante', roles: ['leader', 'recorder'] },
  { username: 'priya.venkat', displayName: 'Priya Venkat, PharmD', roles: ['pharmacist'] },
  { username: 'ewan.trelawny', displayName: 'Ewan Trelawny, RN', roles: ['reviewer'] },
  { username: 'sofia.delacroix', displayName: 'Sofia Delacroix', roles: ['admin'] },
];
