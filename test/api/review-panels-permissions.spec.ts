import { ROLES, type Role } from '@spincycle/shared/accounts/roles';
import { Browser, signedIn, startHarness, type Harness } from '../support/api-harness';
import { createTestNetwork, type TestNetwork } from './support/proposal-kit';
import { closeCall, insertProposal, insertReviewer } from '../../server/src/features/review/panels/testing/panel-fixtures';

/**
 * The authorization matrix of review's panels routes (server/src/features/review/panels/
 * panel-routes.ts), in the style of authorization.spec.ts: every route called signed out and
 * with each single role, with the exact status expected. The manager's routes answer the route's
 * own success status to facility managers (each call gets fresh fixtures, so a renamed route
 * fails here rather than passing as a 404), 401 `not_signed_in` signed out and 403 `forbidden`
 * to every other role. The team-reviewer routes answer 404 `proposal_not_found` to everyone
 * outside the team, 200 to the PI and 403 `pi_only` to a co-investigator on the write. The
 * expertise routes are for reviewers.
 */
type Res = { status: number; body: { code?: string } & Record<string, unknown> };
interface RouteCase {
  name: string;
  roles: Role[];
  ok: number;
  call: (b: Browser) => Promise<Res>;
}

let h: Harness;
let net: TestNetwork;
let counter = 0;
const browsers = new Map<Role, Browser>();

beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'RP');
  for (const role of ROLES) browsers.set(role, (await signedIn(h, [role])).browser);
}, 60_000);

afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

const db = () => h.created.ctx.db;

/** A closed cycle (panel or distributed review). */
async function closedCycle(mode: 'panel' | 'distributed' = 'panel', k = 1) {
  const cycle = await net.createCycle();
  await closeCall(h, cycle.id, { mode, k });
  return cycle;
}

/** A panel of a closed cycle with one member and one submitted proposal in it. */
async function panelFixture() {
  const cycle = await closedCycle();
  const reviewer = await insertReviewer(h);
  const proposal = await insertProposal(h, cycle.id, { state: 'in_review' });
  const [{ id }] = await db()('panels')
    .insert({ cycle_id: cycle.id, name: `Matrix panel ${counter++}`, chair_account_id: reviewer.id })
    .returning('id');
  await db()('panel_members').insert({ panel_id: id, account_id: reviewer.id });
  await db()('proposals').where({ id: proposal.id }).update({ panel_id: id });
  return { cycle, reviewer, proposal, panelId: id as number };
}

/** A distributed cycle with two submitted proposals, the first naming an outside reviewer. */
async function distributedFixture() {
  const cycle = await closedCycle('distributed');
  const reviewer = await insertReviewer(h);
  const a = await insertProposal(h, cycle.id);
  await insertProposal(h, cycle.id);
  await db()('team_reviewers').insert({ proposal_id: a.id, reviewer_account_id: reviewer.id });
  return cycle;
}

const M: Role[] = ['facility_manager'];

