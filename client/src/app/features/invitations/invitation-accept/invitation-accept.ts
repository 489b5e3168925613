import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, effect, inject, input, signal, untracked } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { acceptInvitationSchema } from '@spincycle/shared/proposals/proposal-schemas';
import { readApiError } from '../../../core/http/api-error-message';
import { ProposalApi } from '../../proposals/proposal-api';

/**
 * /invitations/:token, the link mailed to a co-investigator (and where sign-up continues with
 * `?invite=`): accepts the invitation for the signed-in account and opens the proposal.
 */
@Component({
  selector: 'app-invitation-accept',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatProgressBar, RouterLink],
  template: `
    <div class="page">
      <h1>Join a proposal team</h1>
      <div class="bar-slot">
        @if (accepting()) {
          <mat-progress-bar mode="indeterminate" aria-label="Accepting the invitation" />
        }
      </div>
      <div aria-live="polite">
        @if (accepting()) {
          <p class="page-lead">Accepting the invitation…</p>
        }
        @if (error(); as message) {
          <p class="form-alert" role="alert" data-testid="invitation-error">{{ message }}</p>
          @if (alreadyMember()) {
            <p>You are on that team already: find the proposal among yours.</p>
          }
          <a matButton="filled" routerLink="/proposals">Your proposals</a>
        }
      </div>
    </div>
  `,
  styles: `
    .bar-slot {
      block-size: 4px;
      margin-block: 8px;
    }
  `,
})
export default class InvitationAccept {
  private readonly api = inject(ProposalApi);
  private readonly router = inject(Router);

  /** Route parameter. */
  readonly token = input.required<string>();

  protected readonly accepting = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly alreadyMember = signal(false);

  constructor() {
    effect(() => {
      const token = this.token();
      untracked(() => this.accept(token));
    });
  }

  private accept(token: string): void {
    this.error.set(null);
    this.alreadyMember.set(false);
    if (!acceptInvitationSchema.safeParse({ token }).success) {
      this.error.set('This invitation link is incomplete. Open it again from the e-mail, or ask the PI for a new one.');
      return;
    }
    this.accepting.set(true);
    this.api.acceptInvitation(token).subscribe({
      next: ({ proposalId }) => {
        this.accepting.set(false);
        void this.router.navigate(['/proposals', proposalId], { replaceUrl: true });
      },
      error: (error: unknown) => {
        this.accepting.set(false);
        this.alreadyMember.set(error instanceof HttpErrorResponse && error.status === 409);
        this.error.set(readApiError(error).message);
      },
    });
  }
}
