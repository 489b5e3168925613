import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, ValidatorFn } from '@angular/forms';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import type { TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { EXTERNAL_RATE_HINT, EXTERNAL_RATE_LABEL } from '@spincycle/shared/facility/node-schemas';
import { readApiError } from '../../../core/http/api-error-message';
import { DialogShell } from '../../../ui/dialog-shell/dialog-shell';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { MinorCurrencyPipe } from '../../../ui/units/minor-currency-pipe';
import { NetworkApi } from '../network-api';
import { parseRateText, rateToText } from '../rate-text';

export interface NodeRateDialogData {
  node: TelescopeNode;
}

/** The node as saved, or nothing when cancelled. */
export type NodeRateDialogResult = TelescopeNode | undefined;

/**
 * A facility manager sets or clears a node's external rate, beside its academic rate, in the
 * node's currency. The amount is typed in the currency's units (77.60) and sent in minor units
 * (7760); an empty field clears it.
 */
@Component({
  selector: 'app-node-rate-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DialogShell, MatError, MatFormField, MatHint, MatInput, MatLabel, MinorCurrencyPipe, ReactiveFormsModule],
  template: `
    <app-dialog-shell
      [heading]="'External rate of ' + node.code"
      confirmLabel="Save"
      form="node-rate-form"
      [busy]="busy()"
      busyLabel="Saving the rate"
      [error]="error()"
      confirmTestId="node-rate-save"
    >
      <form id="node-rate-form" [formGroup]="form" (ngSubmit)="submit()" novalidate>
        <p>{{ node.name }} bills programs of outside organisations at its external rate, and every other program at its academic rate.</p>
        <dl class="rates">
          <dt>Academic rate</dt>
          <dd data-testid="academic-rate">{{ node.rateMinorPerHour | minorCurrency: node.currency }} per node-hour</dd>
        </dl>
        <mat-form-field class="rate-field">
          <mat-label>{{ label }} ({{ currencyCode }})</mat-label>
          <input matInput formControlName="externalRateMinorPerHour" inputmode="decimal" autocomplete="off" data-testid="external-rate" />
          <mat-hint>{{ hint }}</mat-hint>
          <mat-error data-testid="external-rate-error">{{ errorOf(form.controls.externalRateMinorPerHour) }}</mat-error>
        </mat-form-field>
        <p class="form-note">
          Issued invoices keep the rates they were issued with; drafts take the new rate when they are prepared again.
        </p>
      </form>
    </app-dialog-shell>
  `,
  styles: `
    .rates {
      display: flex;
      gap: 8px;
      margin: 0 0 16px;
      dt {
        font-weight: 500;
      }
      dt::after {
        content: ':';
      }
      dd {
        margin: 0;
      }
    }
    .rate-field {
      inline-size: 100%;
    }
  `,
})
export class NodeRateDialog {
  private readonly api = inject(NetworkApi);
  private readonly ref = inject(MatDialogRef<NodeRateDialog, NodeRateDialogResult>);
  protected readonly node = inject<NodeRateDialogData>(MAT_DIALOG_DATA).node;
  protected readonly label = EXTERNAL_RATE_LABEL;
  protected readonly hint = EXTERNAL_RATE_HINT;
  protected readonly currencyCode = this.node.currency.toUpperCase();
  protected readonly errorOf = controlErrorMessage;

  private readonly rateCheck: ValidatorFn = (control) => {
    const parsed = parseRateText(String(control.value ?? ''), this.node.currency);
    return parsed.ok ? null : { schema: parsed.message };
  };

  protected readonly form = new FormGroup({
    externalRateMinorPerHour: new FormControl(this.startText(), { nonNullable: true, validators: [this.rateCheck] }),
  });
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  /** The stored external rate as it would be typed; empty when the node has none. */
  private startText(): string {
    const minor = this.node.externalRateMinorPerHour ?? null;
    return minor === null ? '' : rateToText(minor, this.node.currency);
  }

  protected submit(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.busy()) return;
    const parsed = parseRateText(this.form.controls.externalRateMinorPerHour.value, this.node.currency);
    if (!parsed.ok) return;
    this.busy.set(true);
    this.error.set(null);
    this.api.updateNode(this.node.id, { externalRateMinorPerHour: parsed.minor }).subscribe({
      next: (node) => this.ref.close(node),
      error: (err: unknown) => {
        this.busy.set(false);
        const body = readApiError(err);
        const unmatched = applyServerFieldErrors(this.form, body.fieldErrors);
        this.error.set(body.fieldErrors && !unmatched.length ? null : body.message);
      },
    });
  }
}
