import { addDays, formatISO } from 'date-fns';
import type { Knex } from 'knex';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { hasAnyRole } from '@spincycle/shared/accounts/roles';
import {
  BILLING_CAUTION,
  hoursToHundredths,
  INVOICE_PAYMENT_DAYS,
  lineAmountMinor,
  sumMinor,
  type FeesCycleSummary,
  type FeesSummary,
  type FeeTotals,
  type InvoiceDetail,
  type InvoiceSummary,
  type RateCardRow,
  type RateClass,
  type VersionedReasonInput,
} from '@spincycle/shared/billing/billing';
import type { AppContext } from '../../app-context';
import { AppError } from '../../http/app-error';
import { insertAudit, type AuditEntity } from '../awards/award-repository';
import {
  allocateInvoiceNumber,
  findInvoice,
  insertDraft,
  invoiceRecipients,
  isBillingContact,
  isPi,
  listAttempts,
  listBillablePrograms,
  listContacts,
  listInvoiceLines,
  listInvoicesOfCycle,
  listInvoicesOfPayer,
  listOpenInvoiceCurrencies,
  replaceLines,
  updateInvoice,
  type LineInsert,
  type StoredInvoice,
} from './billing-repository';
import { deliverMail } from '../../mail/outbox';
import { queueInvoiceMail } from './billing-mail';
import { renderInvoicePdf } from './invoice-pdf';
import { paymentClient, isConnectionError } from './payment-provider';

const INVOICE: AuditEntity = 'invoice';

export const invoiceNotFound = (id: number) => new AppError('invoice_not_found', `No invoice ${id}`, 404);
const cycleNotFound = (id: number) => new AppError('cycle_not_found', `No cycle ${id}`, 404);
export const staleInvoice = () =>
  new AppError('stale_version', 'The invoice changed since you opened it (someone else acted on it). Reload it and try again.', 409);

/** "2027-0001" → "SC-2027-0001": the consortium's invoice numbers, one gapless sequence a year. */
export const formatInvoiceNumber = (year: number, n: number) => `SC-${year}-${String(n).padStart(4, '0')}`;

const today = (now: Date) => formatISO(now, { representation: 'date' });
const isoOrNull = (d: Date | null) => (d ? d.toISOString() : null);

export function toSummary(i: StoredInvoice, now: Date): InvoiceSummary {
  return {
    id: i.id,
    number: i.number,
    state: i.state,
    proposalId: i.proposalId,
    programTitle: i.programTitle,
    piName: i.piName,
    cycleId: i.cycleId,
    cycleCode: i.cycleCode,
    rateClass: i.rateClass,
    currency: i.currency,
    totalMinor: i.totalMinor,
    dueDate: i.dueDate,
    issuedAt: isoOrNull(i.issuedAt),
    paidAt: isoOrNull(i.paidAt),
    overdue: i.state === 'issued' && i.dueDate !== null && i.dueDate < today(now),
    refundPending: i.state === 'paid' && i.refundRequestedAt !== null,
    version: i.version,
  };
}

/** What the viewer may do with an invoice; 404 when the viewer may not see it at all. */
export async function invoiceAccess(db: Knex, viewer: SessionUser, invoice: StoredInvoice) {
  const manager = hasAnyRole(viewer, 'facility_manager');
  const contact = invoice.state !== 'draft' && (await isBillingContact(db, invoice.proposalId, viewer.id));
  const pi = invoice.state !== 'draft' && !contact && (await isPi(db, invoice.proposalId, viewer.id));
  if (!manager && !contact && !pi) throw invoiceNotFound(invoice.id);
  return { manager, canPay: contact && invoice.state === 'issued' };
}

export async function invoiceDetail(db: Knex, viewer: SessionUser, invoice: StoredInvoice, now: Date): Promise<InvoiceDetail> {
  const access = await invoiceAccess(db, viewer, invoice);
  const [lines, contacts, attempts] = await Promise.all([
    listInvoiceLines(db, invoice.id),
    listContacts(db, invoice.proposalId),
    listAttempts(db, invoice.id),
  ]);
  return {
    ...toSummary(invoice, now),
    lines,
    billTo: {
      programTitle: invoice.programTitle,
      piName: invoice.piName,
      piAffiliation: invoice.piAffiliation,
      contacts: contacts.map((c) => ({
        id: c.id,
        email: c.email,
        name: c.name,
        acceptedAt: isoOrNull(c.acceptedAt),
        invitedAt: c.invitedAt.toISOString(),
      })),
    },
    payments: attempts.map((a) => ({
      id: a.id,
      state: a.state,
      message: a.message,
      cardBrand: a.card_brand,
      cardLast4: a.card_last4,
      amountMinor: Number(a.amount_minor),
      createdAt: a.created_at.toISOString(),
    })),
    voidReason: invoice.voidReason,
    refundReason: invoice.refundReason,
    refundedAt: isoOrNull(invoice.refundedAt),
    canPay: access.canPay,
    canManage: access.manager,
    caution: BILLING_CAUTION,
  };
}

