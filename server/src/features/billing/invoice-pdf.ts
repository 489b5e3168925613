import PDFDocument from 'pdfkit';
import {
  BILLING_CAUTION,
  formatHundredths,
  INVOICE_STATE_LABELS,
  RATE_CLASS_LABELS,
  type InvoiceLine,
} from '@spincycle/shared/billing/billing';
import { formatMinorUnits } from '@spincycle/shared/proposals/money';
import { fonts } from '../proposals/submission/summary-pdf';
import type { StoredInvoice } from './billing-repository';

export interface InvoicePdfInput {
  invoice: StoredInvoice;
  lines: InvoiceLine[];
  /** Who the invoice is addressed to (billing contacts, or the PI). */
  billTo: string[];
  /** For a receipt: the card and the payment provider's reference. */
  payment?: { cardBrand: string | null; cardLast4: string | null; reference: string | null };
  generatedAt: Date;
}

const MARGIN = 56;
const INK = '#111111';
const NIGHT = '#1f2350';
const RULE = '#9aa0b4';

const day = (d: Date | string | null) => (d === null ? '—' : typeof d === 'string' ? d : d.toISOString().slice(0, 10));

/**
 * An invoice or its receipt as an A4 PDF (pdfkit): the number, dates, who it is for, one line per
 * node (hours × rate = amount), the total, and the caution that the consortium's own terms and local
 * tax rules govern. `compress: false` (tests) leaves the text readable in the file.
 */
export function renderInvoicePdf(
  kind: 'invoice' | 'receipt',
  input: InvoicePdfInput,
  options: { compress?: boolean } = {},
): Promise<Buffer> {
  const { invoice } = input;
  const title =
    kind === 'receipt'
      ? `Receipt for invoice ${invoice.number}`
      : invoice.number
        ? `Invoice ${invoice.number}`
        : 'Draft invoice (not issued)';
  const doc = new PDFDocument({
    size: 'A4',
    margin: MARGIN,
    compress: options.compress ?? true,
    info: { Title: title, Subject: `Node-hour fees, cycle ${invoice.cycleCode}`, Creator: 'Spincycle' },
  });
  const done = new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const f = fonts(doc);
  const width = doc.page.width - 2 * MARGIN;
  const money = (minor: number) => formatMinorUnits(minor, invoice.currency);

  doc.font(f.bold).fontSize(18).fillColor(NIGHT).text(title, MARGIN, MARGIN, { width });
  doc.moveDown(0.2).font(f.regular).fontSize(10).fillColor(INK).text('Spincycle node-hour fees', { width });
  doc.moveDown(0.8);
  const pair = (label: string, value: string) => doc.font(f.bold).text(`${label}: `, { continued: true }).font(f.regular).text(value);
  doc.fontSize(10);
  pair('Program', invoice.programTitle);
  pair('Principal investigator', invoice.piAffiliation ? `${invoice.piName}, ${invoice.piAffiliation}` : invoice.piName);
  pair('Cycle', invoice.cycleCode);
  pair('Billed to', input.billTo.length ? input.billTo.join(', ') : invoice.piName);
  pair('Rate', RATE_CLASS_LABELS[invoice.rateClass]);
  if (kind === 'invoice') {
    pair('Issued', day(invoice.issuedAt));
    pair('Due', day(invoice.dueDate));
    pair('Status', INVOICE_STATE_LABELS[invoice.state]);
  } else {
    pair('Paid', invoice.paidAt ? `${invoice.paidAt.toISOString().slice(0, 16).replace('T', ' ')} UTC` : '—');
    const card = input.payment?.cardLast4 ? `${input.payment.cardBrand ?? 'Card'} ending ${input.payment.cardLast4}` : 'Card';
    pair('Paid with', card);
    if (input.payment?.reference) pair('Payment reference', input.payment.reference);
  }

  // Lines: description | hours | rate per hour | amount.
  doc.moveDown(1);
  const cols = [
    { title: 'Node-hours awarded', w: width * 0.46, align: 'left' as const },
    { title: 'Hours', w: width * 0.14, align: 'right' as const },
    { title: 'Rate per hour', w: width * 0.18, align: 'right' as const },
    { title: 'Amount', w: width * 0.22, align: 'right' as const },
  ];
  const row = (cells: string[], bold: boolean) => {
    const y = doc.y;
    let x = MARGIN;
    let h = 0;
    doc.font(bold ? f.bold : f.regular).fontSize(9.5);
    cells.forEach((c, i) => {
      doc.text(c, x + 2, y, { width: cols[i].w - 4, align: cols[i].align });
      h = Math.max(h, doc.y - y);
      x += cols[i].w;
    });
    doc.y = y + h + 3;
    doc
      .moveTo(MARGIN, doc.y - 1.5)
      .lineTo(MARGIN + width, doc.y - 1.5)
      .lineWidth(bold ? 0.8 : 0.3)
      .strokeColor(RULE)
      .stroke();
  };
  row(
    cols.map((c) => c.title),
    true,
  );
  for (const l of input.lines)
    row([l.description, formatHundredths(l.hoursHundredths), money(l.rateMinorPerHour), money(l.amountMinor)], false);
  row(['Total', '', '', money(invoice.totalMinor)], true);
  doc.x = MARGIN;

  doc.moveDown(1).font(f.regular).fontSize(9.5).fillColor(INK);
  if (kind === 'invoice') {
    doc.text(
      invoice.state === 'draft'
        ? 'This is a draft for the facility managers; it is not a request for payment.'
        : 'Pay by card in Spincycle (Fees), or as the consortium’s finance office instructs. Quote the invoice number with any payment.',
      { width },
    );
  } else {
    doc.text(`Received with thanks: ${money(invoice.totalMinor)}.`, { width });
  }
  doc.moveDown(0.6).fontSize(8.5).fillColor('#444444').text(BILLING_CAUTION, { width });
  doc.moveDown(0.4).text(`Generated ${input.generatedAt.toISOString().slice(0, 16).replace('T', ' ')} UTC.`, { width });
  doc.end();
  return done;
}
