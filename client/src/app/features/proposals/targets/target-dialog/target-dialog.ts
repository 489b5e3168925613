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
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { NODE_BANDS, type NodeBand } from '@spincycle/shared/facility/facility-types';
import type { TargetColourSystem } from '@spincycle/shared/science/colour-sequence';
import { parseDec, parseRa, SkyInputError } from '@spincycle/shared/sky/index';
import { colourPlausibilityWarning } from '@spincycle/shared/proposals/colour-plausibility';
import { coordinateMessage, type CoordinateKind } from '@spincycle/shared/proposals/coordinate-messages';
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

/** The colour systems in the order the toggle shows them: Gaia BP−RP first, the default everywhere. */
export const COLOUR_SYSTEM_CHOICES: readonly { system: TargetColourSystem; label: string; name: string }[] = [
  { system: 'BPRP', label: 'BP−RP', name: 'Gaia BP−RP' },
  { system: 'BV', label: 'B−V', name: 'Johnson B−V' },
];

/** The colour system a new target starts with (as in the planner and the example list). */
export const DEFAULT_COLOUR_SYSTEM: TargetColourSystem = 'BPRP';

/** Labels of the form's fields, for the summary of what needs a change. */
const FIELD_LABELS: Record<string, string> = {
  name: 'Name',
  ra: 'RA',
  dec: 'Dec',
  magnitude: 'Magnitude',
  magnitudeBand: 'Band',
  colour: 'Colour',
  colourSystem: 'Colour system',
  reddeningEbv: 'Reddening',
  ageMyr: 'Age',
  ageUncertaintyMyr: 'Age uncertainty',
  periodPrecisionDays: 'Period precision',
  periodDays: 'Period',
  periodUncertaintyDays: 'Period uncertainty',
  notes: 'Notes',
};

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

/** Reads a typed RA or Dec: degrees, or the message to show under the field. */
function readCoordinate(kind: CoordinateKind, text: string): { deg: number } | { message: string } {
  try {
    return { deg: kind === 'ra' ? parseRa(text, 'ra') : parseDec(text, 'dec') };
  } catch (error) {
    if (error instanceof SkyInputError) return { message: coordinateMessage(kind, error.reason, text) };
    throw error;
  }
}

/** A validator from the shared RA/Dec parsers, in the product's words with the text as typed. */
function coordinateValidator(kind: CoordinateKind): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    const read = readCoordinate(kind, String(control.value ?? ''));
    return 'message' in read ? { schema: read.message } : null;
  };
}

type NumberField = 'reddeningEbv' | 'ageUncertaintyMyr' | 'periodPrecisionDays' | 'periodDays' | 'periodUncertaintyDays';
const optionalNumber = (field: NumberField) =>
  new FormControl<number | null>(null, { validators: [zodValidator(targetInputSchema.shape[field])] });

