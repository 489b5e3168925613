import { addDays, formatISO, startOfDay } from 'date-fns';
import type { Knex } from 'knex';
import { sumMinor } from '../../shared/src/billing/billing';
import { findAccountByEmail } from '../../server/src/features/accounts/account-repository';
import {
  allocateInvoiceNumber,
  insertDraft,
  listBillablePrograms,
  replaceLines,
} from '../../server/src/features/billing/billing-repository';
import { formatInvoiceNumber, invoiceLines } from '../../server/src/features/billing/invoice-service';

/**
 * Demo fees: the demo billing contact (billing@halcyon.example) is the accepted billing contact
 * of the first three programs of the "<year>-R0" cycle (05-night-plans released it). Their
 * invoices: one paid a week ago by card, one issued forty days ago and now overdue, one issued
 * this week; the other programs have drafts for the facility manager to issue. Numbers come from
 * the same gapless counter the app uses. No mail is sent and the payment provider is not called:
 * the paid invoice has no payment at the provider (its refund is for the finance office).
 *
 * Idempotent: 01-demo's TRUNCATE … CASCADE empties the billing tables; the counter is reset here.
 */
export async function seed(db: Knex): Promise<void> {
  const year = startOfDay(new Date()).getUTCFullYear();
  const cycle = (await db('cycles').where('code', `${year}-R0`).first('id', 'code')) as { id: number; code: string } | undefined;
  if (!cycle) throw new Error(`06-billing needs the cycle ${year}-R0 of 03-review`);
  const manager = (await findAccountByEmail(db, 'manager@halcyon.example'))!;
  const billing = (await findAccountByEmail(db, 'billing@halcyon.example'))!;
  const now = new Date();

  await db.transaction(async (trx) => {
    if (!(await trx('invoices').first('id'))) await trx('invoice_number_counters').del();
    const programs = await listBillablePrograms(trx, cycle.id);
    // A different rate for outside programs on one node, to show the rate card's two columns.
    const firstNode = programs[0]?.nodes[0];
    if (firstNode)
      await trx('nodes')
        .where('id', firstNode.nodeId)
        .update({ external_rate_minor_per_hour: Math.round(firstNode.academic * 1.6) });

    for (const [k, program] of programs.entries()) {
      const currency = program.nodes[0].currency;
      const lines = invoiceLines(program, currency, cycle.code);
      const id = await insertDraft(trx, {
        proposalId: program.proposalId,
        cycleId: cycle.id,
        rateClass: program.rateClass,
        currency,
        totalMinor: sumMinor(lines.map((l) => l.amountMinor)),
        createdBy: manager.id,
      });
      await replaceLines(trx, id, lines);
      if (k >= 3) continue;

      await trx('program_billing_contacts').insert({
        proposal_id: program.proposalId,
        email: billing.email.toLowerCase(),
        account_id: billing.id,
        invited_by: manager.id,
        invited_at: addDays(now, -45),
        accepted_at: addDays(now, -44),
      });
      const issuedAt = addDays(now, k === 1 ? -40 : k === 0 ? -20 : -3);
      const number = formatInvoiceNumber(year, await allocateInvoiceNumber(trx, year));
      await trx('invoices')
        .where({ id })
        .update({
          state: k === 0 ? 'paid' : 'issued',
          number,
          issued_at: issuedAt,
          issued_by: manager.id,
          due_date: formatISO(addDays(issuedAt, 30), { representation: 'date' }),
          paid_at: k === 0 ? addDays(now, -7) : null,
          version: 2,
        });
      const total = sumMinor(lines.map((l) => l.amountMinor));
      await trx('audit_log').insert({
        at: issuedAt,
        actor_account_id: manager.id,
        cycle_id: cycle.id,
        entity: 'invoice',
        entity_id: id,
        action: 'issued',
        before: JSON.stringify({ state: 'draft', number: null, totalMinor: total }),
        after: JSON.stringify({ state: 'issued', number }),
        reason: null,
      });
      if (k === 0) {
        await trx('payment_attempts').insert({
          invoice_id: id,
          idempotency_key: `demo-invoice-${id}-v2`,
          state: 'succeeded',
          card_brand: 'Visa',
          card_last4: '4242',
          amount_minor: total,
          created_by: billing.id,
          created_at: addDays(now, -7),
        });
      }
    }
  });
}
