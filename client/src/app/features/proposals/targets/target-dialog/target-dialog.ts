import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { AbstractControl, FormControl, FormGroup, ReactiveFormsModule, ValidationErrors, ValidatorFn } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import {
  MAT_DIALOG_DATA,
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { NODE_BANDS, type NodeBand } from '@spincycle/shared/facility/facility-types';
import { TARGET_COLOUR_SYSTEMS, type TargetColourSystem } from '@spincycle/shared/science/colour-sequence';
import { parseDec, parseRa, parseRaDec, SkyInputError } from '@spincycle/shared/sky/index';
import { targetInputSchema, type TargetInput, type TargetRow } from '@spincycle/shared/proposals/target-schemas';
import { map, startWith } from 'rxjs';
import { readApiError } from '../../../../core/http/api-error-message';
import { applyServerFieldErrors, controlErrorMessage } from '../../../../ui/forms/server-errors';
import { zodValidator } from '../../../../ui/forms/zod-validator';
import { formatDecDms, formatRaHms } from '@spincycle/shared/proposals/sexagesimal';
import { TargetApi } from '../target-api';

export interface TargetDialogData {
  proposalId: number;
  /** The row to edit; absent to add one. */
  target?: TargetRow;
}

/** What the dialog closes with: the stored row, or a request to reload the list after a conflict. */
export type TargetDialogResult = { saved: TargetRow } | { reload: true };

const COLOUR_SYSTEM_LABELS: Record<TargetColourSystem, string> = { BV: 'B−V', BPRP: 'Gaia BP−RP' };

/** Which form control shows an error about an API field. */
const FIELD_TO_CONTROL: Record<string, string> = { raDeg: 'ra', decDeg: 'dec' };

/** Re-keys server or schema paths (`target.raDeg`, `decDeg`) to this form's controls. */
export function toTargetFormPaths(fieldErrors: Record<string, string[]> | undefined): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const [path, messages] of Object.entries(fieldErrors ?? {})) {
    const key = path.replace(/^target\./, '');
    (out[FIELD_TO_CONTROL[key] ?? key] ??= []).push(...messages);
  }
  return out;
}

/** A validator from one of the shared RA/Dec parsers, reporting its reason. */
function coordinateValidator(parse: (text: string) => number): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    const text = String(control.value ?? '').trim();
    if (!text) return { schema: 'Enter the coordinate' };
    try {
      parse(text);
      return null;
    } catch (error) {
      return { schema: error instanceof SkyInputError ? error.reason : 'Check this value' };
    }
  };
}

const optionalNumber = () => new FormControl<number | null>(null);

/** When a proposer should give a period of their own (shown under the field and in the table's header tooltip). */
export const EXPECTED_PERIOD_HINT = 'Only for stars without an expected period from their colour and age (fast rotators, M dwarfs beyond the relations)';

/**
 * Adds or edits one target. RA and Dec are typed as text in any of the forms the shared
 * parser reads (degrees, hours, sexagesimal); the whole row is checked with the shared
 * target schema before it is sent, and the server's own messages land on the same fields.
 */
@Component({
  selector: 'app-target-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
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
  ],
  templateUrl: './target-dialog.html',
  styleUrl: './target-dialog.scss',
})
export class TargetDialog {
  private readonly api = inject(TargetApi);
  private readonly dialogRef = inject<MatDialogRef<TargetDialog, TargetDialogResult>>(MatDialogRef);
  protected readonly data = inject<TargetDialogData>(MAT_DIALOG_DATA);

  protected readonly bands = NODE_BANDS;
  protected readonly colourSystems = TARGET_COLOUR_SYSTEMS;
  protected readonly colourSystemLabels = COLOUR_SYSTEM_LABELS;
  protected readonly errorOf = controlErrorMessage;
  protected readonly periodHint = EXPECTED_PERIOD_HINT;
  protected readonly editing = !!this.data.target;

  protected readonly form = new FormGroup({
    name: new FormControl('', { nonNullable: true, validators: [zodValidator(targetInputSchema.shape.name)] }),
    ra: new FormControl('', { nonNullable: true, validators: [coordinateValidator((t) => parseRa(t))] }),
    dec: new FormControl('', { nonNullable: true, validators: [coordinateValidator((t) => parseDec(t))] }),
    magnitude: new FormControl<number | null>(null, { validators: [zodValidator(targetInputSchema.shape.magnitude)] }),
    magnitudeBand: new FormControl<NodeBand>('V', { nonNullable: true }),
    colour: new FormControl<number | null>(null, { validators: [zodValidator(targetInputSchema.shape.colour)] }),
    colourSystem: new FormControl<TargetColourSystem>('BV', { nonNullable: true }),
    reddeningEbv: optionalNumber(),
    ageMyr: new FormControl<number | null>(null, { validators: [zodValidator(targetInputSchema.shape.ageMyr)] }),
    ageUncertaintyMyr: optionalNumber(),
    periodPrecisionDays: optionalNumber(),
    periodDays: optionalNumber(),
    periodUncertaintyDays: optionalNumber(),
    notes: new FormControl('', { nonNullable: true, validators: [zodValidator(targetInputSchema.shape.notes)] }),
  });

