/**
 * Authorization matrix of the billing routes (/api/billing): every route × signed out, a proposer
 * not on the team, the team's PI, the program's billing contact, another program's billing
 * contact, a reviewer, a facility manager and an administrator.
 * - The facility manager's routes answer 401 signed out and 403 to every other role.
 * - An invoice, its PDFs and its payments answer 404 to anyone who is not a manager, a billing
 *   contact or the PI of the program (its existence is not revealed); paying is the billing
 *   contact's alone (the PI gets 403).
 * - A program's contacts: the PI and managers manage them; the contacts see them; others get 404.
 * An allowed caller is one the route lets through to its business rules: any status but 401, 403
 * and 404 (a write may then answer 409 because of the invoice's state, which is not about access).
 * The webhook is not in this matrix: its only credential is the signature (billing.spec.ts).
 */
import { account, browserFor } from '../../server/src/features/awards/testing/award-fixtures';
import { Browser } from '../support/api-harness';
import {
  billedPrograms,
  card,
  CARDS,
  issuedInvoice,
  startBillingWorld,
  type BilledProgram,
  type BillingWorld,
} from './support/billing-kit';

type Who =
  | 'signed out'
  | 'proposer not on the team'
  | 'team PI'
  | 'billing contact'
  | 'other billing contact'
  | 'reviewer'
  | 'facility_manager'
  | 'administrator';
const WHO: Who[] = [
  'signed out',
  'proposer not on the team',
  'team PI',
  'billing contact',
  'other billing contact',
  'reviewer',
  'facility_manager',
  'administrator',
];

let w: BillingWorld;
let world: BilledProgram;
let invoice: { id: number; version: number; number: string };
let browsers: Record<Who, Browser>;

beforeAll(async () => {
  w = await startBillingWorld();
  world = await billedPrograms(w, [
    { targets: 1, hours: [2, 0] },
    { targets: 1, hours: [1, 0] },
  ]);
  invoice = await issuedInvoice(world.manager, world.fixture.cycleId, world.fixture.proposalIds[0]);
  browsers = {
    'signed out': new Browser(w.h),
    'proposer not on the team': await browserFor(w.h, await account(w.h, ['proposer'], `Outsider ${w.net.tag}`)),
    'team PI': await browserFor(w.h, world.fixture.pis[0]),
    'billing contact': world.contactBrowsers[0],
    'other billing contact': world.contactBrowsers[1],
    reviewer: await browserFor(w.h, await account(w.h, ['reviewer'], `Reviewer ${w.net.tag}`)),
    facility_manager: world.manager,
    administrator: await browserFor(w.h, await account(w.h, ['administrator'], `Administrator ${w.net.tag}`)),
  };
}, 60_000);
afterAll(async () => {
  await w?.close();
});

const MANAGER: Who[] = ['facility_manager'];
const PAYERS: Who[] = ['team PI', 'billing contact', 'facility_manager'];

interface Case {
  name: string;
  method: 'get' | 'post' | 'put' | 'delete';
  path: () => string;
  body?: () => object;
  allowed: Who[];
  /** What refused signed-in callers get. */
  refused: 403 | 404;
  /** Refusals of signed-in callers that differ (e.g. the PI may see but not pay: 403). */
  except?: Partial<Record<Who, number>>;
  /** A 404 with this code is a business answer for an allowed caller (e.g. no such contact), not a refusal. */
  allowedNotFound?: string;
}

