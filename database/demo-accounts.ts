import type { Role } from '../shared/src/accounts/roles';
import demo from './demo-accounts.json';

/**
 * One invented person per role (the list lives in demo-accounts.json so that the start
 * script can print it before TypeScript tooling is available).
 */
export interface DemoAccount {
  email: string;
  displayName: string;
  affiliation: string;
  roles: Role[];
}

export const DEMO_PASSWORD: string = demo.password;
export const DEMO_ACCOUNTS = demo.accounts as DemoAccount[];
