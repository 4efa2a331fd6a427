import { describe, expect, it } from 'vitest';
import { safeNextPath } from './next-path';

describe('safeNextPath', () => {
  it('keeps a path on this site, with its query', () => {
    expect(safeNextPath('/codes/abc/record?tab=log')).toBe('/codes/abc/record?tab=log');
  });

  it.each([
    ['missing', null],
    ['empty', ''],
    ['another site', 'https://example.org/'],
    ['protocol-relative', '//example.org/x'],
    ['backslash trick', '/\\example.org'],
    ['relative', 'codes'],
    ['script', 'javascript:alert(1)'],
    ['the sign-in page itself', '/sign-in?next=/'],
  ])('falls back to home when next is %s', (_name, raw) => {
    expect(safeNextPath(raw)).toBe('/');
  });
});
