import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { AccountSummary, SessionUser } from '@spincycle/shared/accounts/account-schemas';
import type { Role } from '@spincycle/shared/accounts/roles';
import { SessionAuth } from '../app/core/auth/session-auth';

/** An invented person for tests. */
export function testUser(roles: Role[], overrides: Partial<SessionUser> = {}): SessionUser {
  return {
    id: 1,
    email: 'orla.venn@example.org',
    displayName: 'Orla Venn',
    affiliation: 'Greyhollow Array',
    roles,
    ...overrides,
  };
}

/** An account row as the admin API returns it. */
export function testAccount(id: number, roles: Role[], overrides: Partial<AccountSummary> = {}): AccountSummary {
  return {
    ...testUser(roles, { id, email: `person${id}@example.org`, displayName: `Person ${id}` }),
    disabled: false,
    createdAt: '2025-01-10T09:00:00.000Z',
    lastSignInAt: null,
    ...overrides,
  };
}

/**
 * Puts `user` in SessionAuth through its real GET /api/auth/session call (the test must
 * provide HttpClient with provideHttpClientTesting()).
 */
export async function seedSession(user: SessionUser | null): Promise<SessionAuth> {
  const auth = TestBed.inject(SessionAuth);
  const loaded = auth.load();
  TestBed.inject(HttpTestingController).expectOne('/api/auth/session').flush({ user });
  await loaded;
  return auth;
}
