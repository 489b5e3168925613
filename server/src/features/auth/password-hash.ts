import { randomBytes, scrypt as scryptCallback, timingSafeEqual, type ScryptOptions } from 'node:crypto';
import { loadSettings } from '../../config';

/**
 * Password hashing with scrypt (memory-hard, in node:crypto). Stored as
 * `scrypt$<log2 N>$<r>$<p>$<salt b64>$<hash b64>` so that parameters can be raised later
 * without invalidating existing hashes. Default cost: N = 2^17, r = 8, p = 1 (the
 * minimum of the OWASP Password Storage Cheat Sheet for scrypt); the SCRYPT_LOG_N setting
 * (config.ts) sets log2 N, which tests lower to keep the suite quick.
 */
const KEY_LENGTH = 32;

function scrypt(password: string, salt: Buffer, options: ScryptOptions): Promise<Buffer> {
  return new Promise((resolve, reject) =>
    scryptCallback(password, salt, KEY_LENGTH, options, (err, key) => (err ? reject(err) : resolve(key))),
  );
}

/**
 * The cost of new hashes. Read per hash rather than passed in: hashPassword is called by the
 * auth service, the seeds and the tests alike, and none of them should have to carry the setting.
 */
function configuredCost(): { logN: number; r: number; p: number } {
  return { logN: loadSettings().SCRYPT_LOG_N, r: 8, p: 1 };
}

const maxmemFor = (logN: number, r: number) => 128 * r * 2 ** logN * 2;

/** Hashes a password with a fresh random salt. */
export async function hashPassword(password: string): Promise<string> {
  const { logN, r, p } = configuredCost();
  const salt = randomBytes(16);
  const key = await scrypt(password, salt, { N: 2 ** logN, r, p, maxmem: maxmemFor(logN, r) });
  return ['scrypt', logN, r, p, salt.toString('base64'), key.toString('base64')].join('$');
}

/** Checks a password against a stored hash in constant time; false for any malformed hash. */
export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const parts = stored.split('$');
  if (parts.length !== 6 || parts[0] !== 'scrypt') return false;
  const [logN, r, p] = parts.slice(1, 4).map(Number);
  if (![logN, r, p].every(Number.isInteger) || logN < 10 || logN > 20) return false;
  const salt = Buffer.from(parts[4], 'base64');
  const expected = Buffer.from(parts[5], 'base64');
  const key = await scrypt(password, salt, { N: 2 ** logN, r, p, maxmem: maxmemFor(logN, r) });
  return key.length === expected.length && timingSafeEqual(key, expected);
}

/** A hash of a random password, compared against when the e-mail is unknown so that timing does not reveal it. */
let dummyHash: Promise<string> | undefined;
export function dummyPasswordHash(): Promise<string> {
  dummyHash ??= hashPassword(randomBytes(16).toString('hex'));
  return dummyHash;
}
