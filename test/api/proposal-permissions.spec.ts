import type { Role } from '@spincycle/shared/accounts/roles';
import { Browser, signedIn, startHarness, type Harness } from '../support/api-harness';
import {
  addCoInvestigator,
  createTestNetwork,
  CSV_HEADER,
  csvLine,
  proposerWithDraft,
  target,
  tinyPdf,
  uploadFile,
  type TestNetwork,
} from './support/proposal-kit';

/**
 * Who may do what on a proposal: its PI, an accepted co-investigator, and everyone else
 * (another proposer, a reviewer, a facility manager, an administrator: 404, as if the
 * proposal did not exist), and nobody signed in (401). Each route runs on a fresh proposal
 * with a target and a justification, so that allowed calls reach their business rules.
 */
type Who = 'team' | 'pi';
interface Fixture {
  id: number;
  targetId: number;
  coiMemberId: number;
}
interface Row {
  name: string;
  who: Who;
  call: (b: Browser, f: Fixture) => Promise<{ status: number; body: { code?: string } }>;
}

let uploads = 0;
const csv = () => [CSV_HEADER, csvLine(`Star M-${++uploads}`)].join('\n');
const ROWS: Row[] = [
  { name: 'GET /:id', who: 'team', call: (b, f) => b.get(`/api/proposals/${f.id}`) },
  { name: 'PATCH /:id', who: 'team', call: (b, f) => b.patch(`/api/proposals/${f.id}`, { version: 1, title: 'Edited' }) },
  { name: 'DELETE /:id', who: 'pi', call: (b, f) => b.delete(`/api/proposals/${f.id}`) },
  {
    name: 'POST /:id/members',
    who: 'pi',
    call: (b, f) => b.post(`/api/proposals/${f.id}/members`, { email: 'perm-invitee@test.example' }),
  },
  { name: 'DELETE /:id/members/:memberId', who: 'pi', call: (b, f) => b.delete(`/api/proposals/${f.id}/members/${f.coiMemberId}`) },
  {
    name: 'PUT /:id/justification',
    who: 'team',
    call: (b, f) => uploadFile(b, 'put', `/api/proposals/${f.id}/justification`, tinyPdf(), 'j.pdf'),
  },
  { name: 'GET /:id/justification', who: 'team', call: (b, f) => b.get(`/api/proposals/${f.id}/justification`) },
  { name: 'GET /:id/targets', who: 'team', call: (b, f) => b.get(`/api/proposals/${f.id}/targets`) },
  { name: 'POST /:id/targets', who: 'team', call: (b, f) => b.post(`/api/proposals/${f.id}/targets`, target()) },
  {
    name: 'POST /:id/targets/upload',
    who: 'team',
    call: (b, f) => uploadFile(b, 'post', `/api/proposals/${f.id}/targets/upload?mode=append`, csv(), 't.csv'),
  },
  { name: 'GET /:id/targets.csv', who: 'team', call: (b, f) => b.get(`/api/proposals/${f.id}/targets.csv`) },
  {
    name: 'PUT /:id/targets/:targetId',
    who: 'team',
    call: (b, f) => b.put(`/api/proposals/${f.id}/targets/${f.targetId}`, { version: 1, target: target() }),
  },
  { name: 'DELETE /:id/targets/:targetId', who: 'team', call: (b, f) => b.delete(`/api/proposals/${f.id}/targets/${f.targetId}`) },
  {
    name: 'GET /:id/targets/:targetId/sky',
    who: 'team',
    call: (b, f) => b.get(`/api/proposals/${f.id}/targets/${f.targetId}/sky?nodeId=${net.nodeIds[0]}`),
  },
  {
    name: 'GET /:id/targets/:targetId/plan',
    who: 'team',
    call: (b, f) => b.get(`/api/proposals/${f.id}/targets/${f.targetId}/plan?nodeId=${net.nodeIds[0]}`),
  },
  { name: 'GET /:id/plans', who: 'team', call: (b, f) => b.get(`/api/proposals/${f.id}/plans`) },
  { name: 'POST /:id/plans/recompute', who: 'team', call: (b, f) => b.post(`/api/proposals/${f.id}/plans/recompute`) },
  { name: 'GET /:id/readiness', who: 'team', call: (b, f) => b.get(`/api/proposals/${f.id}/readiness`) },
  { name: 'POST /:id/submit', who: 'pi', call: (b, f) => b.post(`/api/proposals/${f.id}/submit`) },
  { name: 'POST /:id/withdraw', who: 'pi', call: (b, f) => b.post(`/api/proposals/${f.id}/withdraw`) },
  { name: 'GET /:id/summary.pdf', who: 'team', call: (b, f) => b.get(`/api/proposals/${f.id}/summary.pdf`) },
];

