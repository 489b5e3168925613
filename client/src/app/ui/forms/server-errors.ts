import { AbstractControl, FormGroup } from '@angular/forms';

/**
 * Puts the server's `fieldErrors` on the matching controls (error key `server`) so that each
 * message shows under its field. The message goes away as soon as the field is edited, since
 * editing re-runs the validators. Returns the messages whose field is not on the form.
 */
export function applyServerFieldErrors(form: FormGroup, fieldErrors: Record<string, string[]> | undefined): string[] {
  const unmatched: string[] = [];
  for (const [path, messages] of Object.entries(fieldErrors ?? {})) {
    const control = form.get(path);
    const message = messages.join(' ');
    if (control) {
      control.setErrors({ ...control.errors, server: message });
      control.markAsTouched();
    } else {
      unmatched.push(message);
    }
  }
  return unmatched;
}

/** The sentence to show under a field for its first error. */
export function controlErrorMessage(control: AbstractControl): string {
  const errors = control.errors;
  if (!errors) return '';
  if (typeof errors['server'] === 'string') return errors['server'];
  if (typeof errors['schema'] === 'string') return errors['schema'];
  if (errors['required']) return 'This field is required';
  if (errors['mismatch']) return 'The two passwords differ';
  return 'Check this value';
}
