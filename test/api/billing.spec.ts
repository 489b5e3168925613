/**
 * Billing end to end against the payment fake, through the official SDK: invoices from awards
 * (amounts worked by hand), gapless numbers, card payments that become paid only by the signed
 * event, declines, double clicks, replayed and forged events, the provider or the app down at the
 * wrong moment, refunds, PDFs and mails, and card numbers that never reach storage or logs.
 */
import Stripe from 'stripe';
import request from 'supertest';
import { billedPrograms, card, CARDS, issuedInvoice, startBillingWorld, WEBHOOK_SECRET, type BillingWorld } from './support/billing-kit';

let w: BillingWorld;

beforeAll(async () => {
  w = await startBillingWorld();
});
afterAll(async () => {
  await w?.close();
});

const db = () => w.h.created.ctx.db;
const eventually = async (check: () => Promise<boolean>, what: string, timeoutMs = 8000) => {
  const start = Date.now();
  while (Date.now() - start < timeoutMs) {
    if (await check()) return;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`timed out waiting for ${what}`);
};
const invoiceState = async (id: number) => (await db()('invoices').where({ id }).first('state')).state as string;
/** The fake's events about one invoice (its payment intents carry the invoice id in their metadata). */
const eventsOf = (invoiceId: number, type: string) =>
  w.fake
    .events()
    .filter((e) => e.type === type && (e.data.object.metadata as Record<string, string> | undefined)?.invoice_id === String(invoiceId));

describe('invoices from awards', () => {
  it('one line per node, awarded hours × the program’s rate, in whole minor units (worked by hand in this test)', async () => {
    // Test network rates: node "-50" 45.00 EUR an hour, node "-40" 30.00 EUR an hour (proposal-kit.ts).
    // 12.50 h × 45.00 = 562.50 → 56 250; 7.25 h × 30.00 = 217.50 → 21 750; total 78 000 (780.00 EUR).
    const { fixture, manager } = await billedPrograms(w, [{ targets: 1, hours: [12.5, 7.25] }]);
    const prepared = await manager.post(`/api/billing/cycles/${fixture.cycleId}/invoices`);
    expect(prepared.status).toBe(200);
    expect(prepared.body).toEqual({ created: 1, updated: 0 });
    const summary = (await manager.get(`/api/billing/cycles/${fixture.cycleId}`).expect(200)).body;
    const draft = summary.invoices.find((i: { proposalId: number }) => i.proposalId === fixture.proposalIds[0]);
    expect(draft).toMatchObject({ state: 'draft', number: null, currency: 'EUR', totalMinor: 78_000 });
    const detail = (await manager.get(`/api/billing/invoices/${draft.id}`).expect(200)).body;
    // Lines in the order of the node codes ("…-40" before "…-50").
    expect(
      detail.lines.map((l: { hoursHundredths: number; rateMinorPerHour: number; amountMinor: number }) => [
        l.hoursHundredths,
        l.rateMinorPerHour,
        l.amountMinor,
      ]),
    ).toEqual([
      [725, 3000, 21_750],
      [1250, 4500, 56_250],
    ]);
    expect(summary.totals).toEqual([expect.objectContaining({ currency: 'EUR', draftMinor: 78_000, issuedMinor: 0 })]);

    // The external rate: 12.50 h × 60.00 = 75 000 and 7.25 h × 30.00 (no external rate set: the academic one) = 21 750.
    await db()('nodes').where({ id: fixture.nodeIds[0] }).update({ external_rate_minor_per_hour: 6000 });
    await manager
      .put(`/api/billing/programs/${fixture.proposalIds[0]}/rate-class`, { rateClass: 'external' })
      .then((r) => expect(r.status).toBe(200));
    expect((await manager.post(`/api/billing/cycles/${fixture.cycleId}/invoices`)).body).toEqual({ created: 0, updated: 1 });
    const external = (await manager.get(`/api/billing/invoices/${draft.id}`).expect(200)).body;
    expect(external).toMatchObject({ rateClass: 'external', totalMinor: 96_750 });
  });

  it('issued numbers have no gaps and no repeats, even when managers issue at once; drafts stay hidden from payers', async () => {
    const programs = Array.from({ length: 6 }, () => ({ targets: 1, hours: [2, 0] }));
    const { fixture, manager, contactBrowsers } = await billedPrograms(w, programs);
    await manager.post(`/api/billing/cycles/${fixture.cycleId}/invoices`);
    const { invoices } = (await manager.get(`/api/billing/cycles/${fixture.cycleId}`).expect(200)).body;
    expect(invoices).toHaveLength(6);
    // A draft is not the payer's to see.
    await contactBrowsers[0]
      .get(`/api/billing/invoices/${invoices.find((i: { proposalId: number }) => i.proposalId === fixture.proposalIds[0]).id}`)
      .expect(404);
    const results = await Promise.all(
      invoices.map((i: { id: number; version: number }) => manager.post(`/api/billing/invoices/${i.id}/issue`, { version: i.version })),
    );
    expect(results.map((r) => r.status)).toEqual(invoices.map(() => 200));
    const numbers = results.map((r) => Number(String(r.body.number).split('-')[2])).sort((a, b) => a - b);
    for (let k = 1; k < numbers.length; k++) expect(numbers[k]).toBe(numbers[k - 1] + 1);
    // The year's numbers so far run from 1 without a hole (other tests issue in the same year).
    const all = (await db()('invoices').whereNotNull('number').pluck('number')).filter((n: string) =>
      n.startsWith(`SC-${new Date().getUTCFullYear()}-`),
    );
    const seq = all.map((n: string) => Number(n.split('-')[2])).sort((a: number, b: number) => a - b);
    expect(seq).toEqual(seq.map((_: number, i: number) => i + 1));
    // Issuing twice is refused and takes no number.
    const again = await manager.post(`/api/billing/invoices/${invoices[0].id}/issue`, { version: invoices[0].version + 1 });
    expect(again.status).toBe(409);
    // The contact now sees it, with the caution, and receives it by mail with its PDF.
    const mine = (await contactBrowsers[0].get('/api/billing/invoices').expect(200)).body;
    expect(mine).toHaveLength(1);
    const shown = (await contactBrowsers[0].get(`/api/billing/invoices/${mine[0].id}`).expect(200)).body;
    expect(shown.caution).toMatch(/consortium’s own terms and local tax rules govern/);
    const mail = await w.h.mail.waitFor((m) => m.subject.startsWith(`Invoice ${mine[0].number}`));
    expect(mail.attachments).toEqual([
      expect.objectContaining({ filename: `invoice-${mine[0].number}.pdf`, contentType: 'application/pdf' }),
    ]);
  });
});

