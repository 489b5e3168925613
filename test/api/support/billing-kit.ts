/**
 * The billing tests' world: the payment fake (fakes/payments) on loopback, the app listening on a
 * real port (the fake posts its signed events there), the app's logs captured, and a released cycle
 * of the test network with awarded programs, each with an accepted billing contact.
 */
import { createServer, type Server } from 'node:http';
import { Writable } from 'node:stream';
import type { Express } from 'express';
import type { ConfigOverrides } from '../../../server/src/config';
import { createLogger } from '../../../server/src/logger';
import { startPaymentFake, type PaymentFake } from '../../../fakes/payments/payment-fake';
import { startHarness, type Harness } from '../../support/api-harness';
import { account, browserFor, type Account } from '../../../server/src/features/awards/testing/award-fixtures';
import {
  createNightPlanFixture,
  type NightPlanFixture,
  type ProgramSpec,
} from '../../../server/src/features/night-plans/testing/night-plan-fixtures';
import { createTestNetwork, type TestNetwork } from './proposal-kit';
import type { Browser } from '../../support/api-harness';

export const SECRET_KEY = 'sk_test_billing_spec_0123456789';
export const WEBHOOK_SECRET = 'whsec_billing_spec_0123456789';

/** A server whose request handler can be swapped (the app "killed" and started again on the same port). */
export class SwappableServer {
  handler: Express | null = null;
  readonly server: Server;
  port = 0;
  constructor() {
    this.server = createServer((req, res) => {
      if (!this.handler) {
        // The app is down: drop the connection, as a stopped process would.
        req.socket.destroy();
        return;
      }
      this.handler(req, res);
    });
  }
  async listen(): Promise<number> {
    await new Promise<void>((resolve) => this.server.listen(0, '127.0.0.1', resolve));
    const address = this.server.address();
    this.port = typeof address === 'object' && address ? address.port : 0;
    return this.port;
  }
  close(): Promise<void> {
    this.server.closeAllConnections();
    return new Promise((resolve) => this.server.close(() => resolve()));
  }
}

export interface BillingWorld {
  h: Harness;
  fake: PaymentFake;
  front: SwappableServer;
  /** Every log line the app wrote (JSON objects). */
  logs: string[];
  net: TestNetwork;
  /** Starts a second app on the same database and port (after the first one was "killed"). */
  restartApp(): Promise<void>;
  /** Stops the payment fake and starts it again on the same port with the same state. */
  restartFake(): Promise<void>;
  stopFake(): Promise<void>;
  close(): Promise<void>;
}

export async function startBillingWorld(stateFile: string | null = null, extraConfig: ConfigOverrides = {}): Promise<BillingWorld> {
  const front = new SwappableServer();
  const port = await front.listen();
  const webhookUrl = `http://127.0.0.1:${port}/api/billing/webhook`;
  const fakeOptions = {
    secretKey: SECRET_KEY,
    webhookSecret: WEBHOOK_SECRET,
    webhookUrl,
    stateFile,
    webhookRetryBaseMs: 50,
    webhookRetryMaxMs: 400,
  };
  let fake = await startPaymentFake(fakeOptions);
  const fakePort = fake.port;
  const logs: string[] = [];
  const sink = new Writable({
    write(chunk, _enc, done) {
      logs.push(...String(chunk).split('\n').filter(Boolean));
      done();
    },
  });
  const config = {
    PAYMENT_API_URL: fake.url,
    PAYMENT_SECRET_KEY: SECRET_KEY,
    PAYMENT_WEBHOOK_SECRET: WEBHOOK_SECRET,
    LOG_LEVEL: 'debug' as const,
    ...extraConfig,
  };
  const start = () => startHarness(config, { logger: createLogger(config, sink) });
  let h = await start();
  const retired: Harness[] = [];
  front.handler = h.created.app;
  const net = await createTestNetwork(h, 'B');
  const world: BillingWorld = {
    get h() {
      return h;
    },
    get fake() {
      return fake;
    },
    front,
    logs,
    net,
    async restartApp() {
      // The old app gets no more requests (as if its process were gone); its database pool stays
      // open for the fixtures made with it, and is closed at the end.
      front.handler = null;
      retired.push(h);
      h = await start();
      front.handler = h.created.app;
    },
    async stopFake() {
      await fake.close();
    },
    async restartFake() {
      fake = await startPaymentFake({ ...fakeOptions, port: fakePort });
    },
    async close() {
      await fake.close().catch(() => undefined);
      for (const old of retired) await old.close();
      await h.close();
      await front.close();
    },
  };
  return world;
}

export interface BilledProgram {
  fixture: NightPlanFixture;
  manager: Browser;
  /** Billing contact per program (accepted), and their browsers. */
  contacts: Account[];
  contactBrowsers: Browser[];
}

/** A released cycle with the programs, a facility manager, and an accepted billing contact per program. */
export async function billedPrograms(w: BillingWorld, programs: ProgramSpec[]): Promise<BilledProgram> {
  const h = w.h;
  const fixture = await createNightPlanFixture(h, w.net, { nodes: w.net.nodes.slice(0, 2), programs });
  const managerAccount = await account(h, ['facility_manager'], `Fees manager ${w.net.tag}`);
  const manager = await browserFor(h, managerAccount);
  const contacts: Account[] = [];
  const contactBrowsers: Browser[] = [];
  for (const [i, proposalId] of fixture.proposalIds.entries()) {
    const contact = await account(h, ['proposer'], `Billing contact ${w.net.tag}-${i}`);
    await h.created.ctx.db('program_billing_contacts').insert({
      proposal_id: proposalId,
      email: contact.email.toLowerCase(),
      account_id: contact.id,
      accepted_at: new Date(),
      invited_by: fixture.pis[i].id,
    });
    await h.created.ctx.db('account_roles').insert({ account_id: contact.id, role: 'billing_contact' });
    contacts.push(contact);
    contactBrowsers.push(await browserFor(h, contact));
  }
  return { fixture, manager, contacts, contactBrowsers };
}

/** Prepares the cycle's drafts and issues the program's invoice; answers it. */
export async function issuedInvoice(manager: Browser, cycleId: number, proposalId: number) {
  await manager.post(`/api/billing/cycles/${cycleId}/invoices`).then((r) => expect(r.status).toBe(200));
  const summary = (await manager.get(`/api/billing/cycles/${cycleId}`).expect(200)).body;
  const draft = summary.invoices.find((i: { proposalId: number }) => i.proposalId === proposalId);
  const res = await manager.post(`/api/billing/invoices/${draft.id}/issue`, { version: draft.version });
  expect(res.status).toBe(200);
  return res.body;
}

export const CARDS = {
  success: '4242424242424242',
  declined: '4000000000000002',
  insufficientFunds: '4000000000009995',
  authentication: '4000002500003155',
};

export const card = (number: string, version: number) => ({ version, cardNumber: number, expMonth: 12, expYear: 2031, cvc: '123' });
