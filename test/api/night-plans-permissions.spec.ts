/**
 * Authorization matrix of the night-plan routes (/api/night-plans): every route × signed out
 * (401), a proposer not on the team, the program's PI, a reviewer, facility manager,
 * administrator, billing contact. The manager's routes answer 403 to every other role; a
 * program's progress answers its team and managers, and 404 to everyone else. The calendar feed
 * (/api/calendar-feeds/:token.ics) needs no session: whoever holds a working link reads it,
 * signed out too. Fixtures are written straight into the database
 * (server/src/features/night-plans/testing/); builds are queued on a fake queue (their jobs are
 * not run here).
 */
import { createHash, randomBytes } from 'node:crypto';
import type { Role } from '@spincycle/shared/accounts/roles';
import { Browser, startHarness, type Harness } from '../support/api-harness';
import { createTestNetwork, type TestNetwork } from './support/proposal-kit';
import { account, browserFor } from '../../server/src/features/awards/testing/award-fixtures';
import {
  createNightPlanFixture,
  fakeNightPlanQueue,
  insertVisit,
  type NightPlanFixture,
} from '../../server/src/features/night-plans/testing/night-plan-fixtures';

let h: Harness;
let net: TestNetwork;
/** Released, with a finished build, a visit and a lost night on its last campaign night. */
let shared: NightPlanFixture;
let visitId: number;
let managerBrowser: Browser;
/** The secret of a working calendar link of the shared cycle's node. */
let feedToken: string;

async function fixture(): Promise<NightPlanFixture> {
  return createNightPlanFixture(h, net, { nodes: [net.nodes[0]], programs: [{ targets: 1, hours: [5] }], campaignNights: 10 });
}

beforeAll(async () => {
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000 });
  h.created.ctx.nightPlanQueue = fakeNightPlanQueue();
  net = await createTestNetwork(h, 'NM');
  managerBrowser = await browserFor(h, await account(h, ['facility_manager'], 'Night Matrix Manager'));
  shared = await fixture();
  visitId = await insertVisit(h, shared);
  await h.created.ctx.db('night_plan_builds').insert({
    cycle_id: shared.cycleId,
    kind: 'build',
    state: 'done',
    total: 1,
    done: 1,
    node_jobs: 1,
    node_jobs_finished: 1,
    requested_at: new Date(),
    finished_at: new Date(),
  });
  const feed = await managerBrowser.post(`/api/night-plans/cycles/${shared.cycleId}/nodes/${shared.nodeIds[0]}/calendar-feed`);
  expect(feed.status).toBe(201);
  feedToken = /\/api\/calendar-feeds\/([\w-]+)\.ics$/.exec(feed.body.url)![1];
}, 60_000);
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

type Who = 'signed out' | 'proposer not on the team' | 'program PI' | 'reviewer' | Role;
const WHO: Who[] = [
  'signed out',
  'proposer not on the team',
  'program PI',
  'reviewer',
  'facility_manager',
  'administrator',
  'billing_contact',
];

interface Case {
  name: string;
  method: 'get' | 'post' | 'put' | 'delete';
  path: (f: NightPlanFixture) => string;
  body?: (f: NightPlanFixture) => object;
  /** A CSV sent as the multipart field `file`. */
  upload?: (f: NightPlanFixture) => string;
  /** Run before an allowed call on a fresh fixture. */
  prepare?: (f: NightPlanFixture) => Promise<void>;
  /** Everyone, signed out too (`allowed` lists every caller). */
  public?: true;
  allowed: Who[];
  refused: 403 | 404;
  /** `fresh`: a new fixture per allowed call (the call changes it). */
  on: 'shared' | 'fresh';
}

const MANAGER: Who[] = ['facility_manager'];
const lastNight = (f: NightPlanFixture) => f.campaignEnd;