const ROUTES: RouteCase[] = [
  { name: 'GET /api/review/reviewers', roles: M, ok: 200, call: (b) => b.get('/api/review/reviewers') },
  {
    name: 'GET /api/review/cycles/:cycleId/settings',
    roles: M,
    ok: 200,
    call: async (b) => b.get(`/api/review/cycles/${(await closedCycle()).id}/settings`),
  },
  {
    name: 'PUT /api/review/cycles/:cycleId/settings',
    roles: M,
    ok: 200,
    call: async (b) =>
      b.put(`/api/review/cycles/${(await closedCycle()).id}/settings`, {
        reviewMode: 'panel',
        reviewersPerProposal: 2,
        reviewDeadline: new Date(Date.now() + 5 * 86400_000).toISOString(),
        setAsideLateTeams: false,
      }),
  },
  {
    name: 'GET /api/review/cycles/:cycleId/panels',
    roles: M,
    ok: 200,
    call: async (b) => b.get(`/api/review/cycles/${(await closedCycle()).id}/panels`),
  },
  {
    name: 'POST /api/review/cycles/:cycleId/panels',
    roles: M,
    ok: 201,
    call: async (b) => {
      const cycle = await closedCycle();
      const r = await insertReviewer(h);
      return b.post(`/api/review/cycles/${cycle.id}/panels`, { name: 'Matrix', memberIds: [r.id], chairId: r.id });
    },
  },
  {
    name: 'GET /api/review/cycles/:cycleId/proposals',
    roles: M,
    ok: 200,
    call: async (b) => b.get(`/api/review/cycles/${(await panelFixture()).cycle.id}/proposals`),
  },
  {
    name: 'POST /api/review/cycles/:cycleId/distribute',
    roles: M,
    ok: 200,
    call: async (b) => b.post(`/api/review/cycles/${(await distributedFixture()).id}/distribute`),
  },
  {
    name: 'GET /api/review/cycles/:cycleId/team-reviewers',
    roles: M,
    ok: 200,
    call: async (b) => b.get(`/api/review/cycles/${(await distributedFixture()).id}/team-reviewers`),
  },
  {
    name: 'GET /api/review/panels/:panelId',
    roles: M,
    ok: 200,
    call: async (b) => b.get(`/api/review/panels/${(await panelFixture()).panelId}`),
  },
  {
    name: 'PUT /api/review/panels/:panelId',
    roles: M,
    ok: 200,
    call: async (b) => {
      const f = await panelFixture();
      return b.put(`/api/review/panels/${f.panelId}`, { version: 1, name: 'Renamed', memberIds: [f.reviewer.id], chairId: f.reviewer.id });
    },
  },
  {
    name: 'DELETE /api/review/panels/:panelId',
    roles: M,
    ok: 204,
    call: async (b) => b.delete(`/api/review/panels/${(await panelFixture()).panelId}?version=1`),
  },
  {
    name: 'PUT /api/review/panels/:panelId/proposals',
    roles: M,
    ok: 200,
    call: async (b) => {
      const f = await panelFixture();
      const extra = await insertProposal(h, f.cycle.id);
      return b.put(`/api/review/panels/${f.panelId}/proposals`, { proposalIds: [f.proposal.id, extra.id] });
    },
  },
  {
    name: 'GET /api/review/panels/:panelId/matrix',
    roles: M,
    ok: 200,
    call: async (b) => b.get(`/api/review/panels/${(await panelFixture()).panelId}/matrix`),
  },
  {
    name: 'PUT /api/review/panels/:panelId/assignments',
    roles: M,
    ok: 200,
    call: async (b) => {
      const f = await panelFixture();
      return b.put(`/api/review/panels/${f.panelId}/assignments`, { proposalId: f.proposal.id, reviewerId: f.reviewer.id, assigned: true });
    },
  },
  {
    name: 'POST /api/review/panels/:panelId/assign-automatically',
    roles: M,
    ok: 200,
    call: async (b) => b.post(`/api/review/panels/${(await panelFixture()).panelId}/assign-automatically`),
  },
  { name: 'GET /api/review/me/panels', roles: ['reviewer'], ok: 200, call: (b) => b.get('/api/review/me/panels') },
  { name: 'GET /api/review/me/expertise', roles: ['reviewer'], ok: 200, call: (b) => b.get('/api/review/me/expertise') },
  {
    name: 'PUT /api/review/me/expertise',
    roles: ['reviewer'],
    ok: 200,
    call: (b) => b.put('/api/review/me/expertise', { expertise: ['Open clusters'] }),
  },
];

describe.each(ROUTES)('$name', (route) => {
  it('signed out: 401 not_signed_in', async () => {
    const res = await route.call(new Browser(h));
    expect([res.status, res.body.code]).toEqual([401, 'not_signed_in']);
  });
  it.each([...ROLES])('as %s', async (role) => {
    const res = await route.call(browsers.get(role)!);
    if (route.roles.includes(role)) expect(res.status).toBe(route.ok);
    else expect([res.status, res.body.code]).toEqual([403, 'forbidden']);
  });
});

describe.each([
  { method: 'get' as const, name: 'GET /api/review/proposals/:proposalId/team-reviewer' },
  { method: 'put' as const, name: 'PUT /api/review/proposals/:proposalId/team-reviewer' },
])('$name', ({ method }) => {
  async function call(b: Browser) {
    const cycle = await closedCycle('distributed');
    const proposal = await insertProposal(h, cycle.id);
    const reviewer = await insertReviewer(h);
    const url = `/api/review/proposals/${proposal.id}/team-reviewer`;
    const send = (who: Browser) => (method === 'get' ? who.get(url) : who.put(url, { email: reviewer.email }));
    return { proposal, send, res: await send(b) };
  }
  it('signed out: 401 not_signed_in', async () => {
    const { res } = await call(new Browser(h));
    expect([res.status, res.body.code]).toEqual([401, 'not_signed_in']);
  });
  it.each([...ROLES])('as %s outside the team: 404 proposal_not_found', async (role) => {
    const { res } = await call(browsers.get(role)!);
    expect([res.status, res.body.code]).toEqual([404, 'proposal_not_found']);
  });
  it('as the team’s PI: 200; as a co-investigator: 200 to read, 403 pi_only to write', async () => {
    const { proposal, send } = await call(new Browser(h));
    expect((await send(await proposal.signIn())).status).toBe(200);
    const coi = await signedIn(h, ['proposer']);
    await db()('proposal_members').insert({
      proposal_id: proposal.id,
      account_id: coi.account.id,
      email: coi.account.email,
      role: 'coi',
      accepted_at: new Date(),
    });
    const res = await send(coi.browser);
    if (method === 'get') expect(res.status).toBe(200);
    else expect([res.status, res.body.code]).toEqual([403, 'pi_only']);
  });
});
