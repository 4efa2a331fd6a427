import { describe, expect, it } from 'vitest';
import { newEntrySchema } from './entries.js';

const note = (text: string) => ({ id: '4f1c2d3e-5a6b-4c7d-8e9f-0a1b2c3d4e5f', kind: 'note', at: '2026-03-04T07:50:00.000Z', text });

describe('entry text', () => {
  it('takes any well-formed text, characters outside the basic plane included', () => {
    expect(newEntrySchema.safeParse(note('Family present 👪, Ärztin informiert')).success).toBe(true);
  });

  it('refuses a lone surrogate, which the record cannot canonicalise, hash or print', () => {
    const result = newEntrySchema.safeParse(note('half a pair \ud800'));
    expect(result.success).toBe(false);
    expect(result.error?.issues[0]?.message).toMatch(/well-formed/);
    expect(newEntrySchema.safeParse({ ...note('ok'), deviceId: 'tablet-\udc00' }).success).toBe(false);
  });
});

describe('amendment changes', () => {
  const amend = (changes: Record<string, unknown>) => ({
    id: '5f1c2d3e-5a6b-4c7d-8e9f-0a1b2c3d4e5f',
    kind: 'amend',
    at: '2026-03-04T07:51:00.000Z',
    target: '4f1c2d3e-5a6b-4c7d-8e9f-0a1b2c3d4e5f',
    changes,
    reason: 'strip',
  });

  it('refuses the fields the server and the device set, naming the field', () => {
    for (const field of ['userId', 'userName', 'addendum', 'recordedAt', 'receivedAt', 'cursor', 'codeId', 'deviceId', 'seq', 'offsetMs', 'id', 'kind', 'target']) {
      const result = newEntrySchema.safeParse(amend({ [field]: 'x' }));
      expect(result.success, field).toBe(false);
      expect(result.error?.issues[0]?.path).toEqual(['changes', field]);
      expect(result.error?.issues[0]?.message).toMatch(/cannot be amended/);
    }
    expect(newEntrySchema.safeParse(amend({ joules: 150 })).success).toBe(true);
  });

  it('refuses a field name that is not well-formed text', () => {
    expect(newEntrySchema.safeParse(amend({ ['\ud800']: 1 })).success).toBe(false);
  });
});
