import { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';
import type { ZodType } from 'zod';

/**
 * An Angular validator from a field of a shared zod schema, so that the form checks what the
 * server will check, with the same words. The error key is `schema`, its value the message.
 */
export function zodValidator(schema: ZodType): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    const result = schema.safeParse(control.value);
    return result.success ? null : { schema: result.error.issues[0]?.message ?? 'Check this value' };
  };
}
