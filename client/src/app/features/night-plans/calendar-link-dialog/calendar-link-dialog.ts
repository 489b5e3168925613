import { Clipboard } from '@angular/cdk/clipboard';
import {
  afterNextRender,
  ChangeDetectionStrategy,
  Component,
  computed,
  ElementRef,
  inject,
  Injector,
  signal,
  viewChild,
} from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle } from '@angular/material/dialog';
import { MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import type { CalendarFeedLink, CalendarFeedStatus } from '@spincycle/shared/night-plans/night-plans';
import { loadErrorText, readApiError } from '../../../core/http/api-error-message';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { UtcInstantPipe } from '../../../ui/time/date-pipes';
import { NightPlansApi } from '../night-plans-api';

export interface CalendarLinkDialogData {
  cycleId: number;
  nodeId: number;
  nodeCode: string;
}

type Step = 'make' | 'stop';

/**
 * The calendar subscription link of one node's night plan: whether a link works (made when and
 * by whom), "Make a new link" (which stops the previous one, so it asks first when one works),
 * the new link shown once with a copy button, and "Stop the link" (asks first). The link's
 * address is never read back from the server: it lives in this dialog until it closes.
 */
@Component({
  selector: 'app-calendar-link-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    LoadStatus,
    MatButton,
    MatDialogActions,
    MatDialogClose,
    MatDialogContent,
    MatDialogTitle,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    MatProgressBar,
    UtcInstantPipe,
  ],
  template: `
    <h2 mat-dialog-title>Calendar subscription of {{ data.nodeCode }}</h2>
    <mat-dialog-content>
      <p class="about">
        With a subscription link, your calendar application shows the visits of {{ data.nodeCode }} and updates them by itself when the
        plans change. Anyone who has the link can see the plan without signing in, so share it only with the people who need it.
      </p>

      <app-load-status
        [loading]="status.isLoading()"
        loadingLabel="Loading the subscription link"
        [error]="loadError()"
        (retry)="status.reload()"
      />

      <div class="state" role="status" aria-live="polite" data-testid="link-state">
        @if (current(); as s) {
          @if (s.active) {
            <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">link</mat-icon>
            <span>A link works: made {{ s.createdAt | utcInstant }} by {{ s.createdBy ?? 'someone who is no longer registered' }}.</span>
          } @else {
            <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">link_off</mat-icon>
            <span>There is no working link: no calendar can subscribe to the plan of {{ data.nodeCode }}.</span>
          }
        }
      </div>

      @if (newLink(); as link) {
        <section class="new-link" aria-labelledby="new-link-heading" data-testid="new-link">
          <h3 id="new-link-heading">Your new link</h3>
          <div class="link-line">
            <mat-form-field class="url">
              <mat-label>Subscription link of {{ data.nodeCode }}</mat-label>
              <input
                #urlInput
                matInput
                readonly
                [value]="link.url"
                (focus)="urlInput.select()"
                aria-describedby="new-link-once"
                data-testid="new-link-url"
              />
              <mat-hint>In your calendar application, choose to add a calendar from the internet and paste this link.</mat-hint>
            </mat-form-field>
            <button matButton="tonal" type="button" (click)="copy(link.url)" data-testid="copy-link">
              <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">content_copy</mat-icon>
              Copy the link
            </button>
          </div>
          <p id="new-link-once" class="once">
            <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">visibility_off</mat-icon>
            <span>Copy it now: this link will not be shown again. If it is lost, make a new link.</span>
          </p>
          <p class="copied" role="status" aria-live="polite" data-testid="copy-result">
            @if (copied() === true) {
              The link is copied.
            } @else if (copied() === false) {
              The link could not be copied: select it and copy it yourself.
            }
          </p>
        </section>
      }

      @if (confirming(); as step) {
        <div class="caution" role="group" aria-labelledby="confirm-text" data-testid="confirm">
          <p id="confirm-text">
            <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">warning</mat-icon>
            @if (step === 'make') {
              <span>
                The link that works now stops working at once: calendars subscribed with it stop showing the plan until they subscribe with
                the new link.
              </span>
            } @else {
              <span>
                The link stops working at once: calendars subscribed with it stop showing the plan, and nobody can subscribe until you make
                a new link.
              </span>
            }
          </p>
          <div class="confirm-actions">
            <button matButton type="button" (click)="cancel()" [disabled]="sending()" data-testid="confirm-cancel">
              {{ step === 'make' ? 'Keep the current link' : 'Keep the link' }}
            </button>
            <button
              #confirmButton
              matButton="filled"
              type="button"
              class="destructive"
              (click)="step === 'make' ? make() : stop()"
              [disabled]="sending()"
              data-testid="confirm-yes"
            >
              {{ step === 'make' ? 'Make a new link and stop the current one' : 'Stop the link' }}
            </button>
          </div>
        </div>
      }

      @if (sending()) {
        <mat-progress-bar mode="indeterminate" [attr.aria-label]="sending() === 'make' ? 'Making the new link' : 'Stopping the link'" />
      }
      @if (failure(); as f) {
        <p class="problem" role="alert" data-testid="link-error">{{ f }}</p>
      }

      @if (active()) {
        <p id="make-warning" class="hint" data-testid="make-warning">
          Making a new link stops the link that works now; everyone subscribed with it will need the new one.
        </p>
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      @if (active()) {
        <button matButton type="button" (click)="ask('stop')" [disabled]="busy()" data-testid="stop-link">
          <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">link_off</mat-icon>
          Stop the link
        </button>
      }
      <button
        #makeButton
        matButton="filled"
        type="button"
        (click)="active() ? ask('make') : make()"
        [disabled]="busy() || !current()"
        [attr.aria-describedby]="active() ? 'make-warning' : null"
        data-testid="make-link"
      >
        <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">add_link</mat-icon>
        {{ active() ? 'Make a new link' : 'Make a link' }}
      </button>
      <button matButton type="button" mat-dialog-close data-testid="close">Close</button>
    </mat-dialog-actions>
  `,
  styles: `
    .about {
      margin-block-start: 0;
    }
    .state,
    .once,
    #confirm-text {
      display: flex;
      gap: 8px;
      align-items: flex-start;
    }
    .state:empty {
      display: none;
    }
    mat-icon {
      flex: none;
    }
    .new-link {
      margin-block: 12px;
      padding: 12px 16px;
      border-radius: var(--mat-sys-corner-medium);
      background: var(--mat-sys-surface-container);
    }
    .new-link h3 {
      margin: 0 0 8px;
      font: var(--mat-sys-title-small);
    }
    .link-line {
      display: flex;
      flex-wrap: wrap;
      gap: 8px 12px;
      align-items: baseline;
    }
    .url {
      flex: 1 1 24rem;
    }
    .url input {
      font-family: 'IBM Plex Mono', monospace;
    }
    .once {
      margin-block-end: 0;
      font-weight: 600;
    }
    .copied:empty {
      display: none;
    }
    .caution {
      margin-block: 12px;
      padding: 10px 12px;
      border-radius: var(--mat-sys-corner-medium);
      background: var(--mat-sys-tertiary-container);
      color: var(--mat-sys-on-tertiary-container);
    }
    #confirm-text {
      margin-block-start: 0;
    }
    .confirm-actions {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      justify-content: flex-end;
    }
    .hint {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
    .problem {
      color: var(--mat-sys-error);
    }
  `,
})
export class CalendarLinkDialog {
  protected readonly data = inject<CalendarLinkDialogData>(MAT_DIALOG_DATA);
  private readonly api = inject(NightPlansApi);
  private readonly clipboard = inject(Clipboard);
  private readonly injector = inject(Injector);

