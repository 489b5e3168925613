import express, { Router } from 'express';
import type { AppContext } from '../../app-context';
import { requireRole, requireSignedIn } from '../../http/auth-middleware';
import { createBillingController } from './billing-controller';

/**
 * Mounted at /api/billing: facility managers' fees (cycles, the fees summary, drafts, issue, void,
 * refund, a program's rate); payers' invoices, PDFs and card payments (the service answers 404 to
 * anyone who is not a manager, a billing contact or the PI of the program); a program's billing
 * contacts (the PI and managers invite and remove them). Every route is listed in
 * test/api/billing-permissions.spec.ts.
 */
export function createBillingRoutes(ctx: AppContext): Router {
  const c = createBillingController(ctx);
  const manager = requireRole('facility_manager');
  const router = Router();
  router.get('/cycles', manager, c.cycles);
  router.get('/cycles/:cycleId', manager, c.summary);
  router.post('/cycles/:cycleId/invoices', manager, c.prepare);
  router.post('/invoices/:invoiceId/issue', manager, c.issue);
  router.delete('/invoices/:invoiceId', manager, c.discard);
  router.post('/invoices/:invoiceId/void', manager, c.void);
  router.post('/invoices/:invoiceId/refund', manager, c.refund);
  router.put('/programs/:proposalId/rate-class', manager, c.rateClass);
  router.get('/invoices', requireSignedIn, c.mine);
  router.get('/invoices/:invoiceId', requireSignedIn, c.invoice);
  router.get('/invoices/:invoiceId/invoice.pdf', requireSignedIn, c.invoicePdf);
  router.get('/invoices/:invoiceId/receipt.pdf', requireSignedIn, c.receiptPdf);
  router.post('/invoices/:invoiceId/payments', requireSignedIn, c.pay);
  router.get('/programs/:proposalId', requireSignedIn, c.program);
  router.post('/programs/:proposalId/contacts', requireSignedIn, c.invite);
  router.delete('/programs/:proposalId/contacts/:contactId', requireSignedIn, c.removeContact);
  router.post('/contact-invitations/:token', requireSignedIn, c.acceptInvitation);
  return router;
}

/**
 * POST /api/billing/webhook: the payment provider's events. Mounted before the JSON parser, the
 * session and the CSRF check (the provider has none of them): the raw body is what its signature
 * covers, and the signature is the only credential (payment-service.ts handlePaymentEvent).
 */
export function createPaymentWebhookRoutes(ctx: AppContext): Router {
  const c = createBillingController(ctx);
  const router = Router();
  router.post('/', express.raw({ type: () => true, limit: '256kb' }), c.webhook);
  return router;
}
