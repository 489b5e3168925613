/**
 * Billing (`npm run bench -- billing`): 200 awarded programs of a released cycle, each with a
 * billing contact; the facility manager prepares the drafts and issues the 200 invoices, then every
 * contact pays by card through the payment fake (fakes/payments, via the provider's SDK, ten
 * payments at a time), and the fake's signed events mark them paid. Prints the time of each phase
 * and checks the counts: 200 payments must give exactly 200 charges at the fake and 200 paid
 * invoices. Runs on the test database (throw-away rows, as the API tests make them).
 */
import { startBillingWorld, billedPrograms, card, CARDS } from '../api/support/billing-kit';
import { bringUpBenchDatabase } from './support/bench-network';

const PROGRAMS = 200;
const CONCURRENCY = 10;
const s = (ms: number) => `${(ms / 1000).toFixed(2)} s`;

async function inBatches<T>(items: T[], size: number, each: (item: T) => Promise<void>): Promise<void> {
  for (let i = 0; i < items.length; i += size) await Promise.all(items.slice(i, i + size).map(each));
}

export default async function (): Promise<void> {
  const database = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
  // The 600 throw-away accounts (PI, co-investigator and billing contact of each program) are
  // hashed at the tests' scrypt cost, as in the API tests: setting up is not what is measured.
  process.env.SCRYPT_LOG_N ??= '11';
  await bringUpBenchDatabase(database);
  const w = await startBillingWorld(null, {
    PGDATABASE: database,
    NODE_ENV: 'test',
    LOG_LEVEL: 'silent',
    LOGIN_RATE_LIMIT: 100_000,
  });
  try {
    const tSetup = performance.now();
    const world = await billedPrograms(
      w,
      Array.from({ length: PROGRAMS }, (_, i) => ({ targets: 1, hours: [1 + (i % 7) * 0.25, i % 3 === 0 ? 2.5 : 0] })),
    );
    console.log(`${PROGRAMS} awarded programs with their billing contacts set up in ${s(performance.now() - tSetup)}`);
    const db = w.h.created.ctx.db;
    const ids = new Set(world.fixture.proposalIds);

    const t0 = performance.now();
    const prepared = await world.manager.post(`/api/billing/cycles/${world.fixture.cycleId}/invoices`);
    if (prepared.status !== 200) throw new Error(`prepare: ${prepared.status} ${JSON.stringify(prepared.body)}`);
    const { invoices } = (await world.manager.get(`/api/billing/cycles/${world.fixture.cycleId}`)).body as {
      invoices: { id: number; version: number; proposalId: number }[];
    };
    const mine = invoices.filter((i) => ids.has(i.proposalId));
    const tPrepared = performance.now();
    const issued = new Map<number, { id: number; version: number }>();
    await inBatches(mine, CONCURRENCY, async (i) => {
      const res = await world.manager.post(`/api/billing/invoices/${i.id}/issue`, { version: i.version });
      if (res.status !== 200) throw new Error(`issue ${i.id}: ${res.status} ${JSON.stringify(res.body)}`);
      issued.set(i.proposalId, { id: res.body.id, version: res.body.version });
    });
    const tIssued = performance.now();
    await inBatches(world.fixture.proposalIds, CONCURRENCY, async (proposalId) => {
      const k = world.fixture.proposalIds.indexOf(proposalId);
      const inv = issued.get(proposalId)!;
      const res = await world.contactBrowsers[k].post(`/api/billing/invoices/${inv.id}/payments`, card(CARDS.success, inv.version));
      if (res.status !== 202) throw new Error(`pay ${inv.id}: ${res.status} ${JSON.stringify(res.body)}`);
    });
    const tPaidAsked = performance.now();
    const invoiceIds = [...issued.values()].map((i) => i.id);
    const paidCount = async () => Number((await db('invoices').whereIn('id', invoiceIds).where('state', 'paid').count('* as n'))[0].n);
    for (let k = 0; k < 600 && (await paidCount()) < invoiceIds.length; k++) await new Promise((r) => setTimeout(r, 100));
    const tDone = performance.now();

    const paid = await paidCount();
    const wanted = new Set(invoiceIds.map(String));
    const charges = new Set(
      w.fake
        .events()
        .filter((e) => e.type === 'payment_intent.succeeded')
        .filter((e) => wanted.has((e.data.object.metadata as Record<string, string> | undefined)?.invoice_id ?? ''))
        .map((e) => String(e.data.object.latest_charge ?? e.data.object.id)),
    );
    console.log(
      `prepare the drafts: ${s(tPrepared - t0)}; issue ${mine.length} invoices (numbers, PDFs, mails): ${s(tIssued - tPrepared)}`,
    );
    console.log(
      `pay ${PROGRAMS} by card, ${CONCURRENCY} at a time: ${s(tPaidAsked - tIssued)}; until every signed event has marked its invoice paid: ${s(tDone - tIssued)}`,
    );
    console.log(
      `total: ${s(tDone - t0)}; ${PROGRAMS} payments → ${charges.size} charges at the fake, ${paid} paid invoices (both must be ${PROGRAMS})`,
    );
  } finally {
    await w.close();
  }
}