// ---------------------------------------------------------------- managers

/** GET /api/billing/cycles: cycles whose awards were released, newest first. */
export async function listFeeCycles(ctx: AppContext): Promise<FeesCycleSummary[]> {
  const rows = await ctx
    .db('cycles')
    .whereNotNull('awards_released_at')
    .orderBy('campaign_start', 'desc')
    .select('id', 'code', 'title', 'awards_released_at');
  return rows.map((r) => ({ id: r.id, code: r.code, title: r.title, awardsReleasedAt: isoOrNull(r.awards_released_at) }));
}

async function requireReleasedCycle(db: Knex, cycleId: number, forUpdate = false) {
  const q = db('cycles').where({ id: cycleId });
  const cycle = await (forUpdate ? q.forUpdate() : q).first('id', 'code', 'title', 'awards_released_at');
  if (!cycle) throw cycleNotFound(cycleId);
  if (!cycle.awards_released_at) {
    throw new AppError(
      'awards_not_released',
      `The awards of cycle ${cycle.code} are not released yet: invoices bill released awards only.`,
      409,
    );
  }
  return cycle as { id: number; code: string; title: string; awards_released_at: Date };
}

async function rateCard(db: Knex, cycleId: number): Promise<RateCardRow[]> {
  const rows = await db('cycle_nodes as cn')
    .join('nodes as n', 'n.id', 'cn.node_id')
    .where('cn.cycle_id', cycleId)
    .orderBy('n.code')
    .select('n.id', 'n.code', 'n.name', 'n.currency', 'n.rate_minor_per_hour', 'n.external_rate_minor_per_hour');
  return rows.map((r) => ({
    nodeId: r.id,
    code: r.code,
    name: r.name,
    currency: String(r.currency).toUpperCase(),
    academicMinorPerHour: r.rate_minor_per_hour,
    externalMinorPerHour: r.external_rate_minor_per_hour ?? r.rate_minor_per_hour,
  }));
}

/** Totals per currency of a cycle's invoices (issued = everything billed and not voided). */
export function feeTotals(invoices: InvoiceSummary[]): FeeTotals[] {
  const by = new Map<string, FeeTotals>();
  for (const i of invoices) {
    const t = by.get(i.currency) ?? {
      currency: i.currency,
      draftMinor: 0,
      issuedMinor: 0,
      paidMinor: 0,
      outstandingMinor: 0,
      overdueMinor: 0,
      refundedMinor: 0,
      invoices: 0,
    };
    t.invoices++;
    if (i.state === 'draft') t.draftMinor = sumMinor([t.draftMinor, i.totalMinor]);
    if (i.state === 'issued' || i.state === 'paid' || i.state === 'refunded') t.issuedMinor = sumMinor([t.issuedMinor, i.totalMinor]);
    if (i.state === 'paid') t.paidMinor = sumMinor([t.paidMinor, i.totalMinor]);
    if (i.state === 'issued') t.outstandingMinor = sumMinor([t.outstandingMinor, i.totalMinor]);
    if (i.overdue) t.overdueMinor = sumMinor([t.overdueMinor, i.totalMinor]);
    if (i.state === 'refunded') t.refundedMinor = sumMinor([t.refundedMinor, i.totalMinor]);
    by.set(i.currency, t);
  }
  return [...by.values()].sort((a, b) => a.currency.localeCompare(b.currency));
}

/** GET /api/billing/cycles/:cycleId: the fees summary of a cycle. */
export async function getFeesSummary(ctx: AppContext, cycleId: number): Promise<FeesSummary> {
  const cycle = await requireReleasedCycle(ctx.db, cycleId);
  const now = ctx.now();
  const [stored, programs, open, card] = await Promise.all([
    listInvoicesOfCycle(ctx.db, cycleId),
    listBillablePrograms(ctx.db, cycleId),
    listOpenInvoiceCurrencies(ctx.db, cycleId),
    rateCard(ctx.db, cycleId),
  ]);
  const invoices = stored.map((i) => toSummary(i, now));
  const programsToInvoice = programs.filter((p) => {
    const have = open.get(p.proposalId);
    return p.nodes.some((n) => !have?.has(n.currency));
  }).length;
  return {
    cycle: { id: cycle.id, code: cycle.code, title: cycle.title, awardsReleasedAt: cycle.awards_released_at.toISOString() },
    totals: feeTotals(invoices),
    invoices,
    programsToInvoice,
    rateCard: card,
  };
}

