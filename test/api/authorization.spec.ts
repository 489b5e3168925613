import { ROLES, type Role } from '@spincycle/shared/accounts/roles';
import { enqueueMail } from '../../server/src/mail/outbox';
import { Browser, createAccount, signedIn, startHarness, TEST_PASSWORD, type Harness } from '../support/api-harness';
import {
  createTestNetwork,
  CSV_HEADER,
  csvLine,
  makeReady,
  proposerWithDraft,
  target,
  tinyPdf,
  uploadFile,
  type TestNetwork,
} from './support/proposal-kit';

/**
 * The authorization matrix: every route of server/src/features/**\/*-routes.ts, called signed
 * out and as each role, with the exact status expected. Allowed callers get the route's own
 * success status (each call is given the fixtures it needs to succeed: a deleted or renamed
 * route fails here, it does not pass as a 404); refused callers get the exact refusal:
 * 401 `not_signed_in` signed out, 403 `forbidden` for a role the route does not take, and for
 * the routes under /api/proposals/:id (for the proposal's team only) 404 `proposal_not_found`
 * for everyone outside the team and 403 `pi_only` for a co-investigator on a PI-only route.
 * Later features add their rows here.
 */
type Res = { status: number; body: { code?: string } & Record<string, unknown> };

/** A route open to everyone (signed out too), or for signed-in people with (any of) these roles. */
type Access = 'public' | 'signed-in' | Role[];
interface RouteCase {
  name: string;
  access: Access;
  /** The route's success status. */
  ok: number;
  /** Fresh fixtures for one call, made before it (signed-in callers get their own browser). */
  call: (b: Browser) => Promise<Res>;
}

/** Routes under /api/proposals/:id: the team may call them (`pi`: only the PI; a co-I gets 403 pi_only). */
interface ProposalRouteCase {
  name: string;
  who: 'team' | 'pi';
  ok: number;
  /** Once per row, after the proposal is ready (plans computed) and before any call (e.g. submit it, to test withdraw). */
  before?: (f: ProposalFixture) => Promise<void>;
  call: (b: Browser, f: ProposalFixture) => Promise<Res>;
}

interface ProposalFixture {
  id: number;
  pi: Browser;
  /** A target with a computed plan on `nodeId`. */
  targetId: number;
  nodeId: number;
  /** Active co-investigators, one per role. */
  cois: Map<Role, { browser: Browser; memberId: number }>;
}

const ALL_ROLES: Role[] = [...ROLES];

let h: Harness;
let net: TestNetwork;
let uploads = 0;
const createdCycles: number[] = [];
const queue = 'proposal-plans-authorization';

const day = 86400_000;
function cycleInput(code: string) {
  const now = Date.now();
  return {
    code,
    title: 'Authorization matrix cycle',
    callOpensAt: new Date(now - day).toISOString(),
    callClosesAt: new Date(now + 10 * day).toISOString(),
    campaignStart: new Date(now + 40 * day).toISOString().slice(0, 10),
    campaignEnd: new Date(now + 100 * day).toISOString().slice(0, 10),
    anonymousReview: true,
    categories: ['Open clusters'],
    nodes: [{ nodeId: net.nodeIds[0], nodeHoursAvailable: 10 }],
  };
}
let cycleCodes = 0;
const nextCycleCode = () => `${net.tag}A${cycleCodes++}`;

/** An invitation link token held by nobody yet (sent by a fresh PI to an address with an account). */
async function invitationToken(): Promise<string> {
  const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, 'Invitation for the matrix');
  const invitee = await createAccount(h, ['proposer']);
  const res = await pi.post(`/api/proposals/${proposal.id}/members`, { email: invitee.email });
  if (res.status !== 201) throw new Error(`invite failed: ${res.status} ${JSON.stringify(res.body)}`);
  const mail = await h.mail.waitFor((m) => m.to.includes(invitee.email));
  return /invitations\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];
}

/** A password-reset token of a fresh account. */
async function resetToken(): Promise<string> {
  const account = await createAccount(h, ['proposer']);
  const res = await new Browser(h).post('/api/auth/password-reset', { email: account.email });
  if (res.status !== 202) throw new Error(`reset request failed: ${res.status}`);
  const mail = await h.mail.waitFor((m) => m.to.includes(account.email));
  return /reset-password\?token=([A-Za-z0-9_-]+)/.exec(mail.text)![1];
}

