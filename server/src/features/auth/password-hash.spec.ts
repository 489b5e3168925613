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

  it('verifyPassword rejects malformed or foreign hashes without throwing', async () => {
    await expect(verifyPassword('x', 'bcrypt$2b$10$abc')).resolves.toBe(false);
    await expect(verifyPassword('x', 'scrypt$99$8$1$AA==$AA==')).resolves.toBe(false);
    await expect(verifyPassword('x', '')).resolves.toBe(false);
  });
});
