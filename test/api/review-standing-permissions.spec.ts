/**
 * Authorization matrix of review's standing/ routes (statistics, triage, spread threshold,
 * standing, moves, lock, CSV exports, pressure): every route × signed out (401), proposer,
 * reviewer who is not the chair, chair before the panel stage, chair at the panel stage,
 * facility manager, administrator, billing contact. Fixtures are written straight into the
 * database (test/…/standing/testing/standing-fixtures.ts).
 */
import type { Role } from '@spincycle/shared/accounts/roles';
import { Browser, startHarness, type Harness } from '../support/api-harness';
import { createTestNetwork, type TestNetwork } from './support/proposal-kit';
import {
  account,
  browserFor,
  createPanelFixture,
  type Account,
  type PanelFixture,
} from '../../server/src/features/review/standing/testing/standing-fixtures';

let h: Harness;
let net: TestNetwork;
/** Panel stage (deadline passed); the same chair chairs `early`, whose deadline is still ahead. */
let open: PanelFixture;
let early: PanelFixture;
let chair: Account;

beforeAll(async () => {
  // Every viewer signs in once; the sign-in limiter would otherwise refuse the matrix's sign-ins.
  h = await startHarness({ LOGIN_RATE_LIMIT: 10_000 });
  net = await createTestNetwork(h, 'RP');
  open = await createPanelFixture(h, net, {
    grades: [
      [7, 5],
      [6, 8],
      [4, 6],
    ],
  });
  chair = open.chair;
  early = await createPanelFixture(h, net, {
    grades: [
      [7, 5],
      [6, 8],
    ],
    deadline: 'future',
    chair,
  });
});
afterAll(async () => {
  await net.cleanUp();
  await h.close();
});

type Who = 'signed out' | 'proposer' | 'reviewer not chair' | 'chair before panel stage' | 'chair at panel stage' | Role;
const WHO: Who[] = [
  'signed out',
  'proposer',
  'reviewer not chair',
  'chair before panel stage',
  'chair at panel stage',
  'facility_manager',
  'administrator',
  'billing_contact',
];

interface Case {
  name: string;
  method: 'get' | 'post' | 'put';
  /** The path for a panel (or its cycle). */
  path: (f: PanelFixture) => string;
  body?: (f: PanelFixture, b: Browser) => Promise<object> | object;
  /** Who gets a 2xx (the others 403, signed out 401). */
  allowed: Who[];
  /** A fresh panel for each allowed call (the route is final, like the lock). */
  fresh?: boolean;
}

const BOTH: Who[] = ['chair at panel stage', 'facility_manager'];
/** A move that is always valid: the proposal at position 1 to position 2. */
async function validMove(f: PanelFixture, b: Browser) {
  const standing = await b.get(`/api/review/panels/${f.panelId}/standing`);
  const first = standing.body?.entries?.[0]?.proposal?.proposalId ?? f.proposalIds[0];
  return { proposalId: first, toPosition: 2, reason: 'Agreed in discussion' };
}

const CASES: Case[] = [
  { name: 'GET statistics', method: 'get', path: (f) => `/api/review/panels/${f.panelId}/statistics`, allowed: BOTH },
  {
    name: 'PUT spread-threshold',
    method: 'put',
    path: (f) => `/api/review/panels/${f.panelId}/spread-threshold`,
    body: () => ({ spreadThreshold: 4 }),
    allowed: BOTH,
  },
  {
    name: 'PUT triage (managers only)',
    method: 'put',
    path: (f) => `/api/review/panels/${f.panelId}/triage`,
    body: () => ({ fraction: 0.3 }),
    allowed: ['facility_manager'],
  },
  { name: 'GET standing', method: 'get', path: (f) => `/api/review/panels/${f.panelId}/standing`, allowed: BOTH },
  { name: 'POST standing/initialise', method: 'post', path: (f) => `/api/review/panels/${f.panelId}/standing/initialise`, allowed: BOTH },
  {
    name: 'POST standing/moves',
    method: 'post',
    path: (f) => `/api/review/panels/${f.panelId}/standing/moves`,
    body: validMove,
    allowed: BOTH,
  },
  { name: 'GET matrix.csv', method: 'get', path: (f) => `/api/review/panels/${f.panelId}/matrix.csv`, allowed: BOTH },
  { name: 'GET standing.csv', method: 'get', path: (f) => `/api/review/panels/${f.panelId}/standing.csv`, allowed: BOTH },
  { name: 'GET cycle pressure', method: 'get', path: (f) => `/api/review/cycles/${f.cycleId}/pressure`, allowed: BOTH },
  { name: 'POST standing/lock', method: 'post', path: (f) => `/api/review/panels/${f.panelId}/standing/lock`, allowed: BOTH, fresh: true },
];

const browsers = new Map<Who, Browser>();

async function signIn(who: Who): Promise<Browser> {
  switch (who) {
    case 'signed out':
      return new Browser(h).ready();
    case 'proposer':
      // The PI of a proposal in the panel: still no access.
      return browserFor(h, open.pis[0]);
    case 'reviewer not chair':
      return browserFor(h, open.reviewers[1]);
    case 'chair before panel stage':
    case 'chair at panel stage':
      return browserFor(h, chair);
    default:
      return browserFor(h, await account(h, [who]));
  }
}

/** The browser (signed in once per viewer) and the panel each viewer is tried on. */
async function viewer(who: Who, fresh: boolean): Promise<{ browser: Browser; panel: PanelFixture }> {
  let panel = who === 'chair before panel stage' ? early : open;
  if (fresh && (who === 'chair at panel stage' || who === 'facility_manager')) {
    panel = await createPanelFixture(h, net, {
      grades: [
        [7, 5],
        [6, 8],
      ],
      chair,
    });
  }
  if (!browsers.has(who)) browsers.set(who, await signIn(who));
  return { browser: browsers.get(who)!, panel };
}

describe.each(CASES)('$name', (c) => {
  it.each(WHO)('%s', async (who) => {
    const { browser, panel } = await viewer(who, !!c.fresh);
    const body = c.body ? await c.body(panel, browser) : undefined;
    const url = c.path(panel);
    const res = c.method === 'get' ? await browser.get(url) : await browser[c.method](url, body ?? {});
    const expected = who === 'signed out' ? 401 : c.allowed.includes(who) ? 'ok' : 403;
    if (expected === 'ok') {
      expect([200, 201]).toContain(res.status);
    } else {
      expect(res.status).toBe(expected);
      expect(res.body).toEqual(expect.objectContaining({ code: expect.any(String), message: expect.any(String) }));
    }
  });
});

it('a refused lock leaves the proposals in review and the panel unlocked', async () => {
  const states = await h.created.ctx.db('proposals').whereIn('id', early.proposalIds).pluck('state');
  expect(states).toEqual(['in_review', 'in_review']);
  const [panel] = await h.created.ctx.db('panels').where('id', open.panelId).select('standing_locked_at');
  expect(panel.standing_locked_at).toBeNull();
});