  /** The typed position read back in both notations, so a typo shows before saving. */
  protected readonly raReading = toSignal(
    this.form.controls.ra.valueChanges.pipe(
      startWith(this.form.controls.ra.value),
      map((text) => readBack(text, (t) => parseRa(t), (deg) => `${deg.toFixed(5)}° = ${formatRaHms(deg)}`)),
    ),
    { initialValue: '' },
  );
  protected readonly decReading = toSignal(
    this.form.controls.dec.valueChanges.pipe(
      startWith(this.form.controls.dec.value),
      map((text) => readBack(text, (t) => parseDec(t), (deg) => `${deg.toFixed(5)}° = ${formatDecDms(deg)}`)),
    ),
    { initialValue: '' },
  );

  protected readonly saving = signal(false);
  protected readonly serverError = signal<string | null>(null);
  protected readonly conflict = signal(false);
  protected readonly title = computed(() => (this.editing ? `Edit ${this.data.target!.name}` : 'Add a target'));

  constructor() {
    const target = this.data.target;
    if (target) {
      this.form.setValue({
        name: target.name,
        ra: String(target.raDeg),
        dec: String(target.decDeg),
        magnitude: target.magnitude,
        magnitudeBand: target.magnitudeBand,
        colour: target.colour,
        colourSystem: target.colourSystem,
        reddeningEbv: target.reddeningEbv,
        ageMyr: target.ageMyr,
        ageUncertaintyMyr: target.ageUncertaintyMyr,
        periodPrecisionDays: target.periodPrecisionDays,
        periodDays: target.periodDays,
        periodUncertaintyDays: target.periodUncertaintyDays,
        notes: target.notes,
      });
    }
  }

  protected save(): void {
    if (this.saving() || this.conflict()) return;
    this.serverError.set(null);
    const input = this.toInput();
    if (!input) {
      this.form.markAllAsTouched();
      return;
    }
    const target = this.data.target;
    const request = target
      ? this.api.update(this.data.proposalId, target.id, target.version, input)
      : this.api.create(this.data.proposalId, input);
    this.saving.set(true);
    request.subscribe({
      next: (saved) => {
        this.saving.set(false);
        this.dialogRef.close({ saved });
      },
      error: (error: unknown) => {
        this.saving.set(false);
        const body = readApiError(error);
        if (error instanceof HttpErrorResponse && error.status === 409) {
          this.conflict.set(true);
          this.serverError.set(`${body.message} Reload the list to edit the stored row.`);
          return;
        }
        const unmatched = applyServerFieldErrors(this.form, toTargetFormPaths(body.fieldErrors));
        this.serverError.set([body.message, ...unmatched].join(' '));
      },
    });
  }

  protected reloadList(): void {
    this.dialogRef.close({ reload: true });
  }

  /** The row as the API takes it, or null after putting each problem on its field. */
  private toInput(): TargetInput | null {
    const v = this.form.getRawValue();
    let position: { raDeg: number; decDeg: number };
    try {
      position = parseRaDec(v.ra, v.dec);
    } catch (error) {
      if (error instanceof SkyInputError) applyServerFieldErrors(this.form, { [error.field]: [error.reason] });
      return null;
    }
    const parsed = targetInputSchema.safeParse({
      name: v.name,
      raDeg: position.raDeg,
      decDeg: position.decDeg,
      magnitude: v.magnitude,
      magnitudeBand: v.magnitudeBand,
      colour: v.colour,
      colourSystem: v.colourSystem,
      reddeningEbv: v.reddeningEbv,
      ageMyr: v.ageMyr,
      ageUncertaintyMyr: v.ageUncertaintyMyr,
      periodPrecisionDays: v.periodPrecisionDays,
      periodDays: v.periodDays,
      periodUncertaintyDays: v.periodUncertaintyDays,
      notes: v.notes,
    });
    if (!parsed.success) {
      const fieldErrors: Record<string, string[]> = {};
      for (const issue of parsed.error.issues) fieldErrors[issue.path.join('.')] ??= [issue.message];
      applyServerFieldErrors(this.form, toTargetFormPaths(fieldErrors));
      return null;
    }
    return parsed.data;
  }
}

function readBack(text: string, parse: (t: string) => number, show: (deg: number) => string): string {
  if (!text.trim()) return '';
  try {
    return show(parse(text));
  } catch {
    return '';
  }
}