/** The lines of a program's invoice in one currency: one per node, awarded hours × the program's rate. */
export function invoiceLines(
  program: {
    rateClass: RateClass;
    nodes: { nodeId: number; code: string; name: string; currency: string; hours: number; academic: number; external: number | null }[];
  },
  currency: string,
  cycleCode: string,
): LineInsert[] {
  return program.nodes
    .filter((n) => n.currency === currency)
    .map((n) => {
      const rate = program.rateClass === 'external' ? (n.external ?? n.academic) : n.academic;
      const hoursHundredths = hoursToHundredths(n.hours);
      return {
        nodeId: n.nodeId,
        description: `Node ${n.code} (${n.name}), cycle ${cycleCode}`,
        hoursHundredths,
        rateMinorPerHour: rate,
        amountMinor: lineAmountMinor(hoursHundredths, rate),
      };
    });
}

/**
 * POST /api/billing/cycles/:cycleId/invoices: a draft for every awarded program and currency that
 * has none yet (draft, issued or paid), and the drafts already there brought up to date with the
 * awards and rates. One transaction; the cycle row is locked so two managers never make two drafts.
 */
export async function prepareDrafts(ctx: AppContext, viewer: SessionUser, cycleId: number): Promise<{ created: number; updated: number }> {
  return ctx.db.transaction(async (trx) => {
    const cycle = await requireReleasedCycle(trx, cycleId, true);
    const programs = await listBillablePrograms(trx, cycleId);
    const open = await listOpenInvoiceCurrencies(trx, cycleId);
    let created = 0;
    let updated = 0;
    for (const p of programs) {
      const currencies = [...new Set(p.nodes.map((n) => n.currency))];
      for (const currency of currencies) {
        const lines = invoiceLines(p, currency, cycle.code);
        const total = sumMinor(lines.map((l) => l.amountMinor));
        const existing = open.get(p.proposalId)?.get(currency);
        if (!existing) {
          const id = await insertDraft(trx, {
            proposalId: p.proposalId,
            cycleId,
            rateClass: p.rateClass,
            currency,
            totalMinor: total,
            createdBy: viewer.id,
          });
          await replaceLines(trx, id, lines);
          created++;
        } else if (existing.state === 'draft') {
          await replaceLines(trx, existing.id, lines);
          await updateInvoice(trx, existing.id, existing.version, { total_minor: total, rate_class: p.rateClass });
          updated++;
        }
      }
    }
    return { created, updated };
  });
}

async function lockedInvoice(trx: Knex.Transaction, id: number, version: number): Promise<StoredInvoice> {
  const invoice = await findInvoice(trx, id, { forUpdate: true });
  if (!invoice) throw invoiceNotFound(id);
  if (invoice.version !== version) throw staleInvoice();
  return invoice;
}

async function audit(
  trx: Knex,
  viewer: SessionUser | null,
  invoice: StoredInvoice,
  action: string,
  after: unknown,
  reason: string | null,
  at: Date,
) {
  await insertAudit(trx, [
    {
      actorAccountId: viewer?.id ?? null,
      cycleId: invoice.cycleId,
      entity: INVOICE,
      entityId: invoice.id,
      action,
      before: { state: invoice.state, number: invoice.number, totalMinor: invoice.totalMinor },
      after,
      reason,
      at,
    },
  ]);
}

/**
 * POST /api/billing/invoices/:id/issue: numbers a draft (the next number of the year, allocated in
 * this transaction: no gaps), sets its due date and mails it with its PDF to the program's billing
 * contacts (or its PI when it has none) through the outbox, in the same transaction.
 */