  protected readonly status = this.api.calendarFeedResource(() => ({ cycleId: this.data.cycleId, nodeId: this.data.nodeId }));
  /** The link's state as last read (kept while it is read again). */
  protected readonly current = computed<CalendarFeedStatus | null>(() => (this.status.hasValue() ? this.status.value() : null));
  protected readonly active = computed(() => this.current()?.active === true);
  protected readonly loadError = computed(() => loadErrorText(this.status.error(), 'The subscription link could not be loaded.'));

  /** The link just made: shown until the dialog closes or the link is stopped, never read again. */
  protected readonly newLink = signal<CalendarFeedLink | null>(null);
  protected readonly confirming = signal<Step | null>(null);
  protected readonly sending = signal<Step | null>(null);
  protected readonly busy = computed(() => this.sending() !== null || this.confirming() !== null || this.status.isLoading());
  protected readonly failure = signal<string | null>(null);
  /** Whether the last copy worked (null before any). */
  protected readonly copied = signal<boolean | null>(null);

  private readonly urlInput = viewChild<ElementRef<HTMLInputElement>>('urlInput');
  private readonly confirmButton = viewChild('confirmButton', { read: ElementRef });
  private readonly makeButton = viewChild('makeButton', { read: ElementRef });

  /** Moves the focus once the view shows the element. */
  private focusSoon(target: () => ElementRef<HTMLElement> | undefined): void {
    afterNextRender({ write: () => target()?.nativeElement.focus() }, { injector: this.injector });
  }

  protected ask(step: Step): void {
    this.failure.set(null);
    this.confirming.set(step);
    this.focusSoon(() => this.confirmButton());
  }

  protected cancel(): void {
    this.confirming.set(null);
    this.focusSoon(() => this.makeButton());
  }

  protected make(): void {
    if (this.sending()) return;
    this.sending.set('make');
    this.failure.set(null);
    this.api.makeCalendarFeed(this.data.cycleId, this.data.nodeId).subscribe({
      next: (link) => {
        this.sending.set(null);
        this.confirming.set(null);
        this.copied.set(null);
        this.newLink.set(link);
        this.status.reload();
        this.focusSoon(() => this.urlInput());
      },
      error: (err: unknown) => {
        this.sending.set(null);
        this.failure.set(`The new link was not made. ${readApiError(err).message}`);
      },
    });
  }

  protected stop(): void {
    if (this.sending()) return;
    this.sending.set('stop');
    this.failure.set(null);
    this.api.stopCalendarFeed(this.data.cycleId, this.data.nodeId).subscribe({
      next: () => {
        this.sending.set(null);
        this.confirming.set(null);
        this.newLink.set(null);
        this.status.reload();
        this.focusSoon(() => this.makeButton());
      },
      error: (err: unknown) => {
        this.sending.set(null);
        this.confirming.set(null);
        this.failure.set(`The link was not stopped. ${readApiError(err).message}`);
        // Someone else may have stopped or replaced it: show what holds now.
        this.status.reload();
      },
    });
  }

  protected copy(url: string): void {
    this.copied.set(this.clipboard.copy(url));
  }
}