/** When a proposer should give a period of their own (shown under the field and in the table's header tooltip). */
export const EXPECTED_PERIOD_HINT =
  'Only for stars without an expected period from their colour and age (fast rotators, M dwarfs beyond the relations)';

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
    MatButtonToggle,
    MatButtonToggleGroup,
    MatDialogActions,
    MatDialogClose,
    MatDialogContent,
    MatDialogTitle,
    MatError,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    MatOption,
    MatProgressBar,
    MatSelect,
    MatSuffix,
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
  protected readonly colourSystems = COLOUR_SYSTEM_CHOICES;
  protected readonly errorOf = controlErrorMessage;
  protected readonly periodHint = EXPECTED_PERIOD_HINT;
  protected readonly editing = !!this.data.target;

  protected readonly form = new FormGroup({
    name: new FormControl('', { nonNullable: true, validators: [zodValidator(targetInputSchema.shape.name)] }),
    ra: new FormControl('', { nonNullable: true, validators: [coordinateValidator('ra')] }),
    dec: new FormControl('', { nonNullable: true, validators: [coordinateValidator('dec')] }),
    magnitude: new FormControl<number | null>(null, { validators: [zodValidator(targetInputSchema.shape.magnitude)] }),
    magnitudeBand: new FormControl<NodeBand>('V', { nonNullable: true }),
    colour: new FormControl<number | null>(null, { validators: [zodValidator(targetInputSchema.shape.colour)] }),
    colourSystem: new FormControl<TargetColourSystem>(DEFAULT_COLOUR_SYSTEM, { nonNullable: true }),
    reddeningEbv: optionalNumber('reddeningEbv'),
    ageMyr: new FormControl<number | null>(null, { validators: [zodValidator(targetInputSchema.shape.ageMyr)] }),
    ageUncertaintyMyr: optionalNumber('ageUncertaintyMyr'),
    periodPrecisionDays: optionalNumber('periodPrecisionDays'),
    periodDays: optionalNumber('periodDays'),
    periodUncertaintyDays: optionalNumber('periodUncertaintyDays'),
    notes: new FormControl('', { nonNullable: true, validators: [zodValidator(targetInputSchema.shape.notes)] }),
  });

  /** The typed position read back in both notations, so a typo shows before saving. */
  protected readonly raReading = toSignal(
    this.form.controls.ra.valueChanges.pipe(
      startWith(this.form.controls.ra.value),
      map((text) =>
        readBack(
          text,
          (t) => parseRa(t),
          (deg) => `${deg.toFixed(5)}° = ${formatRaHms(deg)}`,
        ),
      ),
    ),
    { initialValue: '' },
  );
  protected readonly decReading = toSignal(
    this.form.controls.dec.valueChanges.pipe(
      startWith(this.form.controls.dec.value),
      map((text) =>
        readBack(
          text,
          (t) => parseDec(t),
          (deg) => `${deg.toFixed(5)}° = ${formatDecDms(deg)}`,
        ),
      ),
    ),
    { initialValue: '' },
  );

  private readonly colourInputs = toSignal(
    this.form.valueChanges.pipe(
      startWith(null),
      map(() => {
        const v = this.form.getRawValue();
        return { colour: v.colour, system: v.colourSystem, ebv: v.reddeningEbv };
      }),
    ),
    { initialValue: { colour: null, system: DEFAULT_COLOUR_SYSTEM, ebv: null } },
  );
  /** The colour system's short label, shown inside the colour field. */
  protected readonly colourSystemLabel = computed(
    () => COLOUR_SYSTEM_CHOICES.find((c) => c.system === this.colourInputs().system)?.label ?? '',
  );
  /** A warning, not an error: the colour is implausible for a dwarf in the chosen system. */
  protected readonly colourWarning = computed(() => {
    const { colour, system, ebv } = this.colourInputs();
    return colourPlausibilityWarning(colour, system, ebv);
  });

  protected readonly saving = signal(false);
  /** The fields that need a change, named once above the form after a refused save. */
  protected readonly fieldsToFix = signal<string[]>([]);
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
      this.fieldsToFix.set(this.invalidFields());
      return;
    }
    this.fieldsToFix.set([]);
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
        // Every field the server names gets its message under the field; the banner says only
        // what has no field, so nothing is said twice.
        const unmatched = applyServerFieldErrors(this.form, toTargetFormPaths(body.fieldErrors));
        const onFields = this.invalidFields();
        this.fieldsToFix.set(onFields);
        this.serverError.set(unmatched.length ? unmatched.join(' ') : onFields.length ? null : body.message);
      },
    });
  }

  protected reloadList(): void {
    this.dialogRef.close({ reload: true });
  }

  /** Labels of the controls that hold an error now, in the form's order. */
  private invalidFields(): string[] {
    return Object.entries(this.form.controls)
      .filter(([, control]) => control.invalid)
      .map(([key]) => FIELD_LABELS[key] ?? key);
  }

  /**
   * The row as the API takes it, or null after putting every problem on its field at once:
   * RA and Dec are read on their own, and the rest of the row is checked even when they fail.
   */
  private toInput(): TargetInput | null {
    const v = this.form.getRawValue();
    const ra = readCoordinate('ra', v.ra);
    const dec = readCoordinate('dec', v.dec);
    const fieldErrors: Record<string, string[]> = {};
    if ('message' in ra) fieldErrors['ra'] = [ra.message];
    if ('message' in dec) fieldErrors['dec'] = [dec.message];
    const parsed = targetInputSchema.safeParse({
      name: v.name,
      // A placeholder where the text could not be read: its message is already set above.
      raDeg: 'deg' in ra ? ra.deg : 0,
      decDeg: 'deg' in dec ? dec.deg : 0,
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
      for (const issue of parsed.error.issues) fieldErrors[issue.path.join('.')] ??= [issue.message];
    }
    if (Object.keys(fieldErrors).length || !parsed.success) {
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
