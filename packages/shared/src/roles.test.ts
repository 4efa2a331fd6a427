import { describe, expect, it } from 'vitest';
import { hasAnyRole } from './roles.js';

describe('hasAnyRole', () => {
  it('is true when the user holds one of the wanted roles', () => {
    expect(hasAnyRole(['pharmacist', 'leader'], ['recorder', 'leader'])).toBe(true);
  });
  it('is false when the user holds none of them', () => {
    expect(hasAnyRole(['pharmacist'], ['recorder', 'leader'])).toBe(false);
  });
});