const cycle = () => world.fixture.cycleId;
const program = () => world.fixture.proposalIds[0];
/** Ids that exist nowhere: the allowed callers get past the access check and find nothing. */
const missingContact = () => 2147483647;
const unknownToken = () => 'A'.repeat(43);
const CASES: Case[] = [
  { name: 'GET /cycles', method: 'get', path: () => '/api/billing/cycles', allowed: MANAGER, refused: 403 },
  { name: 'GET /cycles/:cycleId', method: 'get', path: () => `/api/billing/cycles/${cycle()}`, allowed: MANAGER, refused: 403 },
  {
    name: 'POST /cycles/:cycleId/invoices',
    method: 'post',
    path: () => `/api/billing/cycles/${cycle()}/invoices`,
    allowed: MANAGER,
    refused: 403,
  },
  // Already issued: the manager gets 409, the others never reach the state check.
  {
    name: 'POST /invoices/:invoiceId/issue',
    method: 'post',
    path: () => `/api/billing/invoices/${invoice.id}/issue`,
    body: () => ({ version: invoice.version }),
    allowed: MANAGER,
    refused: 403,
  },
  {
    name: 'DELETE /invoices/:invoiceId',
    method: 'delete',
    path: () => `/api/billing/invoices/${invoice.id}?version=${invoice.version}`,
    allowed: MANAGER,
    refused: 403,
  },
  {
    name: 'POST /invoices/:invoiceId/void',
    method: 'post',
    path: () => `/api/billing/invoices/${invoice.id}/void`,
    body: () => ({ version: 999, reason: 'matrix' }),
    allowed: MANAGER,
    refused: 403,
  },
  {
    name: 'POST /invoices/:invoiceId/refund',
    method: 'post',
    path: () => `/api/billing/invoices/${invoice.id}/refund`,
    body: () => ({ version: 999, reason: 'matrix' }),
    allowed: MANAGER,
    refused: 403,
  },
  {
    name: 'PUT /programs/:proposalId/rate-class',
    method: 'put',
    path: () => `/api/billing/programs/${program()}/rate-class`,
    body: () => ({ rateClass: 'academic' }),
    allowed: MANAGER,
    refused: 403,
  },
  {
    name: 'GET /invoices',
    method: 'get',
    path: () => '/api/billing/invoices',
    allowed: WHO.filter((x) => x !== 'signed out'),
    refused: 404,
  },
  { name: 'GET /invoices/:invoiceId', method: 'get', path: () => `/api/billing/invoices/${invoice.id}`, allowed: PAYERS, refused: 404 },
  {
    name: 'GET /invoices/:invoiceId/invoice.pdf',
    method: 'get',
    path: () => `/api/billing/invoices/${invoice.id}/invoice.pdf`,
    allowed: PAYERS,
    refused: 404,
  },
  // Not paid: the receipt is "not found" for everyone, but only after the access check (its message says why).
  {
    name: 'GET /invoices/:invoiceId/receipt.pdf',
    method: 'get',
    path: () => `/api/billing/invoices/${invoice.id}/receipt.pdf`,
    allowed: [],
    refused: 404,
  },
  // A stale version: the contact gets 409 (past the access check) and nothing is charged.
  {
    name: 'POST /invoices/:invoiceId/payments',
    method: 'post',
    path: () => `/api/billing/invoices/${invoice.id}/payments`,
    body: () => card(CARDS.success, invoice.version + 50),
    allowed: ['billing contact'],
    refused: 404,
    except: { 'team PI': 403 },
  },
  { name: 'GET /programs/:proposalId', method: 'get', path: () => `/api/billing/programs/${program()}`, allowed: PAYERS, refused: 404 },
  {
    name: 'POST /programs/:proposalId/contacts',
    method: 'post',
    path: () => `/api/billing/programs/${program()}/contacts`,
    body: () => ({ email: world.contacts[0].email.toLowerCase() }),
    allowed: ['team PI', 'facility_manager'],
    refused: 404,
    except: { 'billing contact': 403 },
  },
  {
    name: 'DELETE /programs/:proposalId/contacts/:contactId',
    method: 'delete',
    path: () => `/api/billing/programs/${program()}/contacts/${missingContact()}`,
    allowed: ['team PI', 'facility_manager'],
    refused: 404,
    except: { 'billing contact': 403 },
    allowedNotFound: 'contact_not_found',
  },
  {
    name: 'POST /contact-invitations/:token',
    method: 'post',
    path: () => `/api/billing/contact-invitations/${unknownToken()}`,
    allowed: [],
    refused: 404,
  },
];

describe.each(CASES)('$name', (c) => {
  it.each(WHO)('%s', async (who) => {
    const b = browsers[who];
    const res = c.method === 'get' ? await b.get(c.path()) : await b[c.method](c.path(), c.body?.());
    if (who === 'signed out') {
      expect(res.status).toBe(401);
    } else if (c.allowed.includes(who)) {
      expect([401, 403]).not.toContain(res.status);
      if (res.status === 404) expect(res.body.code).toBe(c.allowedNotFound);
    } else {
      expect({ status: res.status }).toEqual({ status: c.except?.[who] ?? c.refused });
    }
  });
});

it('refused calls changed nothing: the invoice is still issued with its version, and nothing was charged', async () => {
  const row = await w.h.created.ctx.db('invoices').where({ id: invoice.id }).first('state', 'version');
  expect(row).toEqual({ state: 'issued', version: invoice.version });
  expect(await w.h.created.ctx.db('payment_attempts').where({ invoice_id: invoice.id }).first()).toBeUndefined();
});

it('POST /api/billing/webhook: no session counts, only the signature: unsigned, it answers 400 to everyone', async () => {
  for (const who of WHO) {
    const res = await browsers[who].agent.post('/api/billing/webhook').set('Content-Type', 'application/json').send('{"id":"evt_x"}');
    expect({ who, status: res.status }).toEqual({ who, status: 400 });
  }
});