describe('paying by card', () => {
  it('a double click is one charge; the invoice is paid only when the signed event arrives; the receipt is mailed and downloadable', async () => {
    const { fixture, manager, contactBrowsers } = await billedPrograms(w, [{ targets: 1, hours: [3, 0] }]);
    const invoice = await issuedInvoice(manager, fixture.cycleId, fixture.proposalIds[0]);
    w.fake.pauseWebhooks();
    const [a, b] = await Promise.all([
      contactBrowsers[0].post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.success, invoice.version)),
      contactBrowsers[0].post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.success, invoice.version)),
    ]);
    expect([a.status, b.status]).toEqual([202, 202]);
    // Not paid because the browser or this request says so: only the provider's event pays it.
    expect(await invoiceState(invoice.id)).toBe('issued');
    w.fake.resumeWebhooks();
    await eventually(async () => (await invoiceState(invoice.id)) === 'paid', 'the invoice to be paid');
    // One payment intent, one charge: the second click was answered from the first.
    expect(eventsOf(invoice.id, 'payment_intent.succeeded')).toHaveLength(1);
    expect(
      new Set(
        w.fake
          .events()
          .filter(
            (e) =>
              e.type === 'payment_intent.created' && (e.data.object.metadata as Record<string, string>)?.invoice_id === String(invoice.id),
          )
          .map((e) => e.data.object.id),
      ).size,
    ).toBeLessThanOrEqual(1);
    const receipt = await w.h.mail.waitFor((m) => m.subject.startsWith(`Receipt for invoice ${invoice.number}`));
    expect(receipt.attachments[0]).toMatchObject({ contentType: 'application/pdf' });
    const pdf = await contactBrowsers[0]
      .get(`/api/billing/invoices/${invoice.id}/receipt.pdf`)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      });
    expect(pdf.status).toBe(200);
    expect((pdf.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
    // Paying again is refused.
    const again = await contactBrowsers[0].post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.success, invoice.version + 5));
    expect(again.status).toBe(409);
  });

  it.each([
    ['a generic decline', CARDS.declined, 'card_declined', /declined/i],
    ['insufficient funds', CARDS.insufficientFunds, 'card_declined', /insufficient funds/i],
    ['a card that needs authentication', CARDS.authentication, 'card_needs_authentication', /authentication/i],
  ])('%s answers 402 with the reason, leaves the invoice issued, and a good card then pays it', async (_what, number, code, message) => {
    const { fixture, manager, contactBrowsers } = await billedPrograms(w, [{ targets: 1, hours: [1, 0] }]);
    const invoice = await issuedInvoice(manager, fixture.cycleId, fixture.proposalIds[0]);
    const refused = await contactBrowsers[0].post(`/api/billing/invoices/${invoice.id}/payments`, card(number, invoice.version));
    expect(refused.status).toBe(402);
    expect(refused.body.code).toBe(code);
    expect(refused.body.message).toMatch(message);
    expect(await invoiceState(invoice.id)).toBe('issued');
    const after = (await contactBrowsers[0].get(`/api/billing/invoices/${invoice.id}`).expect(200)).body;
    expect(after.version).toBe(invoice.version + 1);
    expect(after.payments[0]).toMatchObject({
      cardLast4: number.slice(-4),
      state: code === 'card_declined' ? 'declined' : 'needs_authentication',
    });
    const paid = await contactBrowsers[0].post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.success, after.version));
    expect(paid.status).toBe(202);
    await eventually(async () => (await invoiceState(invoice.id)) === 'paid', 'the invoice to be paid');
  });

  it('only a billing contact pays; the PI sees the invoice; someone else sees nothing; bad card fields are named', async () => {
    const { fixture, manager, contactBrowsers } = await billedPrograms(w, [{ targets: 1, hours: [1, 0] }]);
    const invoice = await issuedInvoice(manager, fixture.cycleId, fixture.proposalIds[0]);
    const { browserFor, account } = await import('../../server/src/features/awards/testing/award-fixtures');
    const pi = await browserFor(w.h, fixture.pis[0]);
    await pi.get(`/api/billing/invoices/${invoice.id}`).expect(200);
    expect((await pi.post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.success, invoice.version))).status).toBe(403);
    const stranger = await browserFor(w.h, await account(w.h, ['proposer', 'billing_contact'], `Stranger ${w.net.tag}`));
    await stranger.get(`/api/billing/invoices/${invoice.id}`).expect(404);
    expect((await stranger.post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.success, invoice.version))).status).toBe(404);
    const bad = await contactBrowsers[0].post(`/api/billing/invoices/${invoice.id}/payments`, {
      ...card('4242424242424241', invoice.version),
      cvc: '1',
    });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.fieldErrors)).toEqual(expect.arrayContaining(['cardNumber', 'cvc']));
  });
});

