import type { Knex } from 'knex';
import { BILLING_CAUTION } from '@spincycle/shared/billing/billing';
import { formatMinorUnits } from '@spincycle/shared/proposals/money';
import type { AppContext } from '../../app-context';
import { enqueueMail } from '../../mail/outbox';
import type { StoredInvoice } from './billing-repository';

export type InvoiceMailKind = 'invoice' | 'receipt' | 'void' | 'refund';

/** Subject and text of the mails about an invoice (plain text; the PDF attached where there is one). */
export function writeInvoiceMail(kind: InvoiceMailKind, i: StoredInvoice, publicUrl: string): { subject: string; text: string } {
  const amount = formatMinorUnits(i.totalMinor, i.currency);
  const link = `${publicUrl}/fees/invoices/${i.id}`;
  const head = ['Hello,', ''];
  const foot = ['', BILLING_CAUTION, '', 'Spincycle'];
  switch (kind) {
    case 'invoice':
      return {
        subject: `Invoice ${i.number}: node-hour fees of "${i.programTitle}" (${amount})`,
        text: [
          ...head,
          `Invoice ${i.number} for the node-hours awarded to "${i.programTitle}" in cycle ${i.cycleCode} is attached.`,
          `Amount: ${amount}. Due: ${i.dueDate}.`,
          '',
          `Pay it by card in Spincycle: ${link}`,
          ...foot,
        ].join('\n'),
      };
    case 'receipt':
      return {
        subject: `Receipt for invoice ${i.number} (${amount})`,
        text: [
          ...head,
          `Thank you: invoice ${i.number} of "${i.programTitle}" is paid (${amount}). The receipt is attached.`,
          '',
          `The invoice in Spincycle: ${link}`,
          ...foot,
        ].join('\n'),
      };
    case 'void':
      return {
        subject: `Invoice ${i.number} is void`,
        text: [
          ...head,
          `Invoice ${i.number} of "${i.programTitle}" (${amount}) has been voided by the facility managers and is no longer to be paid.`,
          `Reason: ${i.voidReason ?? '—'}`,
          ...foot,
        ].join('\n'),
      };
    case 'refund':
      return {
        subject: `Invoice ${i.number} refunded (${amount})`,
        text: [
          ...head,
          `The payment of invoice ${i.number} of "${i.programTitle}" (${amount}) has been refunded to the card it was paid with.`,
          'Card refunds usually take a few working days to appear on a statement.',
          `Reason: ${i.refundReason ?? '—'}`,
          ...foot,
        ].join('\n'),
      };
  }
}

/** Queues the mail about an invoice in the caller's transaction and answers its outbox id (deliverMail after the commit). */
export async function queueInvoiceMail(
  trx: Knex.Transaction,
  ctx: Pick<AppContext, 'config'>,
  kind: InvoiceMailKind,
  invoice: StoredInvoice,
  to: string[],
  pdf: Buffer | null,
): Promise<number | null> {
  if (!to.length) return null;
  const { subject, text } = writeInvoiceMail(kind, invoice, ctx.config.publicUrl);
  const filename = kind === 'receipt' ? `receipt-${invoice.number}.pdf` : `invoice-${invoice.number}.pdf`;
  return enqueueMail(
    trx,
    { to, subject, text, attachments: pdf ? [{ filename, content: pdf, contentType: 'application/pdf' }] : undefined },
    kind === 'receipt' ? 'receipt' : kind === 'invoice' ? 'invoice' : 'invoice_notice',
  );
}

/** The invitation of a billing contact. */
export function billingContactInvitation(input: { programTitle: string; inviter: string; link: string; signUp: string | null }) {
  return {
    subject: `You are invited as billing contact of "${input.programTitle}"`,
    text: [
      'Hello,',
      '',
      `${input.inviter} invites you to receive and pay the node-hour invoices of the program "${input.programTitle}" in Spincycle.`,
      ...(input.signUp ? ['First create your Spincycle account with this address:', input.signUp, ''] : []),
      'Then sign in and accept the invitation here:',
      input.link,
      '',
      'The link works once and for 14 days. If you did not expect this, ignore this mail.',
      '',
      'Spincycle',
    ].join('\n'),
  };
}
