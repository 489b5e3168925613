import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, untracked } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatDialogActions, MatDialogClose, MatDialogContent, MatDialogRef, MatDialogTitle } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { createProposalSchema, type Proposal } from '@spincycle/shared/proposals/proposal-schemas';
import { loadErrorText, readApiError } from '../../../core/http/api-error-message';
import { applyServerFieldErrors, controlErrorMessage } from '../../../ui/forms/server-errors';
import { zodValidator } from '../../../ui/forms/zod-validator';
import { LoadStatus } from '../../../ui/load-status/load-status';
import { LocalInstantPipe, UtcInstantPipe } from '../../../ui/time/date-pipes';
import { ProposalApi } from '../proposal-api';

/** Asks for an open cycle and a title, creates the draft, and closes with it. */
@Component({
  selector: 'app-new-proposal-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    LoadStatus,
    LocalInstantPipe,
    MatButton,
    MatDialogActions,
    MatDialogClose,
    MatDialogContent,
    MatDialogTitle,
    MatError,
    MatFormField,
    MatHint,
    MatInput,
    MatLabel,
    MatOption,
    MatProgressBar,
    MatSelect,
    ReactiveFormsModule,
    UtcInstantPipe,
  ],
  template: `
    <h2 mat-dialog-title>New proposal</h2>
    <mat-dialog-content>
      <div class="bar-slot">
        @if (creating()) {
          <mat-progress-bar mode="indeterminate" aria-label="Creating the proposal" />
        }
      </div>
      <app-load-status
        [loading]="cycles.isLoading()"
        loadingLabel="Loading the open cycles"
        [error]="cyclesError()"
        [empty]="noneOpen()"
        emptyText="No cycle is open for proposals at the moment."
        (retry)="cycles.reload()"
      />
      <div aria-live="assertive">
        @if (serverError(); as message) {
          <p class="form-alert" data-testid="server-error">{{ message }}</p>
        }
      </div>
      <form id="new-proposal-form" [formGroup]="form" (ngSubmit)="create()" novalidate>
        <mat-form-field>
          <mat-label>Cycle</mat-label>
          <mat-select formControlName="cycleId" required>
            @for (cycle of openCycles(); track cycle.id) {
              <mat-option [value]="cycle.id">{{ cycle.code }} — {{ cycle.title }}</mat-option>
            }
          </mat-select>
          @if (selectedCycle(); as cycle) {
            <mat-hint data-testid="closes-hint">
              Call closes {{ cycle.callClosesAt | utcInstant }}
              @if (cycle.callClosesAt | localInstant; as local) {
                (your time: {{ local }})
              }
            </mat-hint>
          }
          <mat-error>{{ errorOf(form.controls.cycleId) }}</mat-error>
        </mat-form-field>
        <mat-form-field>
          <mat-label>Title</mat-label>
          <input matInput formControlName="title" required maxlength="200" autocomplete="off" />
          <mat-error data-testid="error-title">{{ errorOf(form.controls.title) }}</mat-error>
        </mat-form-field>
      </form>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" [mat-dialog-close]="undefined">Cancel</button>
      <button matButton="filled" type="submit" form="new-proposal-form" [disabled]="creating() || noneOpen()">Create draft</button>
    </mat-dialog-actions>
  `,
  styles: `
    form {
      display: flex;
      flex-direction: column;
      gap: 12px;
      padding-block-start: 8px;
      min-inline-size: min(420px, 70vw);
    }
    .bar-slot {
      block-size: 4px;
    }
  `,
})
export class NewProposalDialog {
  private readonly api = inject(ProposalApi);
  private readonly dialogRef = inject<MatDialogRef<NewProposalDialog, Proposal>>(MatDialogRef);

  protected readonly cycles = this.api.cyclesResource();
  protected readonly openCycles = computed(() =>
    (this.cycles.hasValue() ? this.cycles.value() : [])
      .filter((cycle) => cycle.status === 'open')
      .sort((a, b) => a.callClosesAt.localeCompare(b.callClosesAt)),
  );
  protected readonly noneOpen = computed(() => this.cycles.hasValue() && this.openCycles().length === 0);
  protected readonly cyclesError = computed(() => loadErrorText(this.cycles.error(), 'The cycles could not be loaded.'));

  protected readonly errorOf = controlErrorMessage;
  protected readonly creating = signal(false);
  protected readonly serverError = signal<string | null>(null);

  protected readonly form = new FormGroup({
    cycleId: new FormControl<number | null>(null, { validators: [Validators.required] }),
    title: new FormControl('', { nonNullable: true, validators: [zodValidator(createProposalSchema.shape.title)] }),
  });
  private readonly cycleId = toSignal(this.form.controls.cycleId.valueChanges, { initialValue: null });
  protected readonly selectedCycle = computed(() => this.openCycles().find((cycle) => cycle.id === this.cycleId()) ?? null);

  constructor() {
    // With a single open cycle, choose it.
    effect(() => {
      const open = this.openCycles();
      untracked(() => {
        if (open.length === 1 && this.form.controls.cycleId.value === null) this.form.controls.cycleId.setValue(open[0].id);
      });
    });
  }

  protected create(): void {
    if (this.creating()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const { cycleId, title } = this.form.getRawValue();
    this.creating.set(true);
    this.serverError.set(null);
    this.api.create({ cycleId: cycleId!, title: title.trim() }).subscribe({
      next: (proposal) => {
        this.creating.set(false);
        this.dialogRef.close(proposal);
      },
      error: (error: unknown) => {
        this.creating.set(false);
        const body = readApiError(error);
        const unmatched = applyServerFieldErrors(this.form, body.fieldErrors);
        this.serverError.set([body.message, ...unmatched].join(' '));
      },
    });
  }
}