/** A mail of the outbox that failed (written as its feature would, then marked failed). */
async function failedMail(): Promise<number> {
  const db = h.created.ctx.db;
  const id = await db.transaction((trx) =>
    enqueueMail(trx, { to: `matrix-outbox-${uploads++}@test.example`, subject: 'Matrix mail', text: 'A mail of the matrix.' }, 'welcome'),
  );
  await db('mail_outbox').where({ id }).update({ state: 'failed', attempts: 8, last_error: 'The mail server did not answer in time.' });
  return id;
}

const ROUTES: RouteCase[] = [
  // health-routes.ts
  { name: 'GET /api/health', access: 'public', ok: 200, call: (b) => b.get('/api/health') },
  // auth-routes.ts: open to everyone (the answers never depend on who asks).
  { name: 'GET /api/auth/session', access: 'public', ok: 200, call: (b) => b.get('/api/auth/session') },
  {
    name: 'POST /api/auth/sign-in',
    access: 'public',
    ok: 200,
    call: async (b) => b.post('/api/auth/sign-in', { email: (await createAccount(h, ['proposer'])).email, password: TEST_PASSWORD }),
  },
  { name: 'POST /api/auth/sign-out', access: 'public', ok: 204, call: (b) => b.post('/api/auth/sign-out') },
  {
    name: 'POST /api/auth/sign-up',
    access: 'public',
    ok: 202,
    call: (b) =>
      b.post('/api/auth/sign-up', {
        email: `matrix-${Date.now()}-${uploads++}@test.example`,
        password: 'quiet harbour lantern 42',
        displayName: 'Matrix Tester',
      }),
  },
  {
    name: 'POST /api/auth/password-reset',
    access: 'public',
    ok: 202,
    call: (b) => b.post('/api/auth/password-reset', { email: 'nobody-matrix@test.example' }),
  },
  {
    name: 'POST /api/auth/password-reset/confirm',
    access: 'public',
    ok: 204,
    call: async (b) => b.post('/api/auth/password-reset/confirm', { token: await resetToken(), password: 'quiet harbour lantern 43' }),
  },
  // facility-routes.ts
  { name: 'GET /api/nodes', access: 'signed-in', ok: 200, call: (b) => b.get('/api/nodes') },
  { name: 'GET /api/sites', access: 'signed-in', ok: 200, call: (b) => b.get('/api/sites') },
  // A node's external rate: facility managers (null is the node's own default, so nothing else changes).
  {
    name: 'PATCH /api/nodes/:id',
    access: ['facility_manager'],
    ok: 200,
    call: (b) => b.patch(`/api/nodes/${net.nodeIds[0]}`, { externalRateMinorPerHour: null }),
  },
  // sky-windows-routes.ts
  {
    name: 'POST /api/sky-windows',
    access: 'signed-in',
    ok: 200,
    call: (b) =>
      b.post('/api/sky-windows', {
        cycleId: net.cycleId,
        nodeIds: [net.nodeIds[0]],
        targets: [{ name: 'Star W-1', ra: 163.2, dec: 31.6 }],
      }),
  },
  // account-routes.ts: administrators only.
  { name: 'GET /api/admin/accounts', access: ['administrator'], ok: 200, call: (b) => b.get('/api/admin/accounts') },
  {
    name: 'PATCH /api/admin/accounts/:id',
    access: ['administrator'],
    ok: 200,
    call: async (b) => b.patch(`/api/admin/accounts/${(await createAccount(h, ['proposer'])).id}`, { disabled: false }),
  },
  // mail-outbox-routes.ts: administrators only.
  { name: 'GET /api/admin/mail-outbox', access: ['administrator'], ok: 200, call: (b) => b.get('/api/admin/mail-outbox?state=all') },
  {
    name: 'POST /api/admin/mail-outbox/:id/resend',
    access: ['administrator'],
    ok: 200,
    call: async (b) => b.post(`/api/admin/mail-outbox/${await failedMail()}/resend`),
  },
  // cycle-routes.ts: reads for everyone signed in (an open call is visible to all), writes for facility managers.
  { name: 'GET /api/cycles', access: 'signed-in', ok: 200, call: (b) => b.get('/api/cycles') },
  { name: 'GET /api/cycles/:id', access: 'signed-in', ok: 200, call: (b) => b.get(`/api/cycles/${net.cycleId}`) },
  {
    name: 'POST /api/cycles',
    access: ['facility_manager'],
    ok: 201,
    call: async (b) => {
      const res = await b.post('/api/cycles', cycleInput(nextCycleCode()));
      if (res.status === 201) createdCycles.push(res.body.id);
      return res;
    },
  },
  {
    name: 'PUT /api/cycles/:id',
    access: ['facility_manager'],
    ok: 200,
    call: async (b) => {
      const code = nextCycleCode();
      const [{ id }] = await h.created.ctx
        .db('cycles')
        .insert({
          code,
          title: 'To be edited',
          call_opens_at: new Date(Date.now() - day),
          call_closes_at: new Date(Date.now() + 10 * day),
          campaign_start: new Date(Date.now() + 40 * day).toISOString().slice(0, 10),
          campaign_end: new Date(Date.now() + 100 * day).toISOString().slice(0, 10),
          categories: ['Open clusters'],
        })
        .returning('id');
      await h.created.ctx.db('cycle_nodes').insert({ cycle_id: id, node_id: net.nodeIds[0], node_hours_available: 10 });
      createdCycles.push(id);
      return b.put(`/api/cycles/${id}`, { version: 1, cycle: { ...cycleInput(code), title: 'Edited by the matrix' } });
    },
  },
  // The proposals submitted to a cycle, with the pressure per node: facility managers only.
  {
    name: 'GET /api/cycles/:id/proposals',
    access: ['facility_manager'],
    ok: 200,
    call: (b) => b.get(`/api/cycles/${net.cycleId}/proposals`),
  },
  // proposal-routes.ts outside /:id
  { name: 'GET /api/proposals', access: 'signed-in', ok: 200, call: (b) => b.get('/api/proposals') },
  {
    name: 'POST /api/proposals',
    access: ['proposer'],
    ok: 201,
    call: (b) => b.post('/api/proposals', { cycleId: net.cycleId, title: 'Matrix proposal' }),
  },
  {
    name: 'POST /api/invitations/accept',
    access: 'signed-in',
    ok: 200,
    call: async (b) => b.post('/api/invitations/accept', { token: await invitationToken() }),
  },
  { name: 'GET /api/target-lists/example.csv', access: 'signed-in', ok: 200, call: (b) => b.get('/api/target-lists/example.csv') },
];

