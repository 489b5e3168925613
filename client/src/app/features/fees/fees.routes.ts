import { Routes } from '@angular/router';
import { roleGuard } from '../../core/auth/role-guard';

/**
 * Loaded at /fees behind authGuard (see app.routes.ts): the invoices of the programs a person
 * pays for or leads, one invoice with its card payment, the facility managers' fees of a cycle,
 * and the link a billing contact's invitation mails. The server re-checks every permission.
 */
const routes: Routes = [
  { path: '', title: 'Fees', loadComponent: () => import('./my-invoices/my-invoices') },
  { path: 'invoices/:invoiceId', title: 'Invoice', loadComponent: () => import('./invoice-detail/invoice-detail') },
  {
    path: 'manage',
    canActivate: [roleGuard('facility_manager')],
    title: 'Fees: choose a cycle',
    loadComponent: () => import('./fees-cycle-picker/fees-cycle-picker'),
  },
  {
    path: 'manage/:cycleId',
    canActivate: [roleGuard('facility_manager')],
    title: 'Fees of the cycle',
    loadComponent: () => import('./fees-cycle/fees-cycle'),
  },
  {
    path: 'contact-invitations/:token',
    title: 'Become a billing contact',
    loadComponent: () => import('./contact-invitation-accept/contact-invitation-accept'),
  },
];

export default routes;
