import type { BackupCheck } from '@steadyhand/shared';
import { describe, expect, it } from 'vitest';
import { describeBackupCheck } from './backup-table';

const passed: BackupCheck = {
  ok: true,
  checkedAt: '2026-03-04T08:00:01.000Z',
  integrity: ['ok'],
  codes: 12,
  entries: 3400,
  brokenChains: [],
  attachments: { count: 3, missing: [] },
};

describe('describeBackupCheck', () => {
  it('says what a passed check covered', () => {
    expect(describeBackupCheck(passed)).toBe('12 codes, 3400 entries · every entry chain verifies · 3 attachments present');
  });
  it('names the code and entry where a chain breaks, and missing attachments', () => {
    const failed: BackupCheck = {
      ...passed,
      ok: false,
      brokenChains: [{ codeId: 'c-7', brokenAt: { position: 14, entryId: 'e', reason: 'changed' } }],
      attachments: { count: 3, missing: ['ab'] },
    };
    expect(describeBackupCheck(failed)).toBe('12 codes, 3400 entries · entry chain broken in code c-7 at entry 14 · 1 of 3 attachments missing');
  });
  it('says when SQLite itself found damage, or no check finished', () => {
    expect(describeBackupCheck({ ...passed, ok: false, integrity: ['*** in database main ***', 'Page 5: btreeInitPage() returns error code 11'] })).toMatch(/^SQLite integrity check failed: \*\*\* in database main/);
    expect(describeBackupCheck(null)).toMatch(/^Not checked/);
  });
});