const base = (f: ProposalFixture) => `/api/proposals/${f.id}`;
const PROPOSAL_ROUTES: ProposalRouteCase[] = [
  { name: 'GET /:id', who: 'team', ok: 200, call: (b, f) => b.get(base(f)) },
  {
    name: 'PATCH /:id',
    who: 'team',
    ok: 200,
    call: async (b, f) => b.patch(base(f), { version: (await f.pi.get(base(f))).body.version, title: `Edited ${uploads++}` }),
  },
  { name: 'DELETE /:id', who: 'pi', ok: 204, call: (b, f) => b.delete(base(f)) },
  {
    name: 'POST /:id/members',
    who: 'pi',
    ok: 201,
    call: (b, f) => b.post(`${base(f)}/members`, { email: `matrix-invitee-${uploads++}@test.example` }),
  },
  {
    name: 'DELETE /:id/members/:memberId',
    who: 'pi',
    ok: 204,
    call: (b, f) => b.delete(`${base(f)}/members/${f.cois.get('proposer')!.memberId}`),
  },
  {
    name: 'PUT /:id/justification',
    who: 'team',
    ok: 200,
    call: (b, f) => uploadFile(b, 'put', `${base(f)}/justification`, tinyPdf(), 'j.pdf'),
  },
  { name: 'GET /:id/justification', who: 'team', ok: 200, call: (b, f) => b.get(`${base(f)}/justification`) },
  { name: 'GET /:id/targets', who: 'team', ok: 200, call: (b, f) => b.get(`${base(f)}/targets`) },
  { name: 'POST /:id/targets', who: 'team', ok: 201, call: (b, f) => b.post(`${base(f)}/targets`, target()) },
  {
    name: 'POST /:id/targets/upload',
    who: 'team',
    ok: 200,
    call: (b, f) =>
      uploadFile(b, 'post', `${base(f)}/targets/upload?mode=append`, [CSV_HEADER, csvLine(`Star AZ-${++uploads}`)].join('\n'), 't.csv'),
  },
  { name: 'GET /:id/targets.csv', who: 'team', ok: 200, call: (b, f) => b.get(`${base(f)}/targets.csv`) },
  {
    name: 'PUT /:id/targets/:targetId',
    who: 'team',
    ok: 200,
    call: async (b, f) => {
      const t = (await f.pi.get(`${base(f)}/targets`)).body.find((x: { id: number }) => x.id === f.targetId);
      return b.put(`${base(f)}/targets/${f.targetId}`, { version: t.version, target: target() });
    },
  },
  {
    name: 'DELETE /:id/targets/:targetId',
    who: 'team',
    ok: 204,
    call: async (b, f) => {
      const added = await f.pi.post(`${base(f)}/targets`, target());
      return b.delete(`${base(f)}/targets/${added.body.id}`);
    },
  },
  {
    name: 'GET /:id/targets/:targetId/sky',
    who: 'team',
    ok: 200,
    call: (b, f) => b.get(`${base(f)}/targets/${f.targetId}/sky?nodeId=${f.nodeId}`),
  },
  {
    name: 'GET /:id/targets/:targetId/plan',
    who: 'team',
    ok: 200,
    call: (b, f) => b.get(`${base(f)}/targets/${f.targetId}/plan?nodeId=${f.nodeId}`),
  },
  { name: 'GET /:id/plans', who: 'team', ok: 200, call: (b, f) => b.get(`${base(f)}/plans`) },
  { name: 'GET /:id/plans/status', who: 'team', ok: 200, call: (b, f) => b.get(`${base(f)}/plans/status`) },
  { name: 'GET /:id/plans/markers', who: 'team', ok: 200, call: (b, f) => b.get(`${base(f)}/plans/markers`) },
  { name: 'POST /:id/plans/recompute', who: 'team', ok: 202, call: (b, f) => b.post(`${base(f)}/plans/recompute`) },
  { name: 'GET /:id/readiness', who: 'team', ok: 200, call: (b, f) => b.get(`${base(f)}/readiness`) },
  { name: 'POST /:id/submit', who: 'pi', ok: 200, call: (b, f) => b.post(`${base(f)}/submit`) },
  {
    name: 'POST /:id/withdraw',
    who: 'pi',
    ok: 200,
    before: async (f) => {
      const res = await f.pi.post(`${base(f)}/submit`);
      if (res.status !== 200) throw new Error(`submit failed: ${res.status} ${JSON.stringify(res.body)}`);
    },
    call: (b, f) => b.post(`${base(f)}/withdraw`),
  },
  { name: 'GET /:id/summary.pdf', who: 'team', ok: 200, call: (b, f) => b.get(`${base(f)}/summary.pdf`) },
];

