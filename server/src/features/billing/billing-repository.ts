import type { Knex } from 'knex';
import type { InvoiceLine, InvoiceState, RateClass } from '@spincycle/shared/billing/billing';

/** One invoice row with its program's and cycle's names. */
export interface StoredInvoice {
  id: number;
  number: string | null;
  state: InvoiceState;
  proposalId: number;
  programTitle: string;
  piName: string;
  piAffiliation: string | null;
  cycleId: number;
  cycleCode: string;
  rateClass: RateClass;
  currency: string;
  totalMinor: number;
  dueDate: string | null;
  issuedAt: Date | null;
  paidAt: Date | null;
  voidedAt: Date | null;
  voidReason: string | null;
  refundRequestedAt: Date | null;
  refundReason: string | null;
  refundedAt: Date | null;
  paymentIntentId: string | null;
  chargeId: string | null;
  version: number;
  createdAt: Date;
}

interface InvoiceRow {
  id: number;
  number: string | null;
  state: InvoiceState;
  proposal_id: number;
  title: string;
  pi_name: string | null;
  pi_affiliation: string | null;
  cycle_id: number;
  cycle_code: string;
  rate_class: RateClass;
  currency: string;
  total_minor: number;
  due_date: string | null;
  issued_at: Date | null;
  paid_at: Date | null;
  voided_at: Date | null;
  void_reason: string | null;
  refund_requested_at: Date | null;
  refund_reason: string | null;
  refunded_at: Date | null;
  payment_intent_id: string | null;
  charge_id: string | null;
  version: number;
  created_at: Date;
}

function toInvoice(r: InvoiceRow): StoredInvoice {
  return {
    id: r.id,
    number: r.number,
    state: r.state,
    proposalId: r.proposal_id,
    programTitle: r.title,
    piName: r.pi_name ?? 'Former member',
    piAffiliation: r.pi_affiliation,
    cycleId: r.cycle_id,
    cycleCode: r.cycle_code,
    rateClass: r.rate_class,
    currency: r.currency,
    totalMinor: Number(r.total_minor),
    dueDate: r.due_date,
    issuedAt: r.issued_at,
    paidAt: r.paid_at,
    voidedAt: r.voided_at,
    voidReason: r.void_reason,
    refundRequestedAt: r.refund_requested_at,
    refundReason: r.refund_reason,
    refundedAt: r.refunded_at,
    paymentIntentId: r.payment_intent_id,
    chargeId: r.charge_id,
    version: r.version,
    createdAt: r.created_at,
  };
}

function invoiceQuery(db: Knex) {
  return db('invoices as i')
    .join('proposals as p', 'p.id', 'i.proposal_id')
    .join('cycles as c', 'c.id', 'i.cycle_id')
    .leftJoin('proposal_members as pm', function () {
      this.on('pm.proposal_id', 'p.id').andOnVal('pm.role', 'pi');
    })
    .leftJoin('accounts as a', 'a.id', 'pm.account_id')
    .select(
      'i.id',
      'i.number',
      'i.state',
      'i.proposal_id',
      'p.title',
      'a.display_name as pi_name',
      'a.affiliation as pi_affiliation',
      'i.cycle_id',
      'c.code as cycle_code',
      'i.rate_class',
      'i.currency',
      'i.total_minor',
      'i.due_date',
      'i.issued_at',
      'i.paid_at',
      'i.voided_at',
      'i.void_reason',
      'i.refund_requested_at',
      'i.refund_reason',
      'i.refunded_at',
      'i.payment_intent_id',
      'i.charge_id',
      'i.version',
      'i.created_at',
    );
}

export async function findInvoice(db: Knex, id: number, options: { forUpdate?: boolean } = {}): Promise<StoredInvoice | undefined> {
  if (options.forUpdate) await db('invoices').where({ id }).forUpdate().first('id');
  const row = (await invoiceQuery(db).where('i.id', id).first()) as InvoiceRow | undefined;
  return row && toInvoice(row);
}

export async function listInvoicesOfCycle(db: Knex, cycleId: number): Promise<StoredInvoice[]> {
  const rows = (await invoiceQuery(db)
    .where('i.cycle_id', cycleId)
    .orderBy([{ column: 'i.state' }, { column: 'i.id' }])) as InvoiceRow[];
  return rows.map(toInvoice);
}

/** Invoices a payer sees: issued or later, of programs where the account is an accepted billing contact or the PI. */
export async function listInvoicesOfPayer(db: Knex, accountId: number): Promise<StoredInvoice[]> {
  const rows = (await invoiceQuery(db)
    .whereNot('i.state', 'draft')
    .where((q) =>
      q
        .whereIn('i.proposal_id', db('program_billing_contacts').where({ account_id: accountId }).select('proposal_id'))
        .orWhere('pm.account_id', accountId),
    )
    .orderBy('i.issued_at', 'desc')) as InvoiceRow[];
  return rows.map(toInvoice);
}