const CASES: Case[] = [
  { name: 'GET /cycles', method: 'get', path: () => '/api/night-plans/cycles', allowed: MANAGER, refused: 403, on: 'shared' },
  {
    name: 'GET /cycles/:cycleId',
    method: 'get',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}`,
    allowed: MANAGER,
    refused: 403,
    on: 'shared',
  },
  {
    name: 'POST /cycles/:cycleId/builds',
    method: 'post',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}/builds`,
    allowed: MANAGER,
    refused: 403,
    on: 'fresh',
  },
  {
    name: 'GET /cycles/:cycleId/builds/latest',
    method: 'get',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}/builds/latest`,
    allowed: MANAGER,
    refused: 403,
    on: 'shared',
  },
  {
    name: 'GET /cycles/:cycleId/nodes/:nodeId/timeline',
    method: 'get',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/timeline?from=${f.campaignStart}&to=${f.campaignEnd}`,
    allowed: MANAGER,
    refused: 403,
    on: 'shared',
  },
  {
    name: 'GET /cycles/:cycleId/nodes/:nodeId/nights/:date',
    method: 'get',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/nights/${f.campaignStart}`,
    allowed: MANAGER,
    refused: 403,
    on: 'shared',
  },
  {
    name: 'POST /cycles/:cycleId/nodes/:nodeId/lost-nights',
    method: 'post',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/lost-nights`,
    body: (f) => ({ date: lastNight(f), reason: 'Cloud over the site' }),
    allowed: MANAGER,
    refused: 403,
    on: 'fresh',
  },
  {
    name: 'DELETE /cycles/:cycleId/nodes/:nodeId/lost-nights/:date',
    method: 'delete',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/lost-nights/${lastNight(f)}`,
    prepare: async (f) => {
      await h.created.ctx
        .db('lost_nights')
        .insert({ cycle_id: f.cycleId, node_id: f.nodeIds[0], night_date: lastNight(f), reason: 'Fault' });
    },
    allowed: MANAGER,
    refused: 403,
    on: 'fresh',
  },
  {
    name: 'PUT /visits/:visitId',
    method: 'put',
    path: () => `/api/night-plans/visits/${visitId}`,
    body: () => ({ status: 'done' }),
    allowed: MANAGER,
    refused: 403,
    on: 'shared',
  },
  {
    name: 'POST /cycles/:cycleId/execution',
    method: 'post',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}/execution`,
    // The visit of insertVisit starts at 03:00 UTC the morning after its night's date.
    upload: (f) =>
      `target,node,utc_time,status\n${f.targetNames[0][0]},${f.nodeCodes[0]},${new Date(Date.parse(`${f.campaignStart}T03:10:00Z`) + 86400_000).toISOString()},missed\n`,
    allowed: MANAGER,
    refused: 403,
    on: 'shared',
  },
  {
    name: 'GET /cycles/:cycleId/nodes/:nodeId/plan.csv',
    method: 'get',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/plan.csv`,
    allowed: MANAGER,
    refused: 403,
    on: 'shared',
  },
  {
    name: 'GET /cycles/:cycleId/nodes/:nodeId/plan.ics',
    method: 'get',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/plan.ics`,
    allowed: MANAGER,
    refused: 403,
    on: 'shared',
  },
  {
    name: 'GET /cycles/:cycleId/nodes/:nodeId/calendar-feed',
    method: 'get',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/calendar-feed`,
    allowed: MANAGER,
    refused: 403,
    on: 'shared',
  },
  {
    name: 'POST /cycles/:cycleId/nodes/:nodeId/calendar-feed',
    method: 'post',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/calendar-feed`,
    allowed: MANAGER,
    refused: 403,
    on: 'fresh',
  },
  {
    name: 'DELETE /cycles/:cycleId/nodes/:nodeId/calendar-feed',
    method: 'delete',
    path: (f) => `/api/night-plans/cycles/${f.cycleId}/nodes/${f.nodeIds[0]}/calendar-feed`,
    prepare: async (f) => {
      const hash = createHash('sha256').update(randomBytes(32).toString('base64url')).digest('hex');
      await h.created.ctx.db('calendar_feeds').insert({ cycle_id: f.cycleId, node_id: f.nodeIds[0], token_hash: hash });
    },
    allowed: MANAGER,
    refused: 403,
    on: 'fresh',
  },
  {
    name: 'GET /api/calendar-feeds/:token.ics (no session)',
    method: 'get',
    path: () => `/api/calendar-feeds/${feedToken}.ics`,
    public: true,
    allowed: WHO,
    refused: 404,
    on: 'shared',
  },
  {
    name: 'GET /programs/:proposalId',
    method: 'get',
    path: (f) => `/api/night-plans/programs/${f.proposalIds[0]}`,
    allowed: ['program PI', 'facility_manager'],
    refused: 404,
    on: 'shared',
  },
];

const browsers = new Map<string, Browser>();

