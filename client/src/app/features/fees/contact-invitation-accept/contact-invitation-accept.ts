import { ChangeDetectionStrategy, Component, effect, inject, input, signal, untracked } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { readApiError } from '../../../core/http/api-error-message';
import { SessionAuth } from '../../../core/auth/session-auth';
import { BillingApi, type AcceptedBillingInvitation } from '../billing-api';

/** The shape of an invitation token in a link (as the server checks it). */
const TOKEN = /^[A-Za-z0-9_-]{20,100}$/;

/**
 * /fees/contact-invitations/:token, the link mailed to a new billing contact (signed in):
 * accepts the invitation for the signed-in account and names the program now billed to it, with
 * the way to its invoices. A used, replaced or old link, or one sent to another address, shows
 * the server's sentence.
 */
@Component({
  selector: 'app-contact-invitation-accept',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatIcon, MatProgressBar, RouterLink],
  template: `
    <div class="page">
      <h1>Become a billing contact</h1>
      <div class="bar-slot">
        @if (accepting()) {
          <mat-progress-bar mode="indeterminate" aria-label="Accepting the invitation" />
        }
      </div>
      <div aria-live="polite">
        @if (accepting()) {
          <p class="page-lead">Accepting the invitation…</p>
        }
        @if (accepted(); as a) {
          <p class="form-note" role="status" data-testid="billing-invitation-accepted">
            <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">check_circle</mat-icon>
            You are now a billing contact of “{{ a.programTitle }}”. Its invoices come to you by mail, and you can pay them by card here.
          </p>
          <a matButton="filled" routerLink="/fees">Your fees</a>
        }
        @if (error(); as message) {
          <p class="form-alert" role="alert" data-testid="billing-invitation-error">{{ message }}</p>
          <a matButton routerLink="/">Home</a>
        }
      </div>
    </div>
  `,
  styles: `
    .bar-slot {
      block-size: 4px;
      margin-block: 8px;
    }
    .form-note mat-icon {
      vertical-align: middle;
    }
  `,
})
export default class ContactInvitationAccept {
  private readonly api = inject(BillingApi);
  private readonly auth = inject(SessionAuth);

  /** Route parameter. */
  readonly token = input.required<string>();

  protected readonly accepting = signal(false);
  protected readonly accepted = signal<AcceptedBillingInvitation | null>(null);
  protected readonly error = signal<string | null>(null);

  constructor() {
    effect(() => {
      const token = this.token();
      untracked(() => this.accept(token));
    });
  }

  private accept(token: string): void {
    this.error.set(null);
    this.accepted.set(null);
    if (!TOKEN.test(token)) {
      this.error.set('This invitation link is incomplete. Open it again from the e-mail, or ask the PI for a new one.');
      return;
    }
    this.accepting.set(true);
    this.api.acceptInvitation(token).subscribe({
      next: (accepted) => {
        this.accepting.set(false);
        this.accepted.set(accepted);
        // The account now holds the billing contact role: read the session again so the navigation shows Fees.
        void this.auth.load();
      },
      error: (err: unknown) => {
        this.accepting.set(false);
        this.error.set(readApiError(err).message);
      },
    });
  }
}
