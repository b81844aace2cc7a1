// Password hashing: scrypt with a per-hash salt, parameters encoded in the stored string.
import { describe, expect, it } from 'vitest';
import { hashPassword, needsRehash, parseHash, verifyAgainstDummy, verifyPassword } from '../../../backend/src/services/passwords';

const cheap = { N: 2 ** 10, r: 8, p: 1 };

describe('passwords', () => {
  it('verifies the right password and refuses a wrong one', async () => {
    const stored = await hashPassword('correct horse battery', cheap);
    expect(stored).toMatch(/^scrypt\$N=1024,r=8,p=1\$[A-Za-z0-9+/=]+\$[A-Za-z0-9+/=]+$/);
    expect(await verifyPassword('correct horse battery', stored)).toBe(true);
    expect(await verifyPassword('correct horse batterY', stored)).toBe(false);
  });

  it('salts every hash differently', async () => {
    expect(await hashPassword('same', cheap)).not.toBe(await hashPassword('same', cheap));
  });

  it('verifies with the parameters stored in the hash, and asks for a rehash when they are below today\'s', async () => {
    const old = await hashPassword('pw', cheap);
    expect(await verifyPassword('pw', old)).toBe(true);
    expect(needsRehash(old)).toBe(true);
    expect(needsRehash(await hashPassword('pw'))).toBe(false);
  });

  it.each([
    ['empty', ''],
    ['another scheme', '$2b$10$abcdefghijklmnopqrstuv'],
    ['N not a power of two', 'scrypt$N=1000,r=8,p=1$AAAA$AAAA'],
    ['N absurdly large', 'scrypt$N=4194304,r=8,p=1$AAAA$AAAA'],
  ])('refuses a malformed stored hash (%s)', async (_label, stored) => {
    expect(parseHash(stored)).toBeNull();
    expect(await verifyPassword('pw', stored)).toBe(false);
  });

  it('the dummy check always fails', async () => {
    expect(await verifyAgainstDummy('anything')).toBe(false);
  });
});