export async function issueInvoice(ctx: AppContext, viewer: SessionUser, id: number, version: number): Promise<InvoiceDetail> {
  const now = ctx.now();
  const invoice = await ctx.db.transaction(async (trx) => {
    const draft = await lockedInvoice(trx, id, version);
    if (draft.state !== 'draft') throw new AppError('invoice_not_draft', `Invoice ${draft.number} is already issued.`, 409);
    const lines = await listInvoiceLines(trx, id);
    if (!lines.length)
      throw new AppError('invoice_empty', 'This draft has no lines: prepare the drafts again after the awards are decided.', 409);
    const year = now.getUTCFullYear();
    const number = formatInvoiceNumber(year, await allocateInvoiceNumber(trx, year));
    const dueDate = today(addDays(now, INVOICE_PAYMENT_DAYS));
    if (!(await updateInvoice(trx, id, version, { state: 'issued', number, issued_at: now, issued_by: viewer.id, due_date: dueDate })))
      throw staleInvoice();
    await audit(trx, viewer, draft, 'issued', { state: 'issued', number, dueDate }, null, now);
    const issued = (await findInvoice(trx, id))!;
    const billTo = await invoiceRecipients(trx, issued.proposalId);
    const pdf = await renderInvoicePdf('invoice', { invoice: issued, lines, billTo, generatedAt: now });
    const mailId = await queueInvoiceMail(trx, ctx, 'invoice', issued, billTo, pdf);
    return { issued, mailId };
  });
  if (invoice.mailId !== null) await deliverMail(ctx, [invoice.mailId]);
  return invoiceDetail(ctx.db, viewer, invoice.issued, now);
}

/** DELETE /api/billing/invoices/:id (a draft only): managers prepare drafts again when they want it back. */
export async function discardDraft(ctx: AppContext, id: number, version: number): Promise<void> {
  await ctx.db.transaction(async (trx) => {
    const draft = await lockedInvoice(trx, id, version);
    if (draft.state !== 'draft') throw new AppError('invoice_not_draft', `Invoice ${draft.number} is issued: void it instead.`, 409);
    await trx('invoices').where({ id }).del();
  });
}

/** POST /api/billing/invoices/:id/void: an issued, unpaid invoice is voided with a reason (it keeps its number). */
export async function voidInvoice(ctx: AppContext, viewer: SessionUser, id: number, input: VersionedReasonInput): Promise<InvoiceDetail> {
  const now = ctx.now();
  const invoice = await ctx.db.transaction(async (trx) => {
    const issued = await lockedInvoice(trx, id, input.version);
    if (issued.state !== 'issued') {
      throw new AppError(
        'invoice_not_voidable',
        issued.state === 'draft'
          ? 'A draft is not voided: discard it.'
          : issued.state === 'paid'
            ? `Invoice ${issued.number} is paid: refund it instead.`
            : `Invoice ${issued.number} is already ${issued.state === 'void' ? 'voided' : 'refunded'}.`,
        409,
      );
    }
    if (
      !(await updateInvoice(trx, id, input.version, { state: 'void', voided_at: now, voided_by: viewer.id, void_reason: input.reason }))
    ) {
      throw staleInvoice();
    }
    await audit(trx, viewer, issued, 'voided', { state: 'void' }, input.reason, now);
    const voided = (await findInvoice(trx, id))!;
    const mailId = await queueInvoiceMail(trx, ctx, 'void', voided, await invoiceRecipients(trx, voided.proposalId), null);
    return { voided, mailId };
  });
  if (invoice.mailId !== null) await deliverMail(ctx, [invoice.mailId]);
  return invoiceDetail(ctx.db, viewer, invoice.voided, now);
}

/**
 * POST /api/billing/invoices/:id/refund: asks the payment provider to refund a paid invoice in full
 * (idempotency key from the invoice and its version). The invoice becomes refunded only when the
 * provider's signed event arrives; until then it shows the refund as pending. When the provider
 * cannot be reached nothing changes (503) and the manager may try again.
 */
export async function refundInvoice(ctx: AppContext, viewer: SessionUser, id: number, input: VersionedReasonInput): Promise<InvoiceDetail> {
  const now = ctx.now();
  const invoice = await ctx.db.transaction(async (trx) => {
    const paid = await lockedInvoice(trx, id, input.version);
    if (paid.state !== 'paid') throw new AppError('invoice_not_refundable', 'Only a paid invoice can be refunded.', 409);
    if (paid.refundRequestedAt)
      throw new AppError(
        'refund_pending',
        'A refund of this invoice was already asked for; it shows as refunded when the card processor confirms it.',
        409,
      );
    if (!paid.paymentIntentId)
      throw new AppError(
        'invoice_not_refundable',
        'This invoice was not paid by card in Spincycle: refund it as the finance office does.',
        409,
      );
    try {
      await paymentClient(ctx).refunds.create(
        { payment_intent: paid.paymentIntentId, metadata: { invoice_id: String(id) } },
        { idempotencyKey: `refund-invoice-${id}-${paid.createdAt.getTime()}-v${input.version}` },
      );
    } catch (err) {
      if (isConnectionError(err)) throw providerUnavailable();
      throw err;
    }
    if (
      !(await updateInvoice(trx, id, input.version, {
        refund_requested_at: now,
        refund_requested_by: viewer.id,
        refund_reason: input.reason,
      }))
    ) {
      throw staleInvoice();
    }
    await audit(trx, viewer, paid, 'refund_requested', { state: 'paid', refundPending: true }, input.reason, now);
    return (await findInvoice(trx, id))!;
  });
  return invoiceDetail(ctx.db, viewer, invoice, now);
}

