import type { Request, Response } from 'express';
import { z } from 'zod';
import {
  inviteBillingContactSchema,
  issueInvoiceSchema,
  payInvoiceSchema,
  rateClassSchema,
  versionedReasonSchema,
} from '@spincycle/shared/billing/billing';
import { idParam } from '@spincycle/shared/http/ids';
import type { AppContext } from '../../app-context';
import { acceptContactInvitation, getProgramBilling, inviteContact, removeContact } from './billing-contact-service';
import {
  discardDraft,
  getFeesSummary,
  getInvoice,
  invoiceFile,
  issueInvoice,
  listFeeCycles,
  listMyInvoices,
  prepareDrafts,
  refundInvoice,
  setRateClass,
  voidInvoice,
} from './invoice-service';
import { handlePaymentEvent, payInvoice } from './payment-service';

const cycleParams = z.object({ cycleId: idParam });
const invoiceParams = z.object({ invoiceId: idParam });
const programParams = z.object({ proposalId: idParam });
const contactParams = z.object({ proposalId: idParam, contactId: idParam });
const tokenParams = z.object({ token: z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, 'is not an invitation link') });
const versionQuery = z.object({ version: idParam });

const sendPdf = (res: Response, file: { filename: string; body: Buffer }) => {
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Disposition', `attachment; filename="${file.filename}"`);
  res.setHeader('Cache-Control', 'private, no-store');
  res.send(file.body);
};

/** Handlers of /api/billing: parse, call the service, choose the status. */
export function createBillingController(ctx: AppContext) {
  return {
    async cycles(_req: Request, res: Response) {
      res.json(await listFeeCycles(ctx));
    },
    async summary(req: Request, res: Response) {
      res.json(await getFeesSummary(ctx, cycleParams.parse(req.params).cycleId));
    },
    async prepare(req: Request, res: Response) {
      res.json(await prepareDrafts(ctx, req.user!, cycleParams.parse(req.params).cycleId));
    },
    async issue(req: Request, res: Response) {
      const { invoiceId } = invoiceParams.parse(req.params);
      res.json(await issueInvoice(ctx, req.user!, invoiceId, issueInvoiceSchema.parse(req.body).version));
    },
    async discard(req: Request, res: Response) {
      const { invoiceId } = invoiceParams.parse(req.params);
      await discardDraft(ctx, invoiceId, versionQuery.parse(req.query).version);
      res.status(204).end();
    },
    async void(req: Request, res: Response) {
      const { invoiceId } = invoiceParams.parse(req.params);
      res.json(await voidInvoice(ctx, req.user!, invoiceId, versionedReasonSchema.parse(req.body)));
    },
    async refund(req: Request, res: Response) {
      const { invoiceId } = invoiceParams.parse(req.params);
      res.json(await refundInvoice(ctx, req.user!, invoiceId, versionedReasonSchema.parse(req.body)));
    },
    async rateClass(req: Request, res: Response) {
      const { proposalId } = programParams.parse(req.params);
      res.json(await setRateClass(ctx, req.user!, proposalId, rateClassSchema.parse(req.body).rateClass));
    },
    async mine(req: Request, res: Response) {
      res.json(await listMyInvoices(ctx, req.user!));
    },
    async invoice(req: Request, res: Response) {
      res.json(await getInvoice(ctx, req.user!, invoiceParams.parse(req.params).invoiceId));
    },
    async invoicePdf(req: Request, res: Response) {
      sendPdf(res, await invoiceFile(ctx, req.user!, invoiceParams.parse(req.params).invoiceId, 'invoice'));
    },
    async receiptPdf(req: Request, res: Response) {
      sendPdf(res, await invoiceFile(ctx, req.user!, invoiceParams.parse(req.params).invoiceId, 'receipt'));
    },
    async pay(req: Request, res: Response) {
      const { invoiceId } = invoiceParams.parse(req.params);
      res.status(202).json(await payInvoice(ctx, req.user!, invoiceId, payInvoiceSchema.parse(req.body)));
    },
    async program(req: Request, res: Response) {
      res.json(await getProgramBilling(ctx, req.user!, programParams.parse(req.params).proposalId));
    },
    async invite(req: Request, res: Response) {
      const { proposalId } = programParams.parse(req.params);
      res.status(201).json(await inviteContact(ctx, req.user!, proposalId, inviteBillingContactSchema.parse(req.body).email));
    },
    async removeContact(req: Request, res: Response) {
      const { proposalId, contactId } = contactParams.parse(req.params);
      res.json(await removeContact(ctx, req.user!, proposalId, contactId));
    },
    async acceptInvitation(req: Request, res: Response) {
      res.json(await acceptContactInvitation(ctx, req.user!, tokenParams.parse(req.params).token));
    },
    async webhook(req: Request, res: Response) {
      const raw = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
      res.json(await handlePaymentEvent(ctx, raw, req.get('stripe-signature') ?? undefined));
    },
  };
}