export async function listInvoiceLines(db: Knex, invoiceId: number): Promise<InvoiceLine[]> {
  const rows = await db('invoice_lines').where({ invoice_id: invoiceId }).orderBy('position');
  return rows.map((r) => ({
    position: r.position,
    nodeId: r.node_id,
    description: r.description,
    hoursHundredths: Number(r.hours_hundredths),
    rateMinorPerHour: r.rate_minor_per_hour,
    amountMinor: Number(r.amount_minor),
  }));
}

/** An awarded program of a released cycle with its node-hours and each node's rates. */
export interface BillableProgram {
  proposalId: number;
  title: string;
  rateClass: RateClass;
  nodes: { nodeId: number; code: string; name: string; currency: string; hours: number; academic: number; external: number | null }[];
}

export async function listBillablePrograms(db: Knex, cycleId: number): Promise<BillableProgram[]> {
  const rows = await db('programs as g')
    .join('proposals as p', 'p.id', 'g.proposal_id')
    .join('awards as w', 'w.proposal_id', 'g.proposal_id')
    .join('award_nodes as an', 'an.proposal_id', 'g.proposal_id')
    .join('nodes as n', 'n.id', 'an.node_id')
    .where('g.cycle_id', cycleId)
    .where('w.outcome', 'awarded')
    .whereNot('g.state', 'withdrawn')
    .orderBy([{ column: 'g.proposal_id' }, { column: 'n.code' }])
    .select(
      'g.proposal_id',
      'p.title',
      'g.rate_class',
      'n.id as node_id',
      'n.code',
      'n.name',
      'n.currency',
      'an.node_hours',
      'n.rate_minor_per_hour',
      'n.external_rate_minor_per_hour',
    );
  const byProgram = new Map<number, BillableProgram>();
  for (const r of rows) {
    let p = byProgram.get(r.proposal_id);
    if (!p) {
      p = { proposalId: r.proposal_id, title: r.title, rateClass: r.rate_class, nodes: [] };
      byProgram.set(r.proposal_id, p);
    }
    p.nodes.push({
      nodeId: r.node_id,
      code: r.code,
      name: r.name,
      currency: String(r.currency).toUpperCase(),
      hours: Number(r.node_hours),
      academic: r.rate_minor_per_hour,
      external: r.external_rate_minor_per_hour,
    });
  }
  return [...byProgram.values()];
}

/** Currencies in which a program already has a draft, issued or paid invoice (with the draft's id). */
export async function listOpenInvoiceCurrencies(
  db: Knex,
  cycleId: number,
): Promise<Map<number, Map<string, { id: number; state: InvoiceState; version: number }>>> {
  const rows = await db('invoices')
    .where({ cycle_id: cycleId })
    .whereIn('state', ['draft', 'issued', 'paid'])
    .select('id', 'proposal_id', 'currency', 'state', 'version');
  const out = new Map<number, Map<string, { id: number; state: InvoiceState; version: number }>>();
  for (const r of rows) {
    const m = out.get(r.proposal_id) ?? new Map();
    m.set(r.currency, { id: r.id, state: r.state, version: r.version });
    out.set(r.proposal_id, m);
  }
  return out;
}

export interface LineInsert {
  nodeId: number;
  description: string;
  hoursHundredths: number;
  rateMinorPerHour: number;
  amountMinor: number;
}

export async function insertDraft(
  db: Knex,
  draft: { proposalId: number; cycleId: number; rateClass: RateClass; currency: string; totalMinor: number; createdBy: number },
): Promise<number> {
  const [row] = await db('invoices')
    .insert({
      proposal_id: draft.proposalId,
      cycle_id: draft.cycleId,
      rate_class: draft.rateClass,
      currency: draft.currency,
      total_minor: draft.totalMinor,
      created_by: draft.createdBy,
      state: 'draft',
    })
    .returning('id');
  return row.id;
}

export async function replaceLines(db: Knex, invoiceId: number, lines: LineInsert[]): Promise<void> {
  await db('invoice_lines').where({ invoice_id: invoiceId }).del();
  if (!lines.length) return;
  await db('invoice_lines').insert(
    lines.map((l, i) => ({
      invoice_id: invoiceId,
      position: i + 1,
      node_id: l.nodeId,
      description: l.description,
      hours_hundredths: l.hoursHundredths,
      rate_minor_per_hour: l.rateMinorPerHour,
      amount_minor: l.amountMinor,
    })),
  );
}

/**
 * The next invoice number of a year, allocated inside the caller's transaction: the counter row
 * stays locked until it commits (two issues wait for each other), and a rollback gives the number
 * back, so the issued numbers have no gaps.
 */
