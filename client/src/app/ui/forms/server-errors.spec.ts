import { FormControl, FormGroup } from '@angular/forms';
import { signUpSchema } from '@spincycle/shared/accounts/account-schemas';
import { applyServerFieldErrors, controlErrorMessage } from './server-errors';
import { zodValidator } from './zod-validator';

describe('forms helpers', () => {
  const form = () =>
    new FormGroup({
      email: new FormControl('ok@example.org', { nonNullable: true, validators: [zodValidator(signUpSchema.shape.email)] }),
      displayName: new FormControl('Ada', { nonNullable: true }),
    });

  it('applyServerFieldErrors: puts each message on its control and returns the ones without a field', () => {
    const f = form();
    const unmatched = applyServerFieldErrors(f, { email: ['Taken', 'Really.'], 'targets.3.raDeg': ['Out of range'] });
    expect(controlErrorMessage(f.controls.email)).toBe('Taken Really.');
    expect(f.controls.email.touched).toBe(true);
    expect(f.controls.displayName.valid).toBe(true);
    expect(unmatched).toEqual(['Out of range']);
  });

  it('a server message goes away when the field is edited', () => {
    const f = form();
    applyServerFieldErrors(f, { email: ['Taken'] });
    f.controls.email.setValue('other@example.org');
    expect(f.controls.email.errors).toBeNull();
  });

  it('zodValidator: reports the shared schema message', () => {
    const f = form();
    f.controls.email.setValue('not an address');
    expect(controlErrorMessage(f.controls.email)).toBe('Enter a valid e-mail address');
  });
});