describe('the provider’s events', () => {
  const sign = (payload: string, timestamp?: number) =>
    Stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET, timestamp: timestamp ?? Math.floor(Date.now() / 1000) });
  const postEvent = (payload: string, signature?: string) => {
    const req = request(w.h.created.app).post('/api/billing/webhook').set('Content-Type', 'application/json');
    return (signature === undefined ? req : req.set('Stripe-Signature', signature)).send(payload);
  };

  it('a replayed event changes nothing; a forged, stale or missing signature answers 400 and changes nothing', async () => {
    const { fixture, manager, contactBrowsers } = await billedPrograms(w, [{ targets: 1, hours: [1, 0] }]);
    const invoice = await issuedInvoice(manager, fixture.cycleId, fixture.proposalIds[0]);
    await contactBrowsers[0]
      .post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.success, invoice.version))
      .then((r) => expect(r.status).toBe(202));
    await eventually(async () => (await invoiceState(invoice.id)) === 'paid', 'the invoice to be paid');
    const event = eventsOf(invoice.id, 'payment_intent.succeeded')[0];
    const payload = JSON.stringify(event);
    const before = await db()('invoices').where({ id: invoice.id }).first();
    const audits = Number((await db()('audit_log').where({ entity: 'invoice', entity_id: invoice.id }).count('* as n'))[0].n);
    const replay = await postEvent(payload, sign(payload));
    expect(replay.status).toBe(200);
    expect(replay.body).toEqual({ received: true, duplicate: true });
    expect(await db()('invoices').where({ id: invoice.id }).first()).toEqual(before);
    expect(Number((await db()('audit_log').where({ entity: 'invoice', entity_id: invoice.id }).count('* as n'))[0].n)).toBe(audits);

    // An unseen event id, so that only the signature stands in the way.
    const fresh = JSON.stringify({ ...event, id: `evt_forged_${invoice.id}` });
    const forged = Stripe.webhooks.generateTestHeaderString({ payload: fresh, secret: 'whsec_not_ours' });
    for (const signature of [forged, sign(fresh, Math.floor(Date.now() / 1000) - 3600), undefined, 't=1,v1=00']) {
      const res = await postEvent(fresh, signature);
      expect(res.status).toBe(400);
    }
    expect(
      await db()('payment_events')
        .where({ event_id: `evt_forged_${invoice.id}` })
        .first(),
    ).toBeUndefined();
    expect(await db()('invoices').where({ id: invoice.id }).first()).toEqual(before);
  });

  it('the provider down: a clear 503, the invoice stays issued, and the same payment works once it is back', async () => {
    const { fixture, manager, contactBrowsers } = await billedPrograms(w, [{ targets: 1, hours: [1, 0] }]);
    const invoice = await issuedInvoice(manager, fixture.cycleId, fixture.proposalIds[0]);
    await w.stopFake();
    try {
      const down = await contactBrowsers[0].post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.success, invoice.version));
      expect(down.status).toBe(503);
      expect(down.body.message).toMatch(/cannot be reached/);
      expect(await invoiceState(invoice.id)).toBe('issued');
    } finally {
      await w.restartFake();
    }
    const retry = await contactBrowsers[0].post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.success, invoice.version));
    expect(retry.status).toBe(202);
    await eventually(async () => (await invoiceState(invoice.id)) === 'paid', 'the invoice to be paid');
  });

  it('the app killed between the charge and the event: once it is back, the retried event pays the invoice exactly once', async () => {
    const { fixture, manager, contactBrowsers } = await billedPrograms(w, [{ targets: 1, hours: [1, 0] }]);
    const invoice = await issuedInvoice(manager, fixture.cycleId, fixture.proposalIds[0]);
    w.fake.pauseWebhooks();
    const charged = await contactBrowsers[0].post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.success, invoice.version));
    expect(charged.status).toBe(202);
    w.front.handler = null; // the app is gone: connections are dropped
    w.fake.resumeWebhooks();
    // The provider tries to deliver its event and fails while the app is down.
    await w.fake.waitForDelivery(
      (d) => d.eventType === 'payment_intent.succeeded' && d.payload.includes(`"invoice_id": "${invoice.id}"`) && d.attemptCount >= 2,
      8000,
    );
    expect(await invoiceState(invoice.id)).toBe('issued');
    await w.restartApp();
    await eventually(async () => (await invoiceState(invoice.id)) === 'paid', 'the invoice to be paid after the restart', 15_000);
    const paidAudits = await db()('audit_log').where({ entity: 'invoice', entity_id: invoice.id, action: 'paid' });
    expect(paidAudits).toHaveLength(1);
  });

  it('a refund: asked by a manager, refunded when the provider says so, mailed', async () => {
    const { fixture, manager, contactBrowsers } = await billedPrograms(w, [{ targets: 1, hours: [1, 0] }]);
    const invoice = await issuedInvoice(manager, fixture.cycleId, fixture.proposalIds[0]);
    await contactBrowsers[0].post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.success, invoice.version));
    await eventually(async () => (await invoiceState(invoice.id)) === 'paid', 'the invoice to be paid');
    const paid = (await manager.get(`/api/billing/invoices/${invoice.id}`).expect(200)).body;
    const asked = await manager.post(`/api/billing/invoices/${invoice.id}/refund`, {
      version: paid.version,
      reason: 'Node out of service for the campaign',
    });
    expect(asked.status).toBe(200);
    expect(asked.body).toMatchObject({ state: 'paid', refundPending: true });
    await eventually(async () => (await invoiceState(invoice.id)) === 'refunded', 'the invoice to be refunded');
    await w.h.mail.waitFor((m) => m.subject.startsWith(`Invoice ${invoice.number} refunded`));
    // A void is for unpaid invoices only.
    const voided = await manager.post(`/api/billing/invoices/${invoice.id}/void`, { version: asked.body.version + 1, reason: 'x' });
    expect(voided.status).toBe(409);
  });
});

