import { hashPassword, verifyPassword } from './password-hash';

describe('password-hash', () => {
  it('hashPassword then verifyPassword accepts the same password and rejects another', async () => {
    const stored = await hashPassword('correct horse battery');
    expect(stored).toMatch(/^scrypt\$\d+\$8\$1\$[A-Za-z0-9+/=]+\$[A-Za-z0-9+/=]+$/);
    await expect(verifyPassword('correct horse battery', stored)).resolves.toBe(true);
    await expect(verifyPassword('correct horse batterY', stored)).resolves.toBe(false);
  });

  it('hashPassword salts: the same password gives two different hashes', async () => {
    expect(await hashPassword('same password')).not.toEqual(await hashPassword('same password'));
  });

  it('hashPassword with SCRYPT_LOG_N set, records that cost; with a bad value, refuses naming the setting', async () => {
    const before = process.env.SCRYPT_LOG_N;
    try {
      process.env.SCRYPT_LOG_N = '10';
      expect(await hashPassword('cost check')).toMatch(/^scrypt\$10\$8\$1\$/);
      process.env.SCRYPT_LOG_N = '5';
      await expect(hashPassword('cost check')).rejects.toThrow(/SCRYPT_LOG_N/);
    } finally {
      if (before === undefined) delete process.env.SCRYPT_LOG_N;
      else process.env.SCRYPT_LOG_N = before;
    }
  });

  it('verifyPassword rejects malformed or foreign hashes without throwing', async () => {
    await expect(verifyPassword('x', 'bcrypt$2b$10$abc')).resolves.toBe(false);
    await expect(verifyPassword('x', 'scrypt$99$8$1$AA==$AA==')).resolves.toBe(false);
    await expect(verifyPassword('x', '')).resolves.toBe(false);
  });
});
