import { AbstractControl, FormControl, FormGroup, ValidationErrors, ValidatorFn } from '@angular/forms';
import { type DetrendOptions, detrendOptionsSchema, type OffsetMode } from '@spincycle/shared/photometry/photometry';
import type { ZodType } from 'zod';

/** The detrending choices as a form: each optional step is a toggle and its number. */
export type DetrendForm = FormGroup<{
  offsets: FormControl<OffsetMode>;
  clip: FormControl<boolean>;
  clipSigma: FormControl<number | null>;
  bin: FormControl<boolean>;
  binMinutes: FormControl<number | null>;
}>;

/** Default σ and bin width offered when a step is switched on. */
export const CLIP_SIGMA_DEFAULT = 5;
export const BIN_MINUTES_DEFAULT = 10;

/** A field of the shared schema, checked only while its step is on (a disabled control is not validated). */
function stepValidator(schema: ZodType, missing: string): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    if (control.value === null || control.value === '') return { schema: missing };
    const result = schema.safeParse(control.value);
    return result.success ? null : { schema: result.error.issues[0]?.message ?? 'Check this value' };
  };
}

/** The detrending form filled from the choices in force. */
export function createDetrendForm(options: DetrendOptions): DetrendForm {
  const shape = detrendOptionsSchema.shape;
  const form: DetrendForm = new FormGroup({
    offsets: new FormControl<OffsetMode>(options.offsets, { nonNullable: true }),
    clip: new FormControl(options.clipSigma !== null, { nonNullable: true }),
    clipSigma: new FormControl<number | null>(options.clipSigma ?? CLIP_SIGMA_DEFAULT, {
      validators: stepValidator(shape.clipSigma, 'Enter the clipping level in σ'),
    }),
    bin: new FormControl(options.binMinutes !== null, { nonNullable: true }),
    binMinutes: new FormControl<number | null>(options.binMinutes ?? BIN_MINUTES_DEFAULT, {
      validators: stepValidator(shape.binMinutes, 'Enter the bin width in minutes'),
    }),
  });
  const follow = (toggle: FormControl<boolean>, field: FormControl<number | null>) => {
    const apply = (on: boolean) => (on ? field.enable({ emitEvent: false }) : field.disable({ emitEvent: false }));
    apply(toggle.value);
    toggle.valueChanges.subscribe(apply);
  };
  follow(form.controls.clip, form.controls.clipSigma);
  follow(form.controls.bin, form.controls.binMinutes);
  return form;
}

/** The choices the form holds (null for a step that is off), or null while a number is invalid. */
export function detrendOptionsOf(form: DetrendForm): DetrendOptions | null {
  if (form.invalid) return null;
  const v = form.getRawValue();
  return {
    offsets: v.offsets,
    clipSigma: v.clip ? Number(v.clipSigma) : null,
    binMinutes: v.bin ? Number(v.binMinutes) : null,
  };
}

/** One line on what each zero-point choice does. */
export const OFFSET_MODE_HELP: Readonly<Record<OffsetMode, string>> = {
  none: 'The values are used as they are: use it when every point is already on one scale.',
  node: 'Each node’s points are shifted to a common mean, removing differences between cameras, filters and comparison stars.',
  node_night:
    'Each night of each node is shifted to a common mean: this also removes slow drifts, but erases changes longer than a night, so use it only for short periods.',
};