const OUTSIDERS: Role[] = ['proposer', 'reviewer', 'facility_manager', 'administrator'];
/** Statuses that show the call got past authorization (business rules may still refuse it). */
const PASSED = [200, 201, 202, 204, 409, 422];
/** Past authorization: a business answer, or a 404 about something inside the proposal (a target deleted by the previous caller). */
const passed = (res: { status: number; body: { code?: string } }) =>
  PASSED.includes(res.status) || (res.status === 404 && res.body.code !== 'proposal_not_found');

let h: Harness;
let net: TestNetwork;
const outsiders = new Map<Role, Browser>();
beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'PM');
  for (const role of OUTSIDERS) outsiders.set(role, (await signedIn(h, [role])).browser);
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

async function freshProposal() {
  const { browser: pi, proposal } = await proposerWithDraft(h, net.cycleId, 'Permission check');
  await pi.patch(`/api/proposals/${proposal.id}`, { version: 1, nodeIds: [net.nodeIds[0]] });
  const t = await pi.post(`/api/proposals/${proposal.id}/targets`, target());
  await uploadFile(pi, 'put', `/api/proposals/${proposal.id}/justification`, tinyPdf(), 'j.pdf');
  const coi = await addCoInvestigator(h, pi, proposal.id);
  return { pi, coi: coi.browser, fixture: { id: proposal.id, targetId: t.body.id, coiMemberId: coi.memberId } };
}

describe.each(ROWS)('$name', (row) => {
  it(`outsiders get 404, signed out 401, the co-I ${row.who === 'pi' ? '403 pi_only' : 'passes'}, the PI passes`, async () => {
    const { pi, coi, fixture } = await freshProposal();
    for (const role of OUTSIDERS) {
      const res = await row.call(outsiders.get(role)!, fixture);
      expect({ role, status: res.status, code: res.body.code }).toEqual({ role, status: 404, code: 'proposal_not_found' });
    }
    const anonymous = await row.call(new Browser(h), fixture);
    expect(anonymous.status).toBe(401);
    const byCoi = await row.call(coi, fixture);
    if (row.who === 'pi') {
      expect(byCoi.status).toBe(403);
      expect(byCoi.body.code).toBe('pi_only');
    } else {
      expect({ status: byCoi.status, passed: passed(byCoi) }).toEqual({ status: byCoi.status, passed: true });
    }
    const byPi = await row.call(pi, fixture);
    expect({ status: byPi.status, passed: passed(byPi) }).toEqual({ status: byPi.status, passed: true });
  });
});

describe('invitations and the example list', () => {
  it('POST /api/invitations/accept and GET /api/target-lists/example.csv need a session only', async () => {
    expect((await new Browser(h).post('/api/invitations/accept', { token: 'x'.repeat(43) })).status).toBe(401);
    expect((await new Browser(h).get('/api/target-lists/example.csv')).status).toBe(401);
    expect((await outsiders.get('reviewer')!.get('/api/target-lists/example.csv')).status).toBe(200);
  });
});