export async function allocateInvoiceNumber(trx: Knex.Transaction, year: number): Promise<number> {
  const { rows } = await trx.raw<{ rows: { last_number: number }[] }>(
    `INSERT INTO invoice_number_counters (year, last_number) VALUES (?, 1)
     ON CONFLICT (year) DO UPDATE SET last_number = invoice_number_counters.last_number + 1
     RETURNING last_number`,
    [year],
  );
  return rows[0].last_number;
}

/** Updates an invoice if it still has the version read; false when someone changed it meanwhile. */
export async function updateInvoice(db: Knex, id: number, version: number, changes: Record<string, unknown>): Promise<boolean> {
  const n = await db('invoices')
    .where({ id, version })
    .update({ ...changes, version: version + 1, updated_at: db.fn.now() });
  return n === 1;
}

// ---------------------------------------------------------------- contacts

export interface StoredContact {
  id: number;
  proposalId: number;
  email: string;
  accountId: number | null;
  name: string | null;
  invitedAt: Date;
  acceptedAt: Date | null;
}

export async function listContacts(db: Knex, proposalId: number): Promise<StoredContact[]> {
  const rows = await db('program_billing_contacts as b')
    .leftJoin('accounts as a', 'a.id', 'b.account_id')
    .where('b.proposal_id', proposalId)
    .orderBy('b.id')
    .select('b.id', 'b.proposal_id', 'b.email', 'b.account_id', 'a.display_name', 'b.invited_at', 'b.accepted_at');
  return rows.map((r) => ({
    id: r.id,
    proposalId: r.proposal_id,
    email: r.email,
    accountId: r.account_id,
    name: r.display_name ?? null,
    invitedAt: r.invited_at,
    acceptedAt: r.accepted_at,
  }));
}

export async function isBillingContact(db: Knex, proposalId: number, accountId: number): Promise<boolean> {
  return !!(await db('program_billing_contacts').where({ proposal_id: proposalId, account_id: accountId }).first('id'));
}

export async function isPi(db: Knex, proposalId: number, accountId: number): Promise<boolean> {
  return !!(await db('proposal_members').where({ proposal_id: proposalId, account_id: accountId, role: 'pi' }).first('id'));
}

/** Addresses invoices are mailed to: accepted billing contacts, or the PI when there are none. */
export async function invoiceRecipients(db: Knex, proposalId: number): Promise<string[]> {
  const contacts = await db('program_billing_contacts as b')
    .join('accounts as a', 'a.id', 'b.account_id')
    .where('b.proposal_id', proposalId)
    .select('a.email');
  if (contacts.length) return contacts.map((c) => c.email);
  const pi = await db('proposal_members as pm')
    .join('accounts as a', 'a.id', 'pm.account_id')
    .where({ 'pm.proposal_id': proposalId, 'pm.role': 'pi' })
    .first('a.email');
  return pi ? [pi.email] : [];
}

// ---------------------------------------------------------------- payments

export interface AttemptInsert {
  invoiceId: number;
  idempotencyKey: string;
  paymentIntentId: string | null;
  state: 'processing' | 'succeeded' | 'declined' | 'needs_authentication' | 'failed';
  message: string | null;
  declineCode: string | null;
  cardBrand: string | null;
  cardLast4: string | null;
  amountMinor: number;
  createdBy: number;
}

export async function insertAttempt(db: Knex, a: AttemptInsert): Promise<number> {
  const [row] = await db('payment_attempts')
    .insert({
      invoice_id: a.invoiceId,
      idempotency_key: a.idempotencyKey,
      payment_intent_id: a.paymentIntentId,
      state: a.state,
      message: a.message,
      decline_code: a.declineCode,
      card_brand: a.cardBrand,
      card_last4: a.cardLast4,
      amount_minor: a.amountMinor,
      created_by: a.createdBy,
    })
    .returning('id');
  return row.id;
}

export async function findAttemptByKey(db: Knex, invoiceId: number, key: string) {
  return db('payment_attempts')
    .where({ invoice_id: invoiceId, idempotency_key: key })
    .whereIn('state', ['processing', 'succeeded'])
    .first();
}

export async function listAttempts(db: Knex, invoiceId: number) {
  return db('payment_attempts').where({ invoice_id: invoiceId }).orderBy('created_at', 'desc').orderBy('id', 'desc');
}

/** Records a provider event id; false when it was handled before (a replayed webhook). */
export async function recordEvent(
  db: Knex,
  e: { eventId: string; type: string; invoiceId: number | null; outcome: string },
): Promise<boolean> {
  const rows = await db('payment_events')
    .insert({ event_id: e.eventId, type: e.type, invoice_id: e.invoiceId, outcome: e.outcome })
    .onConflict('event_id')
    .ignore()
    .returning('event_id');
  return rows.length === 1;
}