beforeAll(async () => {
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000, PLAN_QUEUE: queue });
  net = await createTestNetwork(h, 'AZ');
});
afterAll(async () => {
  await h.created.ctx.db.raw('DELETE FROM pgboss.job WHERE name = ?', [queue]).catch(() => undefined);
  await h.created.ctx.db('proposals').whereIn('cycle_id', createdCycles).del();
  await h.created.ctx.db('cycles').whereIn('id', createdCycles).del();
  await net.cleanUp();
  await h.close();
});

/** What a call answered (the error code of a refusal), in a form whose mismatch names the caller. */
const seen = (who: string, res: Res) => ({ who, status: res.status, code: res.status >= 400 ? res.body?.code : undefined });

describe.each(ROUTES)('$name', (r) => {
  if (r.access === 'public') {
    it(`answers ${r.ok} signed out and for every role`, async () => {
      const anonymous = await r.call(new Browser(h));
      expect(seen('signed out', anonymous)).toEqual(seen('signed out', { status: r.ok, body: { code: undefined } }));
      for (const role of ALL_ROLES) {
        const res = await r.call((await signedIn(h, [role])).browser);
        expect(seen(role, res)).toEqual(seen(role, { status: r.ok, body: { code: undefined } }));
      }
    });
    return;
  }

  it('answers 401 not_signed_in without a session', async () => {
    const res = await r.call(new Browser(h));
    expect(seen('signed out', res)).toEqual({ who: 'signed out', status: 401, code: 'not_signed_in' });
  });

  it.each(ALL_ROLES)(`as %s: allowed roles get ${r.ok}, others 403 forbidden`, async (role) => {
    const res = await r.call((await signedIn(h, [role])).browser);
    const allowed = r.access === 'signed-in' || r.access.includes(role);
    if (allowed) expect(seen(role, res)).toEqual({ who: role, status: r.ok, code: undefined });
    else expect(seen(role, res)).toEqual({ who: role, status: 403, code: 'forbidden' });
  });
});