describe('card numbers', () => {
  it('never reach the database, the logs or the mails', async () => {
    const { fixture, manager, contactBrowsers } = await billedPrograms(w, [{ targets: 1, hours: [1, 0] }]);
    const invoice = await issuedInvoice(manager, fixture.cycleId, fixture.proposalIds[0]);
    await contactBrowsers[0].post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.declined, invoice.version));
    const next = (await contactBrowsers[0].get(`/api/billing/invoices/${invoice.id}`).expect(200)).body;
    await contactBrowsers[0].post(`/api/billing/invoices/${invoice.id}/payments`, card(CARDS.success, next.version));
    await eventually(async () => (await invoiceState(invoice.id)) === 'paid', 'the invoice to be paid');
    const tables = ['invoices', 'payment_attempts', 'payment_events', 'audit_log', 'mail_outbox'];
    for (const table of tables) {
      const { rows } = await db().raw(`SELECT count(*)::int AS n FROM ${table} t WHERE row_to_json(t)::text ~ ?`, [
        `(${CARDS.success}|${CARDS.declined})`,
      ]);
      expect({ table, n: rows[0].n }).toEqual({ table, n: 0 });
    }
    const logged = w.logs.filter((l) => l.includes(CARDS.success) || l.includes(CARDS.declined) || l.includes('"cvc"'));
    expect(logged).toEqual([]);
    expect(w.logs.length).toBeGreaterThan(0);
    for (const m of w.h.mail.messages()) expect(m.text).not.toMatch(new RegExp(`${CARDS.success}|${CARDS.declined}`));
  });
});
