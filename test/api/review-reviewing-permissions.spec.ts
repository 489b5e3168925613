/**
 * Who may use the reviewer's routes (/api/review/my…): every route against every kind of
 * caller. Signed out 401; a signed-in person without the reviewer role 403 (the proposal's own
 * PI, a facility manager, an administrator, a billing contact); a reviewer not assigned to the
 * proposal, and one who declared a conflict with it, 404 (the proposal's existence is not
 * revealed); the assigned reviewer 2xx.
 */
import type { Role } from '@spincycle/shared/accounts/roles';
import { Browser, signedIn, startHarness, type Harness } from '../support/api-harness';
import { createTestNetwork, type TestNetwork } from './support/proposal-kit';
import { assign, closeCall, submittedProposal } from '../../server/src/features/review/reviewing/testing/review-fixtures';

let h: Harness;
let net: TestNetwork;
let proposal: Awaited<ReturnType<typeof submittedProposal>>;

beforeAll(async () => {
  h = await startHarness();
  net = await createTestNetwork(h, 'RP');
  proposal = await submittedProposal(h, net.cycleId, [net.nodeIds[0]], 'Permissions proposal');
  await closeCall(h, net.cycleId);
}, 120_000);

afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

type Caller =
  'signedOut' | 'proposer' | 'notAssigned' | 'assigned' | 'conflicted' | 'facility_manager' | 'administrator' | 'billing_contact';

interface RouteCase {
  name: string;
  call(
    b: Browser,
    ids: { proposalId: number; cycleId: number; version: number; targetId: number; nodeId: number },
  ): Promise<{ status: number }>;
  /** The assigned reviewer's status (2xx). */
  ok: number;
  /** A reviewer with nothing to do with the proposal: 404 for proposal routes; the list is simply empty. */
  notAssigned: number;
  /** A reviewer conflicted with the proposal (and assigned nothing else). */
  conflicted: number;
}

const ROUTES: RouteCase[] = [
  { name: 'GET /api/review/my', call: (b) => b.get('/api/review/my'), ok: 200, notAssigned: 200, conflicted: 200 },
  {
    name: 'GET /api/review/my/:proposalId',
    call: (b, i) => b.get(`/api/review/my/${i.proposalId}`),
    ok: 200,
    notAssigned: 404,
    conflicted: 404,
  },
  {
    name: 'GET /api/review/my/:proposalId/justification',
    call: (b, i) => b.get(`/api/review/my/${i.proposalId}/justification`),
    ok: 200,
    notAssigned: 404,
    conflicted: 404,
  },
  {
    name: 'GET /api/review/my/:proposalId/targets/:targetId/sky',
    call: (b, i) => b.get(`/api/review/my/${i.proposalId}/targets/${i.targetId}/sky?nodeId=${i.nodeId}`),
    ok: 200,
    notAssigned: 404,
    conflicted: 404,
  },
  {
    name: 'PUT /api/review/my/:proposalId/review',
    call: (b, i) =>
      b.put(`/api/review/my/${i.proposalId}/review`, { version: i.version, grade: 6.1, strengths: '', weaknesses: '', committeeNote: '' }),
    ok: 200,
    notAssigned: 404,
    conflicted: 404,
  },
  {
    name: 'POST /api/review/my/submit',
    call: (b, i) => b.post('/api/review/my/submit', { cycleId: i.cycleId }),
    ok: 200,
    notAssigned: 404,
    conflicted: 404,
  },
  {
    name: 'POST /api/review/my/:proposalId/conflict',
    call: (b, i) => b.post(`/api/review/my/${i.proposalId}/conflict`, { reason: 'Same department as a co-investigator' }),
    ok: 201,
    notAssigned: 404,
    conflicted: 404,
  },
];

const OTHER_ROLES: Role[] = ['facility_manager', 'administrator', 'billing_contact'];

/** A browser for the caller, with the assignment (or conflict) the caller stands for, made fresh for each route. */
async function callerBrowser(caller: Caller): Promise<{ browser: Browser; version: number }> {
  switch (caller) {
    case 'signedOut':
      return { browser: new Browser(h), version: 1 };
    case 'proposer':
      return { browser: proposal.browser, version: 1 };
    case 'notAssigned':
      return { browser: (await signedIn(h, ['reviewer'])).browser, version: 1 };
    case 'assigned': {
      const r = await signedIn(h, ['reviewer']);
      // Graded, so that submitting all succeeds.
      await assign(h, proposal.id, r.account.id, { grade: 7 });
      return { browser: r.browser, version: 1 };
    }
    case 'conflicted': {
      const r = await signedIn(h, ['reviewer']);
      await assign(h, proposal.id, r.account.id, { grade: 7 });
      const declared = await r.browser.post(`/api/review/my/${proposal.id}/conflict`, { reason: 'Collaborator' });
      if (declared.status !== 201) throw new Error(`conflict failed: ${declared.status}`);
      return { browser: r.browser, version: 1 };
    }
    default:
      return { browser: (await signedIn(h, [caller])).browser, version: 1 };
  }
}

function expected(route: RouteCase, caller: Caller): number {
  switch (caller) {
    case 'signedOut':
      return 401;
    case 'assigned':
      return route.ok;
    case 'notAssigned':
      return route.notAssigned;
    case 'conflicted':
      return route.conflicted;
    default:
      return 403;
  }
}

const CALLERS: Caller[] = ['signedOut', 'proposer', 'notAssigned', 'assigned', 'conflicted', ...(OTHER_ROLES as Caller[])];

describe.each(ROUTES)('$name', (route) => {
  it.each(CALLERS)('%s', async (caller) => {
    const { browser, version } = await callerBrowser(caller);
    const targetId = (await h.created.ctx.db('targets').where({ proposal_id: proposal.id }).orderBy('id').first('id')).id as number;
    const res = await route.call(browser, { proposalId: proposal.id, cycleId: net.cycleId, version, targetId, nodeId: net.nodeIds[0] });
    expect({ caller, status: res.status }).toEqual({ caller, status: expected(route, caller) });
  });
});

it('the list of a conflicted reviewer does not contain the proposal', async () => {
  const { browser } = await callerBrowser('conflicted');
  const res = await browser.get('/api/review/my');
  expect(res.body.reviews).toEqual([]);
});

it('a nonexistent proposal answers the assigned kind of reviewer 404 too (same answer as not assigned)', async () => {
  const { browser } = await callerBrowser('assigned');
  const res = await browser.get('/api/review/my/2147483000');
  expect(res.status).toBe(404);
  expect(res.body.code).toBe('proposal_not_found');
});
