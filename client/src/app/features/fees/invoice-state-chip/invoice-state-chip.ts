import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import { INVOICE_STATE_LABELS, type InvoiceSummary } from '@spincycle/shared/billing/billing';

/**
 * An invoice's state in our words ("Awaiting payment", "Paid", …), tinted by how it stands, and
 * beside it, in words and with an icon (never by colour alone), "Overdue" for an issued invoice
 * past its due date and "Refund pending" while the card processor has not confirmed a refund.
 */
@Component({
  selector: 'app-invoice-state-chip',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatIcon],
  template: `
    <span class="chips">
      <span [class]="tone()" data-testid="invoice-state">{{ label() }}</span>
      @if (invoice().overdue) {
        <span class="chip overdue" data-testid="invoice-overdue">
          <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">schedule</mat-icon>Overdue
        </span>
      }
      @if (invoice().refundPending) {
        <span class="chip pending" data-testid="invoice-refund-pending">
          <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">hourglass_top</mat-icon>Refund pending
        </span>
      }
    </span>
  `,
  styles: `
    .chips {
      display: inline-flex;
      flex-wrap: wrap;
      gap: 4px;
    }
    .chip {
      display: inline-flex;
      align-items: center;
      gap: 2px;
      padding: 0 8px;
      border-radius: var(--mat-sys-corner-full);
      font: var(--mat-sys-label-medium);
      white-space: nowrap;
      background: var(--mat-sys-surface-container-high);
      color: var(--mat-sys-on-surface);
      border: 1px solid var(--mat-sys-outline-variant);
      mat-icon {
        font-size: 16px;
        inline-size: 16px;
        block-size: 16px;
      }
    }
    .draft {
      background: var(--mat-sys-surface-container);
      color: var(--mat-sys-on-surface-variant);
    }
    .issued {
      background: var(--mat-sys-secondary-container);
      color: var(--mat-sys-on-secondary-container);
    }
    .paid {
      background: var(--mat-sys-tertiary-container);
      color: var(--mat-sys-on-tertiary-container);
      border-color: var(--mat-sys-tertiary);
    }
    .void,
    .refunded {
      color: var(--mat-sys-on-surface-variant);
      font-style: italic;
    }
    .overdue {
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
      border-color: var(--mat-sys-error);
      font-weight: 600;
    }
  `,
})
export class InvoiceStateChip {
  readonly invoice = input.required<Pick<InvoiceSummary, 'state' | 'overdue' | 'refundPending'>>();
  protected readonly label = computed(() => INVOICE_STATE_LABELS[this.invoice().state]);
  protected readonly tone = computed(() => `chip ${this.invoice().state}`);
}
