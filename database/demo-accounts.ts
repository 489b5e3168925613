import type { Role } from '../shared/src/accounts/roles';

/** One invented person per role; printed by `npm start` and listed in the README. */
export const DEMO_PASSWORD = 'starspots-demo';

export interface DemoAccount {
  email: string;
  displayName: string;
  affiliation: string;
  roles: Role[];
}

export const DEMO_ACCOUNTS: DemoAccount[] = [
  { email: 'proposer@halcyon.example', displayName: 'Mara Quillfeather', affiliation: 'Halcyon Night Array, Kestrel Ridge', roles: ['proposer'] },
  { email: 'reviewer@halcyon.example', displayName: 'Teodor Vasslund', affiliation: 'Vindelholm Station', roles: ['reviewer'] },
  { email: 'manager@halcyon.example', displayName: 'Ilse Marrowby', affiliation: 'Halcyon Night Array operations', roles: ['facility_manager'] },
  { email: 'billing@halcyon.example', displayName: 'Pim Lattercombe', affiliation: 'Halcyon Night Array finance', roles: ['billing_contact'] },
  { email: 'admin@halcyon.example', displayName: 'Sol Ardenwick', affiliation: 'Halcyon Night Array IT', roles: ['administrator'] },
];
