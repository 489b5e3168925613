import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle } from '@angular/material/dialog';
import { MatProgressBar } from '@angular/material/progress-bar';

/** How the confirm button looks: the theme's filled button, amber for a call to action, red for a destructive one. */
export type DialogConfirmTone = 'plain' | 'cta' | 'destructive';

/**
 * The frame of a dialog that asks for something and confirms it: the title, the content (what
 * the dialog projects), a progress bar while busy, the error of a failed attempt, and the Cancel
 * and confirm buttons.
 *
 * With `form` (the id of a `<form>` in the content), the confirm button submits that form, so
 * Enter in a field and the button go the same way (`ngSubmit`); without it, the button emits
 * `confirmed`. Cancel closes the dialog with `cancelResult`.
 */
@Component({
  selector: 'app-dialog-shell',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle, MatProgressBar],
  template: `
    <h2 mat-dialog-title>{{ heading() }}</h2>
    <mat-dialog-content>
      <ng-content />
      @if (busy()) {
        <mat-progress-bar mode="indeterminate" [attr.aria-label]="busyLabel()" />
      }
      @if (error(); as error) {
        <p class="dialog-error" role="alert" data-testid="dialog-error">{{ error }}</p>
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" [mat-dialog-close]="cancelResult()">{{ cancelLabel() }}</button>
      <button
        matButton="filled"
        [type]="form() ? 'submit' : 'button'"
        [attr.form]="form()"
        [class.cta]="tone() === 'cta'"
        [class.destructive]="tone() === 'destructive'"
        [disabled]="busy() || confirmDisabled()"
        [attr.data-testid]="confirmTestId()"
        (click)="confirm()"
      >
        {{ confirmLabel() }}
      </button>
    </mat-dialog-actions>
  `,
  styles: `
    /* The dialog lays out its title, content and actions as a column: the shell adds no box of its own. */
    :host {
      display: contents;
    }
    mat-progress-bar {
      margin-block-start: 8px;
    }
    .dialog-error {
      margin: 8px 0 0;
      color: var(--mat-sys-error);
    }
  `,
})
export class DialogShell {
  readonly heading = input.required<string>();
  readonly confirmLabel = input.required<string>();
  readonly cancelLabel = input('Cancel');
  /** What the dialog closes with on Cancel. */
  readonly cancelResult = input<unknown>(undefined);
  /** Id of the content's `<form>` that the confirm button submits; null: it emits `confirmed`. */
  readonly form = input<string | null>(null);
  readonly tone = input<DialogConfirmTone>('plain');
  /** The confirm button is off (nothing valid to confirm yet). */
  readonly confirmDisabled = input(false);
  /** While the confirmed request is on its way: the bar shows and confirm is off. */
  readonly busy = input(false);
  /** The bar's accessible name ("Declaring the conflict"). */
  readonly busyLabel = input('Sending');
  /** Why the last attempt failed, or null. */
  readonly error = input<string | null>(null);
  readonly confirmTestId = input<string | null>(null);
  /** The confirm button was pressed (only without `form`). */
  readonly confirmed = output<void>();

  protected confirm(): void {
    // With a form, the native submit reaches the form's ngSubmit instead.
    if (!this.form()) this.confirmed.emit();
  }
}
