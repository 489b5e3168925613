import type { Role } from '@spincycle/shared/accounts/roles';
import { Browser, signedIn, startHarness, type Harness } from '../support/api-harness';

/**
 * The authorization matrix: every protected route, as nobody (401), as each role, and the
 * expected status. Later features add their rows here.
 */
type Method = 'get' | 'patch' | 'post';
interface RouteCase {
  method: Method;
  path: string;
  body?: object;
  /** Roles allowed; `'signed-in'` means any signed-in person. */
  allowed: Role[] | 'signed-in';
}

const ALL_ROLES: Role[] = ['proposer', 'reviewer', 'facility_manager', 'billing_contact', 'administrator'];

const ROUTES: RouteCase[] = [
  { method: 'get', path: '/api/nodes', allowed: 'signed-in' },
  { method: 'get', path: '/api/sites', allowed: 'signed-in' },
  { method: 'get', path: '/api/cycles', allowed: 'signed-in' },
  { method: 'post', path: '/api/sky-windows', body: { cycleId: 1, nodeIds: [1], targets: [{ ra: 1, dec: 1 }] }, allowed: 'signed-in' },
  { method: 'get', path: '/api/admin/accounts', allowed: ['administrator'] },
  { method: 'patch', path: '/api/admin/accounts/1', body: { disabled: false }, allowed: ['administrator'] },
];

let h: Harness;
const browsers = new Map<Role, Browser>();
beforeAll(async () => {
  h = await startHarness();
  for (const role of ALL_ROLES) browsers.set(role, (await signedIn(h, [role])).browser);
});
afterAll(() => h.close());

const call = (b: Browser, r: RouteCase) => (r.method === 'get' ? b.get(r.path) : b[r.method](r.path, r.body));

describe.each(ROUTES)('$method $path', (r) => {
  it('answers 401 not_signed_in without a session', async () => {
    const res = await call(new Browser(h), r);
    expect(res.status).toBe(401);
    expect(res.body.code).toBe('not_signed_in');
  });

  it.each(ALL_ROLES)('as %s: allowed roles pass, others get 403 forbidden', async (role) => {
    const res = await call(browsers.get(role)!, r);
    const allowed = r.allowed === 'signed-in' || r.allowed.includes(role);
    if (allowed) {
      expect([200, 201, 204, 400, 404]).toContain(res.status);
    } else {
      expect(res.status).toBe(403);
      expect(res.body.code).toBe('forbidden');
    }
  });
});

describe('unknown API paths', () => {
  it('answer 404 in the API error shape, never the single-page app', async () => {
    const res = await new Browser(h).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ code: 'not_found', message: expect.stringContaining('/api/no-such-thing') });
  });
});
