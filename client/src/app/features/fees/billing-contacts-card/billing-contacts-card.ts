import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCard } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { inviteBillingContactSchema, type BillingContactView, type ProgramBilling } from '@spincycle/shared/billing/billing';
import { loadErrorTextUnlessMissing, readApiError } from '../../../core/http/api-error-message';
import { confirmAction } from '../../../ui/confirm-dialog/confirm-dialog';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { DayPipe } from '../../../ui/time/date-pipes';
import { BillingApi } from '../billing-api';

let nextId = 0;

/**
 * The program's billing contacts, on the proposal's overview once it is awarded: who receives
 * and pays its invoices (accepted, or invited and not yet accepted), and for the PI (or a
 * facility manager) a form to invite someone by e-mail and a way to remove a contact. Shows
 * nothing while there is no program (404) or while loading; a failed read shows its error.
 */
@Component({
  selector: 'app-billing-contacts-card',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DayPipe,
    LoadStatus,
    MatButton,
    MatCard,
    MatError,
    MatFormField,
    MatHint,
    MatInput,
    MatLabel,
    MatProgressBar,
    ReactiveFormsModule,
    RouterLink,
  ],
  template: `
    @if (program(); as p) {
      <mat-card appearance="outlined" class="contacts-card" data-testid="billing-contacts-card">
        <div class="bar-slot">
          @if (busy()) {
            <mat-progress-bar mode="indeterminate" aria-label="Saving the billing contacts" />
          }
        </div>
        <section [attr.aria-labelledby]="uid + '-title'">
          <h2 [id]="uid + '-title'">Billing contacts</h2>
          <p class="muted">
            They receive the program's invoices by mail and pay them by card on the <a routerLink="/fees">Fees</a> page. Without a billing
            contact, invoices go to the PI.
          </p>

          @if (p.contacts.length) {
            <ul class="contacts" data-testid="billing-contacts">
              @for (c of p.contacts; track c.id) {
                <li [attr.data-testid]="'billing-contact-' + c.id">
                  <span class="who">
                    {{ c.name ? c.name + ' (' + c.email + ')' : c.email }}
                    <span class="muted">
                      @if (c.acceptedAt) {
                        · accepted {{ c.acceptedAt | day }}
                      } @else {
                        · invited {{ c.invitedAt | day }}, not accepted yet
                      }
                    </span>
                  </span>
                  @if (p.canManageContacts) {
                    <button matButton type="button" [disabled]="busy()" (click)="remove(c)" [attr.data-testid]="'remove-contact-' + c.id">
                      Remove<span class="visually-hidden"> {{ c.email }}</span>
                    </button>
                  }
                </li>
              }
            </ul>
          } @else {
            <p data-testid="no-billing-contacts">No billing contact yet.</p>
          }

          <div aria-live="polite" aria-atomic="true">
            @if (notice(); as text) {
              <p class="form-note" role="status" data-testid="billing-contacts-notice">{{ text }}</p>
            }
            @if (refusal(); as text) {
              <p class="form-alert" role="alert" data-testid="billing-contacts-refusal">{{ text }}</p>
            }
          </div>

          @if (p.canManageContacts) {
            <form class="invite-form" [formGroup]="form" (ngSubmit)="invite()" novalidate>
              <mat-form-field class="email">
                <mat-label>E-mail of a billing contact</mat-label>
                <input matInput type="email" formControlName="email" autocomplete="email" required data-testid="billing-contact-email" />
                <mat-hint>They get a link to accept, valid for 14 days</mat-hint>
                <mat-error>{{ errorOf(form.controls.email) }}</mat-error>
              </mat-form-field>
              <button matButton="filled" type="submit" [disabled]="busy()" data-testid="invite-billing-contact">Invite</button>
            </form>
          }
        </section>
      </mat-card>
    } @else if (error(); as e) {
      <app-load-status [error]="e" (retry)="resource.reload()" data-testid="billing-contacts-error" />
    }
  `,
  styles: `
    :host {
      display: block;
    }
    .contacts-card {
      margin: 0 0 16px;
    }
    .bar-slot {
      block-size: 4px;
    }
    section {
      padding: 8px 16px 16px;
    }
    h2 {
      font: var(--mat-sys-title-medium);
      margin: 0 0 4px;
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
    .contacts {
      margin: 8px 0;
      padding: 0;
      list-style: none;
      li {
        display: flex;
        flex-wrap: wrap;
        align-items: center;
        justify-content: space-between;
        gap: 4px 16px;
        padding-block: 2px;
        border-block-end: 1px solid var(--mat-sys-outline-variant);
      }
    }
    .invite-form {
      display: flex;
      flex-wrap: wrap;
      align-items: baseline;
      gap: 8px 16px;
      margin-block-start: 8px;
    }
    .email {
      flex: 1 1 280px;
    }
  `,
})
export class BillingContactsCard {
  private readonly api = inject(BillingApi);
  private readonly dialog = inject(MatDialog);

  /** The awarded proposal whose program this is. */
  readonly proposalId = input.required<number>();

  protected readonly uid = `billing-contacts-${++nextId}`;
  protected readonly resource = this.api.programResource(() => this.proposalId());
  protected readonly program = computed<ProgramBilling | null>(() => (this.resource.hasValue() ? (this.resource.value() ?? null) : null));
  protected readonly error = computed(() => loadErrorTextUnlessMissing(this.resource.error(), 'The billing contacts could not be loaded.'));

  protected readonly busy = signal(false);
  protected readonly notice = signal<string | null>(null);
  protected readonly refusal = signal<string | null>(null);
  protected readonly errorOf = controlErrorMessage;
  protected readonly form = new FormGroup({
    email: new FormControl('', {
      nonNullable: true,
      validators: [Validators.required, zodValidator(inviteBillingContactSchema.shape.email)],
    }),
  });

  protected invite(): void {
    if (this.busy()) return;
    this.notice.set(null);
    this.refusal.set(null);
    this.form.markAllAsTouched();
    if (this.form.invalid) return;
    const email = this.form.controls.email.value.trim();
    this.busy.set(true);
    this.api.inviteContact(this.proposalId(), email).subscribe({
      next: (program) => {
        this.busy.set(false);
        this.resource.set(program);
        this.form.reset();
        this.notice.set(`Invitation sent to ${email}. They become a billing contact when they accept it.`);
      },
      error: (err: unknown) => {
        this.busy.set(false);
        const body = readApiError(err);
        const unmatched = applyServerFieldErrors(this.form, body.fieldErrors);
        if (!body.fieldErrors || unmatched.length) this.refusal.set(body.message);
      },
    });
  }

  protected remove(contact: BillingContactView): void {
    if (this.busy()) return;
    this.notice.set(null);
    this.refusal.set(null);
    confirmAction(this.dialog, {
      title: 'Remove this billing contact?',
      message: `${contact.email} will no longer receive or pay this program's invoices${contact.acceptedAt ? '' : ', and the invitation link stops working'}.`,
      confirmLabel: 'Remove',
      destructive: true,
    }).subscribe((yes) => {
      if (!yes) return;
      this.busy.set(true);
      this.api.removeContact(this.proposalId(), contact.id).subscribe({
        next: (program) => {
          this.busy.set(false);
          this.resource.set(program);
          this.notice.set(`${contact.email} is no longer a billing contact.`);
        },
        error: (err: unknown) => {
          this.busy.set(false);
          this.refusal.set(readApiError(err).message);
          this.resource.reload();
        },
      });
    });
  }
}
