import { createHash, randomBytes } from 'node:crypto';

/**
 * The secret of an e-mailed link (password reset, proposal invitation): 32 random bytes,
 * URL-safe. Only its hash is stored, so that a database leak does not leak usable links.
 */
export function newLinkToken(): string {
  return randomBytes(32).toString('base64url');
}

/** SHA-256 (hex) of a link token, as stored and looked up. */
export function hashLinkToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}
