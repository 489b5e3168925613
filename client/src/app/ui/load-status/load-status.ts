import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';

/**
 * The loading, error and empty states of one piece of data on a page: a progress bar while
 * it loads, and a polite live region that announces the error or the empty message.
 * The region is always in the DOM so that screen readers notice when its text changes.
 */
@Component({
  selector: 'app-load-status',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButton, MatIcon, MatProgressBar],
  template: `
    <div class="bar-slot">
      @if (loading()) {
        <mat-progress-bar mode="indeterminate" [attr.aria-label]="loadingLabel()" />
      }
    </div>
    <div class="message" aria-live="polite">
      @if (error(); as error) {
        <p class="state state-error" role="alert">
          <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">error</mat-icon>
          <span>{{ error }}</span>
          @if (retryable()) {
            <button matButton type="button" (click)="retry.emit()">Try again</button>
          }
        </p>
      } @else if (empty() && !loading()) {
        <p class="state state-empty">
          <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">info</mat-icon>
          <span>{{ emptyText() }}</span>
        </p>
      }
    </div>
  `,
  styles: `
    :host {
      display: block;
    }
    .bar-slot {
      block-size: 4px;
    }
    .state {
      display: flex;
      align-items: center;
      gap: 8px;
      margin: 12px 0;
      padding: 12px 16px;
      border-radius: var(--mat-sys-corner-medium);
      font: var(--mat-sys-body-medium);
    }
    .state-error {
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
    }
    .state-empty {
      background: var(--mat-sys-surface-container);
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class LoadStatus {
  readonly loading = input(false);
  /** The error sentence to show, or null. */
  readonly error = input<string | null>(null);
  readonly empty = input(false);
  readonly emptyText = input('Nothing to show yet.');
  readonly loadingLabel = input('Loading');
  readonly retryable = input(true);
  readonly retry = output<void>();
}
