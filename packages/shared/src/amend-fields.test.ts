import { describe, expect, it } from 'vitest';
import { AMENDABLE_FIELDS } from './entries.js';
import { amendEntry, effectiveEntries, unchangedFields, type ClinicalEntry, type LogEntry } from './effective-log.js';

const shock: ClinicalEntry = {
  id: '11111111-1111-4111-8111-111111111111',
  kind: 'shock',
  at: '2026-03-04T07:43:45.000Z',
  joules: 200,
  synchronized: false,
  deviceId: 'tablet-4w',
  codeId: 'code-1',
  userId: 'maren',
  userName: 'Maren Holt, RN',
  cursor: 4,
  receivedAt: '2026-03-04T07:43:45.100Z',
  recordedAt: '2026-03-04T07:43:45.120Z',
  addendum: false,
};

describe('which fields an amendment may change', () => {
  it('lists each kind’s own clinical fields and the time, nothing the server or the device set', () => {
    expect(AMENDABLE_FIELDS.shock).toEqual(['at', 'joules', 'synchronized']);
    expect(AMENDABLE_FIELDS.drug).toEqual(['at', 'drug', 'dose', 'unit', 'route']);
    expect(AMENDABLE_FIELDS.rosc).toEqual(['at']);
  });

  it('refuses server fields: a correction cannot rewrite who wrote an entry, when it was stored, or hide an addendum', () => {
    for (const changes of [{ userId: 'someone-else' }, { userName: 'Someone Else' }, { addendum: true }, { recordedAt: '2026-03-04T07:00:00.000Z' }, { receivedAt: 'x' }, { cursor: 1 }, { codeId: 'other' }]) {
      const result = amendEntry(shock, changes);
      expect(result.ok, JSON.stringify(changes)).toBe(false);
      if (!result.ok) expect(result.error).toMatch(/set by the server and cannot be amended/);
    }
  });

  it('refuses a field the target kind does not have, and says which it has', () => {
    const result = amendEntry(shock, { dose: 1 });
    expect(result).toEqual({ ok: false, error: 'dose is not a field of a shock entry (it has at, joules, synchronized)' });
    expect(amendEntry(shock, { joules: 150 })).toMatchObject({ ok: true, entry: { joules: 150, userId: 'maren', cursor: 4 } });
  });

  it('leaves a stored amendment of a server field out of the corrected log', () => {
    const forged: LogEntry = {
      id: '22222222-2222-4222-8222-222222222222',
      kind: 'amend',
      at: '2026-03-04T08:30:00.000Z',
      target: shock.id,
      changes: { userId: 'someone-else', joules: 150 },
      reason: 'forged',
      codeId: 'code-1',
      userId: 'maren',
      cursor: 9,
      receivedAt: '2026-03-04T08:30:00.000Z',
      recordedAt: '2026-03-04T08:30:00.000Z',
      addendum: false,
    };
    const [row] = effectiveEntries([shock, forged]);
    expect(row).toMatchObject({ userId: 'maren', joules: 200, amendments: [] });
  });

  it('names the changes that would print "was X, now X"', () => {
    expect(unchangedFields(shock, { joules: 200, synchronized: true })).toEqual(['joules']);
    expect(unchangedFields(shock, { at: '2026-03-04T08:43:45.000+01:00' })).toEqual(['at']);
    expect(unchangedFields(shock, { at: '2026-03-04T07:43:46.000Z', joules: 150 })).toEqual([]);
  });
});
