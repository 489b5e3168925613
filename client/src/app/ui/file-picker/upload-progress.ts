import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatProgressBar } from '@angular/material/progress-bar';

/**
 * The progress of an upload under its file picker: a determinate bar with "N % sent" when the
 * percentage is known, an indeterminate one when it is not, and an empty slot of the bar's
 * height otherwise (so that the page does not jump when an upload starts).
 */
@Component({
  selector: 'app-upload-progress',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatProgressBar],
  template: `
    @let sent = progress();
    @if (sent === 'unknown') {
      <mat-progress-bar mode="indeterminate" [attr.aria-label]="label()" [attr.data-testid]="testId()" />
    } @else if (sent !== null) {
      <mat-progress-bar mode="determinate" [value]="sent" [attr.aria-label]="label()" [attr.data-testid]="testId()" />
      <span class="percent">{{ sent }} % sent</span>
    }
  `,
  styles: `
    :host {
      display: flex;
      align-items: center;
      gap: 12px;
      min-block-size: 4px;
      margin-block: 8px;
    }
    mat-progress-bar {
      flex: 1;
    }
    .percent {
      font-variant-numeric: tabular-nums;
      white-space: nowrap;
    }
  `,
})
export class UploadProgress {
  /** Percent sent (0–100); `unknown` while sending without progress events; null when idle. */
  readonly progress = input<number | 'unknown' | null>(null);
  /** The bar's accessible name ("Uploading the justification"). */
  readonly label = input.required<string>();
  /** `data-testid` of the bar. */
  readonly testId = input<string | null>(null);
}
