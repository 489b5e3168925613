/**
 * Authorization matrix of the returned-photometry routes (/api/proposals/:id/photometry): every
 * route × signed out (401), a proposer not on the team, the program's PI and co-investigator, a
 * reviewer, facility manager, administrator, billing contact. The program's team reaches every
 * route; everyone else gets the proposal's 404, so that a program's existence is not revealed.
 * Analyses are queued on a fake queue (their jobs are not run here).
 */
import type { Role } from '@spincycle/shared/accounts/roles';
import { Browser, startHarness, type Harness } from '../support/api-harness';
import { createTestNetwork, type TestNetwork } from './support/proposal-kit';
import { account, browserFor } from '../../server/src/features/awards/testing/award-fixtures';
import { createNightPlanFixture, type NightPlanFixture } from '../../server/src/features/night-plans/testing/night-plan-fixtures';

let h: Harness;
let net: TestNetwork;
let f: NightPlanFixture;

const CSV = 'mjd,mag\n61100.10,12.01\n61100.20,12.02\n61101.10,12.00\n61102.15,12.03\n61103.12,12.01\n';

beforeAll(async () => {
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000 });
  h.created.ctx.photometryQueue = { async enqueue() {}, async close() {} };
  net = await createTestNetwork(h, 'PM');
  f = await createNightPlanFixture(h, net, { nodes: [net.nodes[0]], programs: [{ targets: 1, hours: [5] }], campaignNights: 10 });
  // One stored curve, so that a new analysis has something to analyse.
  const pi = await browserFor(h, f.pis[0]);
  const res = await pi.agent
    .post(`/api/proposals/${f.proposalIds[0]}/photometry/uploads`)
    .set('X-XSRF-TOKEN', pi.xsrf() ?? '')
    .field('targetId', String(f.targetIds[0][0]))
    .attach('files', Buffer.from(CSV), 'a.csv');
  expect(res.status).toBe(202);
}, 60_000);
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

type Who = 'signed out' | 'proposer not on the team' | 'program PI' | 'program co-investigator' | 'reviewer' | Role;
const WHO: Who[] = [
  'signed out',
  'proposer not on the team',
  'program PI',
  'program co-investigator',
  'reviewer',
  'facility_manager',
  'administrator',
  'billing_contact',
];
const TEAM: Who[] = ['program PI', 'program co-investigator'];

interface Case {
  name: string;
  method: 'get' | 'post';
  path: () => string;
  body?: object;
  upload?: true;
}

const CASES: Case[] = [
  { name: 'GET /', method: 'get', path: () => `/api/proposals/${f.proposalIds[0]}/photometry` },
  { name: 'POST /uploads', method: 'post', path: () => `/api/proposals/${f.proposalIds[0]}/photometry/uploads`, upload: true },
  {
    name: 'POST /analyses',
    method: 'post',
    path: () => `/api/proposals/${f.proposalIds[0]}/photometry/analyses`,
    body: { detrend: { offsets: 'none', clipSigma: 4, binMinutes: null } },
  },
  { name: 'GET /run', method: 'get', path: () => `/api/proposals/${f.proposalIds[0]}/photometry/run` },
  {
    name: 'GET /targets/:targetId',
    method: 'get',
    path: () => `/api/proposals/${f.proposalIds[0]}/photometry/targets/${f.targetIds[0][0]}`,
  },
  { name: 'GET /export.csv', method: 'get', path: () => `/api/proposals/${f.proposalIds[0]}/photometry/export.csv` },
];

const browsers = new Map<Who, Browser>();
async function browser(who: Who): Promise<Browser> {
  if (!browsers.has(who)) {
    let b: Browser;
    if (who === 'signed out') b = await new Browser(h).ready();
    else if (who === 'program PI') b = await browserFor(h, f.pis[0]);
    else if (who === 'program co-investigator') b = await browserFor(h, f.cois[0]);
    else if (who === 'reviewer') b = await browserFor(h, f.reviewer);
    else if (who === 'proposer not on the team') b = await browserFor(h, await account(h, ['proposer'], 'Outside Photometry Proposer'));
    else b = await browserFor(h, await account(h, [who], `Photometry matrix ${who}`));
    browsers.set(who, b);
  }
  return browsers.get(who)!;
}

describe.each(CASES)('$name', (c) => {
  it.each(WHO)('%s', async (who) => {
    const b = await browser(who);
    let res;
    if (c.upload) {
      await b.ready();
      res = await b.agent
        .post(c.path())
        .set('X-XSRF-TOKEN', b.xsrf() ?? '')
        .field('targetId', String(f.targetIds[0][0]))
        .attach('files', Buffer.from(CSV), 'a.csv');
    } else if (c.method === 'get') res = await b.get(c.path());
    else res = await b.post(c.path(), c.body ?? {});
    if (who === 'signed out') {
      expect(res.status).toBe(401);
      expect(res.body.code).toBe('not_signed_in');
    } else if (TEAM.includes(who)) {
      expect([200, 202]).toContain(res.status);
    } else {
      expect(res.status).toBe(404);
      expect(res.body).toEqual(expect.objectContaining({ code: 'proposal_not_found', message: expect.any(String) }));
    }
  });
});
