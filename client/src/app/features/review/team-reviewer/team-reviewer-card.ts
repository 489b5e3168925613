import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCard } from '@angular/material/card';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { teamReviewerSchema } from '@spincycle/shared/review/panels';
import { readApiError } from '../../../core/http/api-error-message';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';
import { UtcInstantPipe } from '../../../ui/time/date-pipes';
import { TeamReviewerApi, type TeamReviewerAnswer } from './team-reviewer-api';

let nextId = 0;

/**
 * The team's reviewer in a cycle with distributed review, on the proposal's team page: who it
 * is (or that nobody is named yet), the review deadline, and for the PI before the deadline a
 * form to name a reviewer by e-mail. Shows nothing at all in any other case: while loading, in
 * a cycle reviewed by panels, outside the team (404) or when the answer cannot be read, since
 * the team page carries its own loading and error states.
 */
@Component({
  selector: 'app-team-reviewer-card',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    MatButton,
    MatCard,
    MatError,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    MatProgressBar,
    ReactiveFormsModule,
    UtcInstantPipe,
  ],
  template: `
    @if (shown(); as v) {
      <mat-card appearance="outlined" class="team-reviewer" data-testid="team-reviewer-card">
        <div class="bar-slot">
          @if (saving()) {
            <mat-progress-bar mode="indeterminate" aria-label="Naming the team's reviewer" />
          }
        </div>
        <section [attr.aria-labelledby]="titleId">
          <h2 [id]="titleId">Your team's reviewer</h2>
          <p class="lead">In this cycle every submitting team names one reviewer, who grades other teams' proposals.</p>

          <dl>
            <dt>Reviewer</dt>
            <dd data-testid="team-reviewer-name">
              @if (v.reviewer; as r) {
                {{ r.displayName }} ({{ r.email }})
                @if (v.namedAt) {
                  <span class="muted">· named {{ v.namedAt | utcInstant }}</span>
                }
              } @else {
                Not named yet
              }
            </dd>
            <dt>Grades due</dt>
            <dd data-testid="team-reviewer-deadline">
              @if (v.reviewDeadline) {
                {{ v.reviewDeadline | utcInstant }}
              } @else {
                The facility has not set the review deadline yet
              }
            </dd>
          </dl>

          <p class="caution" data-testid="team-reviewer-caution">
            <mat-icon fontSet="material-symbols-outlined" aria-hidden="true">warning</mat-icon>
            <span>
              The reviewer you name must grade every proposal handed to them by the review deadline. If they do not, the facility may set
              your team's own proposal aside, as the cycle's rules say.
            </span>
          </p>

          <div aria-live="polite" aria-atomic="true">
            @if (notice(); as text) {
              <p class="form-note" data-testid="team-reviewer-notice">{{ text }}</p>
            }
            @if (refusal(); as text) {
              <p class="form-alert" role="alert" data-testid="team-reviewer-refusal">{{ text }}</p>
            }
          </div>

          @if (v.deadlinePassed) {
            <p class="muted">The review deadline has passed; the team's reviewer can no longer change.</p>
          } @else if (v.myRole === 'pi') {
            <form class="name-form" [formGroup]="form" (ngSubmit)="submit()" novalidate>
              <mat-form-field class="email">
                <mat-label>Reviewer's e-mail</mat-label>
                <input matInput type="email" formControlName="email" autocomplete="off" required data-testid="team-reviewer-email" />
                <mat-hint>The e-mail of their account here; it must be able to review</mat-hint>
                <mat-error>{{ errorOf(form.controls.email) }}</mat-error>
              </mat-form-field>
              <button matButton="filled" type="submit" [disabled]="saving()">Name reviewer</button>
            </form>
          } @else {
            <p class="muted">Only the team's PI can name the reviewer.</p>
          }
        </section>
      </mat-card>
    }
  `,
  styles: `
    .team-reviewer {
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
    .lead,
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
    dl {
      display: grid;
      grid-template-columns: max-content 1fr;
      gap: 4px 16px;
      margin: 8px 0;
    }
    dt {
      font-weight: 500;
    }
    dd {
      margin: 0;
    }
    .caution {
      display: flex;
      gap: 8px;
      align-items: flex-start;
      margin: 8px 0 16px;
    }
    .name-form {
      display: flex;
      flex-wrap: wrap;
      align-items: baseline;
      gap: 8px 16px;
    }
    .email {
      flex: 1 1 280px;
    }
  `,
})
export class TeamReviewerCard {
  private readonly api = inject(TeamReviewerApi);

  /** The proposal whose team this is. */
  readonly proposalId = input.required<number>();

  protected readonly titleId = `team-reviewer-title-${++nextId}`;
  protected readonly data = this.api.teamReviewerResource(() => this.proposalId());
  /** The answer, only for a cycle in distributed review. */
  protected readonly shown = computed<TeamReviewerAnswer | null>(() => {
    if (!this.data.hasValue()) return null;
    const v = this.data.value();
    return v.reviewMode === 'distributed' ? v : null;
  });

  protected readonly saving = signal(false);
  protected readonly notice = signal<string | null>(null);
  protected readonly refusal = signal<string | null>(null);
  protected readonly errorOf = controlErrorMessage;

  protected readonly form = new FormGroup({
    email: new FormControl('', { nonNullable: true, validators: [zodValidator(teamReviewerSchema.shape.email)] }),
  });

  protected submit(): void {
    if (this.saving()) return;
    this.notice.set(null);
    this.refusal.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.saving.set(true);
    this.api.name(this.proposalId(), this.form.getRawValue()).subscribe({
      next: (answer) => {
        this.saving.set(false);
        const current = this.data.hasValue() ? this.data.value() : null;
        // Keeps the cycle's facts read with the page when the answer leaves them out.
        this.data.set({ ...current, ...answer });
        this.form.reset();
        this.notice.set(answer.reviewer ? `${answer.reviewer.displayName} is now your team's reviewer.` : null);
      },
      error: (err: unknown) => {
        this.saving.set(false);
        const body = readApiError(err);
        const fields = Object.keys(body.fieldErrors ?? {}).length;
        const unmatched = applyServerFieldErrors(this.form, body.fieldErrors);
        // An error under the e-mail field says it all; anything else is shown above the form.
        this.refusal.set(fields > unmatched.length ? unmatched.join(' ') || null : body.message);
      },
    });
  }
}