async function browser(who: Who, f: NightPlanFixture): Promise<Browser> {
  const key = who === 'program PI' ? `${who}:${f.cycleId}` : who;
  if (!browsers.has(key)) {
    let b: Browser;
    if (who === 'signed out') b = await new Browser(h).ready();
    else if (who === 'facility_manager') b = managerBrowser;
    else if (who === 'program PI') b = await browserFor(h, f.pis[0]);
    else if (who === 'reviewer') b = await browserFor(h, f.reviewer);
    else if (who === 'proposer not on the team') b = await browserFor(h, await account(h, ['proposer'], 'Outside Night Proposer'));
    else b = await browserFor(h, await account(h, [who], `Night matrix ${who}`));
    browsers.set(key, b);
  }
  return browsers.get(key)!;
}

describe.each(CASES)('$name', (c) => {
  it.each(WHO)('%s', async (who) => {
    const allowed = c.allowed.includes(who);
    const f = c.on === 'fresh' && allowed ? await fixture() : shared;
    if (allowed && c.prepare) await c.prepare(f);
    const b = await browser(who, f);
    const url = c.path(f);
    let res;
    if (c.upload) {
      await b.ready();
      res = await b.agent
        .post(url)
        .set('X-XSRF-TOKEN', b.xsrf() ?? '')
        .attach('file', Buffer.from(c.upload(f)), 'log.csv');
    } else if (c.method === 'get') res = await b.get(url);
    else if (c.method === 'delete') res = await b.delete(url);
    else res = await b[c.method](url, c.body ? c.body(f) : {});
    if (c.public) {
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toBe('text/calendar; charset=utf-8');
    } else if (who === 'signed out') {
      expect(res.status).toBe(401);
      expect(res.body.code).toBe('not_signed_in');
    } else if (allowed) {
      expect([200, 201, 202, 204]).toContain(res.status);
    } else {
      expect(res.status).toBe(c.refused);
      expect(res.body).toEqual(
        expect.objectContaining({ code: c.refused === 403 ? 'forbidden' : 'proposal_not_found', message: expect.any(String) }),
      );
    }
  });
});

describe('refusals that name the problem', () => {
  it('answers 404 for an unknown cycle, node and visit, and 409 not_released before the release', async () => {
    const unknownCycle = await managerBrowser.get('/api/night-plans/cycles/2147483000');
    expect(unknownCycle.status).toBe(404);
    const unknownNode = await managerBrowser.get(
      `/api/night-plans/cycles/${shared.cycleId}/nodes/2147483000/nights/${shared.campaignStart}`,
    );
    expect(unknownNode.status).toBe(404);
    const unknownVisit = await managerBrowser.put('/api/night-plans/visits/2147483000', { status: 'done' });
    expect(unknownVisit.status).toBe(404);
    const badStatus = await managerBrowser.put(`/api/night-plans/visits/${visitId}`, { status: 'finished' });
    expect(badStatus.status).toBe(400);
    expect(badStatus.body.fieldErrors).toHaveProperty('status');
    const pending = await createNightPlanFixture(h, net, {
      nodes: [net.nodes[0]],
      programs: [{ targets: 1, hours: [5] }],
      released: false,
    });
    const res = await managerBrowser.post(`/api/night-plans/cycles/${pending.cycleId}/builds`);
    expect(res.status).toBe(409);
    expect(res.body.code).toBe('not_released');
    const progress = await managerBrowser.get('/api/night-plans/programs/2147483000');
    expect(progress.status).toBe(404);
  });

  it('answers 404 calendar_feed_not_found, signed out, for a link that is not one', async () => {
    const res = await (await new Browser(h).ready()).get(`/api/calendar-feeds/${'x'.repeat(43)}.ics`);
    expect(res.status).toBe(404);
    expect(res.body.code).toBe('calendar_feed_not_found');
  });

  it('refused calls changed nothing: the shared cycle keeps one build, no lost night and its one working calendar link', async () => {
    const db = h.created.ctx.db;
    expect(await db('night_plan_builds').where('cycle_id', shared.cycleId)).toHaveLength(1);
    expect(await db('lost_nights').where('cycle_id', shared.cycleId)).toHaveLength(0);
    const feeds = await db('calendar_feeds').where('cycle_id', shared.cycleId);
    expect(feeds.map((r) => r.revoked_at)).toEqual([null]);
  });
});
