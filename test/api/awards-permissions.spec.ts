/**
 * Authorization matrix of the awards routes (/api/awards): every route × signed out (401),
 * a proposer not on the team, the team's PI, a reviewer of the panel, the panel's chair,
 * facility manager, administrator, billing contact. The manager's routes answer 403 to every
 * other role; the team's decision answers the team and managers once released, and 404 to
 * everyone else (and to everyone before the release). Fixtures are written straight into the
 * database (server/src/features/awards/testing/award-fixtures.ts).
 */
import type { Role } from '@spincycle/shared/accounts/roles';
import { Browser, startHarness, type Harness } from '../support/api-harness';
import { createTestNetwork, type TestNetwork } from './support/proposal-kit';
import {
  account,
  awardBody,
  browserFor,
  createAwardFixture,
  decideAll,
  type AwardFixture,
} from '../../server/src/features/awards/testing/award-fixtures';

let h: Harness;
let net: TestNetwork;
/** Decided and released. */
let released: AwardFixture;
/** Decided, not released. */
let pending: AwardFixture;
let managerBrowser: Browser;

async function fixture(release: boolean): Promise<AwardFixture> {
  const f = await createAwardFixture(h, net, { capacities: [100], proposals: [[[{ node: 0, hours: 10 }]]] });
  await decideAll(managerBrowser, h, f, { 0: { outcome: 'awarded', nodes: [{ nodeId: f.nodeIds[0], nodeHours: 10 }] } });
  if (release) {
    const res = await managerBrowser.post(`/api/awards/cycles/${f.cycleId}/release`, { confirm: true });
    if (res.status !== 200) throw new Error(`release failed: ${res.status} ${JSON.stringify(res.body)}`);
  }
  return f;
}

beforeAll(async () => {
  // Every viewer signs in once; the sign-in limiter would otherwise refuse the matrix's sign-ins.
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000 });
  net = await createTestNetwork(h, 'AP');
  managerBrowser = await browserFor(h, await account(h, ['facility_manager'], 'Matrix Manager'));
  released = await fixture(true);
  pending = await fixture(false);
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

type Who = 'signed out' | 'proposer not on the team' | 'team PI' | 'reviewer' | 'chair' | Role;
const WHO: Who[] = [
  'signed out',
  'proposer not on the team',
  'team PI',
  'reviewer',
  'chair',
  'facility_manager',
  'administrator',
  'billing_contact',
];

interface Case {
  name: string;
  method: 'get' | 'post' | 'put';
  path: (f: AwardFixture) => string;
  body?: (f: AwardFixture) => Promise<object> | object;
  /** Who gets the 2xx. */
  allowed: Who[];
  /** What the others (signed in) get: 403 for the manager's routes, 404 for the team's decision. */
  refused: 403 | 404;
  /** The fixture the call is made on; `fresh`: a new decided, unreleased one per allowed call. */
  on: 'released' | 'pending' | 'fresh';
}

const MANAGER: Who[] = ['facility_manager'];

const CASES: Case[] = [
  { name: 'GET /cycles', method: 'get', path: () => '/api/awards/cycles', allowed: MANAGER, refused: 403, on: 'pending' },
  {
    name: 'GET /cycles/:cycleId',
    method: 'get',
    path: (f) => `/api/awards/cycles/${f.cycleId}`,
    allowed: MANAGER,
    refused: 403,
    on: 'pending',
  },
  {
    name: 'PUT /proposals/:proposalId',
    method: 'put',
    path: (f) => `/api/awards/proposals/${f.proposalIds[0]}`,
    body: (f) => awardBody(h, f.proposalIds[0], { outcome: 'awarded', nodes: [{ nodeId: f.nodeIds[0], nodeHours: 10 }] }),
    allowed: MANAGER,
    refused: 403,
    on: 'pending',
  },
  {
    name: 'GET /cycles/:cycleId/audit',
    method: 'get',
    path: (f) => `/api/awards/cycles/${f.cycleId}/audit`,
    allowed: MANAGER,
    refused: 403,
    on: 'pending',
  },
  {
    name: 'POST /cycles/:cycleId/release',
    method: 'post',
    path: (f) => `/api/awards/cycles/${f.cycleId}/release`,
    body: () => ({ confirm: true }),
    allowed: MANAGER,
    refused: 403,
    on: 'fresh',
  },
  {
    name: 'GET /proposals/:proposalId/decision (released)',
    method: 'get',
    path: (f) => `/api/awards/proposals/${f.proposalIds[0]}/decision`,
    allowed: ['team PI', 'facility_manager'],
    refused: 404,
    on: 'released',
  },
  {
    name: 'GET /proposals/:proposalId/decision (before the release)',
    method: 'get',
    path: (f) => `/api/awards/proposals/${f.proposalIds[0]}/decision`,
    allowed: [],
    refused: 404,
    on: 'pending',
  },
];

/** One browser per viewer and fixture (the PI, reviewer and chair differ per fixture). */
const browsers = new Map<string, Browser>();

async function browser(who: Who, f: AwardFixture): Promise<Browser> {
  const perFixture = who === 'team PI' || who === 'reviewer' || who === 'chair';
  const key = perFixture ? `${who}:${f.cycleId}` : who;
  if (!browsers.has(key)) {
    let b: Browser;
    if (who === 'signed out') b = await new Browser(h).ready();
    else if (who === 'facility_manager') b = managerBrowser;
    else if (who === 'team PI') b = await browserFor(h, f.pis[0]);
    else if (who === 'reviewer') b = await browserFor(h, f.reviewers[1]);
    else if (who === 'chair') b = await browserFor(h, f.chair);
    else if (who === 'proposer not on the team') b = await browserFor(h, await account(h, ['proposer'], 'Outside Proposer'));
    else b = await browserFor(h, await account(h, [who], `Matrix ${who}`));
    browsers.set(key, b);
  }
  return browsers.get(key)!;
}

describe.each(CASES)('$name', (c) => {
  it.each(WHO)('%s', async (who) => {
    const allowed = c.allowed.includes(who);
    const f = c.on === 'released' ? released : c.on === 'pending' || !allowed ? pending : await fixture(false);
    const b = await browser(who, f);
    const url = c.path(f);
    const body = c.body ? await c.body(f) : undefined;
    const res = c.method === 'get' ? await b.get(url) : await b[c.method](url, body ?? {});
    if (who === 'signed out') {
      expect(res.status).toBe(401);
      expect(res.body.code).toBe('not_signed_in');
    } else if (allowed) {
      expect(res.status).toBe(200);
    } else {
      expect(res.status).toBe(c.refused);
      expect(res.body).toEqual(
        expect.objectContaining({ code: c.refused === 403 ? 'forbidden' : 'proposal_not_found', message: expect.any(String) }),
      );
    }
  });
});

it('refused calls changed nothing: the pending cycle is unreleased, its proposal ranked', async () => {
  const db = h.created.ctx.db;
  expect((await db('cycles').where('id', pending.cycleId).first('awards_released_at')).awards_released_at).toBeNull();
  expect(await db('proposals').whereIn('id', pending.proposalIds).pluck('state')).toEqual(['ranked']);
});
