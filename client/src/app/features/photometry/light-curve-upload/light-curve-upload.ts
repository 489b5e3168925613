import { DecimalPipe } from '@angular/common';
import { HttpEventType } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, LOCALE_ID, output, signal, untracked } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatSelect } from '@angular/material/select';
import {
  DEFAULT_DETREND,
  type DetrendOptions,
  LIGHT_CURVE_COLUMN_HELP,
  LIGHT_CURVE_LIMITS,
  LIGHT_CURVE_VALUE_KIND_LABELS,
  LIGHT_CURVE_VALUE_KINDS,
  type LightCurveValueKind,
  type PhotometryRunStatus,
  type PhotometryTargetRow,
  TIME_SYSTEM_LABELS,
  TIME_SYSTEMS,
  type TimeSystem,
} from '@spincycle/shared/photometry/photometry';
import { readApiError } from '../../../core/http/api-error-message';
import { fileSizeProblem, formatFileSize } from '../../../ui/file-picker/file-size';
import { UploadProgress } from '../../../ui/file-picker/upload-progress';
import { UploadRefusal } from '../../../ui/file-picker/upload-refusal';
import { createDetrendForm, detrendOptionsOf } from '../detrend-fields/detrend-form';
import { DetrendFields } from '../detrend-fields/detrend-fields';
import { PhotometryApi } from '../photometry-api';
import { LightCurveErrors } from './light-curve-errors';
import { type LightCurveProblems, lightCurveProblemsOf } from './light-curve-refusal';

type Outcome = { kind: 'queued'; files: number } | { kind: 'refused'; message: string; problems: LightCurveProblems };

/** The time system and value kind selects: '' leaves it to the file (its column names). */
type FromFile = '';

/**
 * Uploads a program's light curves: one or more CSV files, how their times count and what their
 * values are (unless the column names say it), the target of files without a target column,
 * and the detrending choices of the analysis that follows. A refused upload lists every problem
 * by file, row and column, and nothing is stored; an accepted one queues the analysis, whose
 * progress the page shows.
 */
@Component({
  selector: 'app-light-curve-upload',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    DecimalPipe,
    DetrendFields,
    LightCurveErrors,
    MatButton,
    MatFormField,
    MatHint,
    MatIcon,
    MatIconButton,
    MatLabel,
    MatOption,
    MatSelect,
    ReactiveFormsModule,
    UploadProgress,
    UploadRefusal,
  ],
  templateUrl: './light-curve-upload.html',
  styleUrl: './light-curve-upload.scss',
})
export class LightCurveUpload {
  private readonly api = inject(PhotometryApi);
  private readonly locale = inject(LOCALE_ID);

  readonly proposalId = input.required<number>();
  /** The program's targets (for the target select). */
  readonly targets = input<readonly PhotometryTargetRow[]>([]);
  /** The detrending choices in force (the form starts from them). */
  readonly detrend = input<DetrendOptions>(DEFAULT_DETREND);
  /** Emitted when the upload was stored and its analysis queued. */
  readonly queued = output<PhotometryRunStatus>();

  protected readonly limits = LIGHT_CURVE_LIMITS;
  protected readonly columnHelp = LIGHT_CURVE_COLUMN_HELP;
  protected readonly timeSystems = TIME_SYSTEMS;
  protected readonly timeSystemLabels = TIME_SYSTEM_LABELS;
  protected readonly valueKinds = LIGHT_CURVE_VALUE_KINDS;
  protected readonly valueKindLabels = LIGHT_CURVE_VALUE_KIND_LABELS;
  protected readonly maxFileSize = formatFileSize(LIGHT_CURVE_LIMITS.maxFileBytes, this.locale);

  protected readonly timeSystem = new FormControl<TimeSystem | FromFile>('', { nonNullable: true });
  protected readonly valueKind = new FormControl<LightCurveValueKind | FromFile>('', { nonNullable: true });
  /** Null: the files name their targets in a `target` column. */
  protected readonly targetId = new FormControl<number | null>(null);
  protected readonly detrendForm = createDetrendForm(DEFAULT_DETREND);

  protected readonly files = signal<readonly File[]>([]);
  /** Why the last choice of files was not taken. */
  protected readonly fileProblem = signal<string | null>(null);
  /** Percent sent while an upload is on its way ('unknown' before the first progress event). */
  protected readonly progress = signal<number | 'unknown' | null>(null);
  protected readonly outcome = signal<Outcome | null>(null);
  protected readonly uploading = computed(() => this.progress() !== null);
  protected readonly totalBytes = computed(() => this.files().reduce((sum, f) => sum + f.size, 0));

  constructor() {
    // The form starts from the choices in force, and follows them until the person edits it.
    effect(() => {
      const options = this.detrend();
      untracked(() => {
        if (this.detrendForm.pristine) {
          this.detrendForm.reset({
            offsets: options.offsets,
            clip: options.clipSigma !== null,
            clipSigma: options.clipSigma ?? this.detrendForm.controls.clipSigma.value,
            bin: options.binMinutes !== null,
            binMinutes: options.binMinutes ?? this.detrendForm.controls.binMinutes.value,
          });
        }
      });
    });
  }

  protected sizeOf(file: { size: number }): string {
    return formatFileSize(file.size, this.locale);
  }

  protected choose(native: HTMLInputElement): void {
    const chosen = native.files ? Array.from(native.files) : [];
    // The chosen files live in `files`: clearing the input lets the same files be chosen again.
    native.value = '';
    if (!chosen.length) return;
    this.outcome.set(null);
    if (chosen.length > LIGHT_CURVE_LIMITS.maxFiles) {
      this.fileProblem.set(`${chosen.length} files were chosen; send at most ${LIGHT_CURVE_LIMITS.maxFiles} at once.`);
      return;
    }
    const tooLarge = chosen.map((file) => fileSizeProblem(file, LIGHT_CURVE_LIMITS.maxFileBytes, this.locale)).find((p) => p !== null);
    if (tooLarge) {
      this.fileProblem.set(tooLarge);
      return;
    }
    this.fileProblem.set(null);
    this.files.set(chosen);
  }

  protected remove(file: File): void {
    this.files.update((files) => files.filter((f) => f !== file));
  }

  protected upload(): void {
    const files = this.files();
    const detrend = detrendOptionsOf(this.detrendForm);
    if (!files.length || this.uploading()) return;
    if (!detrend) {
      this.detrendForm.markAllAsTouched();
      return;
    }
    this.progress.set('unknown');
    this.outcome.set(null);
    const targetId = this.targetId.value;
    this.api
      .upload(this.proposalId(), files, {
        timeSystem: this.timeSystem.value || undefined,
        valueKind: this.valueKind.value || undefined,
        targetId: targetId ?? undefined,
        detrend,
      })
      .subscribe({
        next: (event) => {
          if (event.type === HttpEventType.UploadProgress) {
            this.progress.set(event.total ? Math.round((100 * event.loaded) / event.total) : 'unknown');
          } else if (event.type === HttpEventType.Response && event.body) {
            this.progress.set(null);
            this.outcome.set({ kind: 'queued', files: files.length });
            // Stored: clear the chosen files so that they are not sent twice by mistake.
            this.files.set([]);
            this.queued.emit(event.body.run);
          }
        },
        error: (error: unknown) => {
          this.progress.set(null);
          this.outcome.set({ kind: 'refused', message: readApiError(error).message, problems: lightCurveProblemsOf(error) });
        },
      });
  }
}