/** A ready draft (abstract, category, node, two targets, justification, plans computed) with a co-I of every role. */
async function proposalFixture(): Promise<ProposalFixture> {
  const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, 'Matrix proposal');
  const nodeId = net.nodeIds[0];
  await makeReady(h, pi, proposal.id, [nodeId]);
  const cois = new Map<Role, { browser: Browser; memberId: number }>();
  for (const role of ALL_ROLES) {
    const account = await createAccount(h, [role]);
    const invite = await pi.post(`/api/proposals/${proposal.id}/members`, { email: account.email });
    if (invite.status !== 201) throw new Error(`invite failed: ${invite.status} ${JSON.stringify(invite.body)}`);
    const mail = await h.mail.waitFor((m) => m.to.includes(account.email));
    const token = /invitations\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];
    const browser = await new Browser(h).signIn(account.email);
    const accepted = await browser.post('/api/invitations/accept', { token });
    if (accepted.status !== 200) throw new Error(`accept failed: ${accepted.status} ${JSON.stringify(accepted.body)}`);
    cois.set(role, { browser, memberId: invite.body.id });
  }
  const [first] = (await pi.get(`/api/proposals/${proposal.id}/targets`)).body;
  return { id: proposal.id, pi, targetId: first.id, nodeId, cois };
}

describe.each(PROPOSAL_ROUTES)('/api/proposals$name', (r) => {
  it(`signed out 401; every role outside the team 404 proposal_not_found; a co-I of every role ${r.who === 'pi' ? '403 pi_only' : r.ok}; the PI ${r.ok}`, async () => {
    const f = await proposalFixture();
    if (r.before) await r.before(f);

    const anonymous = await r.call(new Browser(h), f);
    expect(seen('signed out', anonymous)).toEqual({ who: 'signed out', status: 401, code: 'not_signed_in' });
    for (const role of ALL_ROLES) {
      const res = await r.call((await signedIn(h, [role])).browser, f);
      expect(seen(`${role} outside the team`, res)).toEqual({ who: `${role} outside the team`, status: 404, code: 'proposal_not_found' });
    }
    for (const role of ALL_ROLES) {
      const res = await r.call(f.cois.get(role)!.browser, f);
      const who = `${role} as co-I`;
      if (r.who === 'pi') expect(seen(who, res)).toEqual({ who, status: 403, code: 'pi_only' });
      else expect(seen(who, res)).toEqual({ who, status: r.ok, code: undefined });
    }
    const byPi = await r.call(f.pi, f);
    expect(seen('PI', byPi)).toEqual({ who: 'PI', status: r.ok, code: undefined });
  }, 30_000);
});

