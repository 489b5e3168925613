import commonPasswords from 'fxa-common-password-list';
import { PASSWORD_CONTAINS_EMAIL_MESSAGE, passwordContainsEmail } from '@spincycle/shared/accounts/account-schemas';
import { AppError } from '../../http/app-error';

/** Message when a password is on the common-password list. */
export const COMMON_PASSWORD_MESSAGE = 'This password is on a list of commonly used passwords, which attackers try first. Choose another.';

/**
 * True when the password (or its lower-case form) is on Mozilla's common-password list
 * (npm `fxa-common-password-list`, the list Firefox Accounts refuses; about 10 000 entries of
 * at least 8 characters, from leaked-password corpora). Server-side only: the list stays out
 * of the browser bundle.
 */
export function isCommonPassword(password: string): boolean {
  return commonPasswords.test(password) || commonPasswords.test(password.toLowerCase());
}

/**
 * The password rules beyond length (which the shared schema checks): not a common password,
 * not the e-mail address, not containing its local part. 400 `weak_password` on the field.
 */
export function requireAcceptablePassword(password: string, email: string, field = 'password'): void {
  const problem = isCommonPassword(password)
    ? COMMON_PASSWORD_MESSAGE
    : passwordContainsEmail(password, email)
      ? PASSWORD_CONTAINS_EMAIL_MESSAGE
      : null;
  if (problem) throw new AppError('weak_password', `${field}: ${problem}`, 400, { [field]: [problem] });
}