export const providerUnavailable = () =>
  new AppError(
    'payment_provider_unavailable',
    'The card processor cannot be reached just now, so nothing was done. Try again in a few minutes; a repeated request is never charged twice.',
    503,
  );

/** PUT /api/billing/programs/:proposalId/rate-class: which rate the program's next drafts use. */
export async function setRateClass(
  ctx: AppContext,
  viewer: SessionUser,
  proposalId: number,
  rateClass: RateClass,
): Promise<{ rateClass: RateClass }> {
  const now = ctx.now();
  await ctx.db.transaction(async (trx) => {
    const program = await trx('programs').where({ proposal_id: proposalId }).forUpdate().first('cycle_id', 'rate_class');
    if (!program) throw new AppError('program_not_found', `No program ${proposalId}`, 404);
    if (program.rate_class === rateClass) return;
    await trx('programs').where({ proposal_id: proposalId }).update({ rate_class: rateClass, updated_at: now });
    await insertAudit(trx, [
      {
        actorAccountId: viewer.id,
        cycleId: program.cycle_id,
        entity: 'program',
        entityId: proposalId,
        action: 'rate_class',
        before: { rateClass: program.rate_class },
        after: { rateClass },
        reason: null,
        at: now,
      },
    ]);
  });
  return { rateClass };
}

// ---------------------------------------------------------------- payers

/** GET /api/billing/invoices: the viewer's invoices (billing contact or PI of the program), newest first. */
export async function listMyInvoices(ctx: AppContext, viewer: SessionUser): Promise<InvoiceSummary[]> {
  const now = ctx.now();
  return (await listInvoicesOfPayer(ctx.db, viewer.id)).map((i) => toSummary(i, now));
}

export async function getInvoice(ctx: AppContext, viewer: SessionUser, id: number): Promise<InvoiceDetail> {
  const invoice = await findInvoice(ctx.db, id);
  if (!invoice) throw invoiceNotFound(id);
  return invoiceDetail(ctx.db, viewer, invoice, ctx.now());
}

/** GET /api/billing/invoices/:id/invoice.pdf and /receipt.pdf (the receipt of a paid or refunded invoice). */
export async function invoiceFile(ctx: AppContext, viewer: SessionUser, id: number, kind: 'invoice' | 'receipt') {
  const invoice = await findInvoice(ctx.db, id);
  if (!invoice) throw invoiceNotFound(id);
  await invoiceAccess(ctx.db, viewer, invoice);
  if (kind === 'receipt' && invoice.state !== 'paid' && invoice.state !== 'refunded') {
    throw new AppError('not_paid', 'There is no receipt: this invoice is not paid.', 404);
  }
  const [lines, billTo] = await Promise.all([listInvoiceLines(ctx.db, id), invoiceRecipients(ctx.db, invoice.proposalId)]);
  const attempt =
    kind === 'receipt' && invoice.paymentIntentId
      ? await ctx
          .db('payment_attempts')
          .where({ invoice_id: id, payment_intent_id: invoice.paymentIntentId })
          .first('card_brand', 'card_last4')
      : undefined;
  const pdf = await renderInvoicePdf(kind, {
    invoice,
    lines,
    billTo,
    payment:
      kind === 'receipt'
        ? { cardBrand: attempt?.card_brand ?? null, cardLast4: attempt?.card_last4 ?? null, reference: invoice.paymentIntentId }
        : undefined,
    generatedAt: ctx.now(),
  });
  const name = (invoice.number ?? `draft-${invoice.id}`).replace(/[^A-Za-z0-9-]/g, '');
  return { filename: kind === 'receipt' ? `receipt-${name}.pdf` : `invoice-${name}.pdf`, body: pdf };
}