describe('coverage', () => {
  it('the matrix lists every route mounted by server/src/features/**/*-routes.ts', async () => {
    const { readdirSync, readFileSync } = await import('node:fs');
    const path = await import('node:path');
    const root = path.resolve(__dirname, '../../server/src/features');
    const mounts: Record<string, string> = {};
    const appSource = readFileSync(path.resolve(__dirname, '../../server/src/app.ts'), 'utf8');
    // `api` is mounted at /api; `app` mounts are absolute.
    for (const m of appSource.matchAll(/(api|app)\.use\('([^']+)', (create\w+Routes)\(/g))
      mounts[m[3]] = m[1] === 'app' ? m[2] : `/api${m[2] === '/' ? '' : m[2]}`;
    // Every *-routes.ts under features/, sub-features (features/proposals/targets/…) included.
    const routeFiles = (readdirSync(root, { recursive: true }) as string[]).filter((f) => f.endsWith('-routes.ts'));
    // Each exported factory, with the routes registered in its body and the routers it mounts
    // itself (`router.use(createXRoutes(ctx))`, optionally under a path).
    const factories = new Map<string, string>();
    const parents = new Map<string, { parent: string; prefix: string }>();
    for (const file of routeFiles) {
      const source = readFileSync(path.join(root, file), 'utf8');
      for (const fn of source.split(/export function /).slice(1)) {
        const name = /^(create\w+Routes)/.exec(fn)?.[1];
        if (!name) continue;
        factories.set(name, fn);
        for (const m of fn.matchAll(/router\.use\((?:'([^']*)', )?(create\w+Routes)\(/g))
          parents.set(m[2], { parent: name, prefix: m[1] ?? '' });
      }
    }
    const mountOf = (name: string, depth = 0): string => {
      if (mounts[name]) return mounts[name];
      const p = parents.get(name);
      if (!p || depth > 5) return `(${name} not mounted in app.ts)`;
      return `${mountOf(p.parent, depth + 1)}${p.prefix === '/' ? '' : p.prefix}`;
    };
    const found: string[] = [];
    for (const [name, fn] of factories) {
      const mount = mountOf(name);
      for (const m of fn.matchAll(/router\.(get|post|put|patch|delete)\('([^']*)'/g)) {
        const full = `${mount}${m[2] === '/' ? '' : m[2]}`;
        found.push(`${m[1].toUpperCase()} ${full}`);
      }
    }
    const listed = new Set([
      ...ROUTES.map((r) => r.name),
      ...PROPOSAL_ROUTES.map((r) => {
        const [method, rest] = r.name.split(' ');
        return `${method} /api/proposals${rest}`;
      }),
    ]);
    // Review's, awards' and night plans' routes have their own matrices (test/api/review-*-permissions.spec.ts,
    // test/api/awards-permissions.spec.ts, test/api/night-plans-permissions.spec.ts: reviewers
    // assigned, conflicted, chairs and teams need fixtures of their own; the night plans' calendar
    // feed, /api/calendar-feeds, needs a link made by a manager; billing, test/api/billing-permissions.spec.ts,
    // needs invoices and the payment fake; its webhook is checked by signature in billing.spec.ts;
    // returned photometry, test/api/photometry-permissions.spec.ts, needs an awarded program); each path must appear
    // there, with its parameters written as `:name` or as a template value.
    const reviewMatrices = readdirSync(__dirname)
      .filter((f) => /^(review|awards)-.*-permissions\.spec\.ts$|^(awards|night-plans|billing|photometry)-permissions\.spec\.ts$/.test(f))
      .map((f) => readFileSync(path.join(__dirname, f), 'utf8'))
      .join('\n');
    const inReviewMatrices = (route: string) => {
      const pathPart = route.split(' ')[1];
      const pattern = pathPart
        .split(/(:\w+)/)
        .map((piece) => (piece.startsWith(':') ? '(?::\\w+|\\$\\{[^}]+\\})' : piece.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')))
        .join('');
      return new RegExp(`${pattern}(?![\\w/.])`).test(reviewMatrices);
    };
    const review = found.filter((r) =>
      /^\/api\/(review|awards|night-plans|calendar-feeds|billing)\/|^\/api\/proposals\/:id\/photometry(\/|$)/.test(r.split(' ')[1]),
    );
    expect(review.filter((r) => !inReviewMatrices(r))).toEqual([]);
    const others = found.filter((r) => !review.includes(r));
    expect(others.length).toBeGreaterThan(30);
    expect([...new Set(others)].sort()).toEqual([...listed].sort());
  });
});

describe('unknown API paths', () => {
  it('answer 404 in the API error shape, never the single-page app', async () => {
    const res = await new Browser(h).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ code: 'not_found', message: expect.stringContaining('/api/no-such-thing') });
  });
});
