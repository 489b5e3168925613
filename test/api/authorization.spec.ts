import { ROLES, type Role } from '@spincycle/shared/accounts/roles';
import { Browser, signedIn, startHarness, type Harness } from '../support/api-harness';

/**
 * The authorization matrix: every protected route, as nobody (401), as each role, and the
 * expected status. Later features add their rows here.
 */
type Method = 'get' | 'patch' | 'post' | 'put' | 'delete';
interface RouteCase {
  method: Method;
  path: string;
  body?: object;
  /** Roles allowed; `'signed-in'` means any signed-in person. */
  allowed: Role[] | 'signed-in';
}

const P = '/api/proposals/99999999';
/** Every route under /api/proposals/:id, on a proposal that does not exist. */
const PROPOSAL_ROUTES: Omit<RouteCase, 'allowed'>[] = [
  { method: 'get', path: P },
  { method: 'patch', path: P, body: { version: 1, title: 'x' } },
  { method: 'delete', path: P },
  { method: 'post', path: `${P}/members`, body: { email: 'someone@test.example' } },
  { method: 'delete', path: `${P}/members/1` },
  { method: 'put', path: `${P}/justification`, body: {} },
  { method: 'get', path: `${P}/justification` },
  { method: 'get', path: `${P}/targets` },
  { method: 'post', path: `${P}/targets`, body: {} },
  { method: 'post', path: `${P}/targets/upload`, body: {} },
  { method: 'get', path: `${P}/targets.csv` },
  { method: 'put', path: `${P}/targets/1`, body: {} },
  { method: 'delete', path: `${P}/targets/1` },
  { method: 'get', path: `${P}/targets/1/sky?nodeId=1` },
  { method: 'get', path: `${P}/targets/1/plan?nodeId=1` },
  { method: 'get', path: `${P}/plans` },
  { method: 'post', path: `${P}/plans/recompute` },
  { method: 'get', path: `${P}/readiness` },
  { method: 'post', path: `${P}/submit` },
  { method: 'post', path: `${P}/withdraw` },
  { method: 'get', path: `${P}/summary.pdf` },
];

const ALL_ROLES: Role[] = [...ROLES];

const ROUTES: RouteCase[] = [
  { method: 'get', path: '/api/nodes', allowed: 'signed-in' },
  { method: 'get', path: '/api/sites', allowed: 'signed-in' },
  { method: 'get', path: '/api/cycles', allowed: 'signed-in' },
  { method: 'post', path: '/api/sky-windows', body: { cycleId: 1, nodeIds: [1], targets: [{ ra: 1, dec: 1 }] }, allowed: 'signed-in' },
  { method: 'get', path: '/api/admin/accounts', allowed: ['administrator'] },
  { method: 'patch', path: '/api/admin/accounts/1', body: { disabled: false }, allowed: ['administrator'] },
  // Cycles: reads for everyone signed in (filtered by role), writes for facility managers.
  { method: 'get', path: '/api/cycles/99999999', allowed: 'signed-in' },
  { method: 'post', path: '/api/cycles', body: {}, allowed: ['facility_manager'] },
  { method: 'put', path: '/api/cycles/99999999', body: {}, allowed: ['facility_manager'] },
  // Proposals: creating one needs the proposer role; everything under /:id is for the team
  // (everyone else gets 404: see proposal-permissions.spec.ts for PI, co-I and outsiders).
  { method: 'get', path: '/api/proposals', allowed: 'signed-in' },
  { method: 'post', path: '/api/proposals', body: {}, allowed: ['proposer'] },
  ...PROPOSAL_ROUTES.map((r) => ({ ...r, allowed: 'signed-in' as const })),
  { method: 'post', path: '/api/invitations/accept', body: { token: 'x'.repeat(43) }, allowed: 'signed-in' },
  { method: 'get', path: '/api/target-lists/example.csv', allowed: 'signed-in' },
];

let h: Harness;
const browsers = new Map<Role, Browser>();
beforeAll(async () => {
  h = await startHarness();
  for (const role of ALL_ROLES) browsers.set(role, (await signedIn(h, [role])).browser);
});
afterAll(() => h.close());

const call = (b: Browser, r: RouteCase) => (r.method === 'get' ? b.get(r.path) : r.method === 'delete' ? b.delete(r.path) : b[r.method](r.path, r.body));

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
