import { describe, expect, it } from 'vitest';
import { hashPassword, SCRYPT_PARAMS, verifyPassword } from './password.js';

describe('password hashing', () => {
  it('uses scrypt at N=2^17, r=8, p=1 (OWASP Password Storage Cheat Sheet) with a random salt', async () => {
    const a = await hashPassword('correct horse battery staple');
    const b = await hashPassword('correct horse battery staple');
    expect(a).toMatch(/^scrypt\$131072\$8\$1\$[\w-]{22}\$[\w-]{43}$/);
    expect(SCRYPT_PARAMS).toEqual({ N: 131072, r: 8, p: 1 });
    expect(a).not.toBe(b);
  });

  it('accepts the right password and refuses any other, and a malformed hash', async () => {
    const stored = await hashPassword('correct horse battery staple');
    expect(await verifyPassword('correct horse battery staple', stored)).toBe(true);
    expect(await verifyPassword('correct horse battery stapler', stored)).toBe(false);
    expect(await verifyPassword('correct horse battery staple', 'md5$abc')).toBe(false);
  });
});
