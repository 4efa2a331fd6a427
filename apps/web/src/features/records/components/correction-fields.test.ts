import type { EffectiveEntry } from '@steadyhand/shared';
import { describe, expect, it } from 'vitest';
import { formatClockTime } from '../../../lib/format';
import { changesFrom, FIELDS, initialValues, withClockTime } from './correction-fields';

/** An entry as the review table has it (no corrections yet). */
function effective<T extends Omit<EffectiveEntry, 'original' | 'amendments' | 'voided'>>(
  entry: T,
): EffectiveEntry {
  const e = entry as unknown as EffectiveEntry;
  return { ...e, original: e, amendments: [], voided: null };
}

// A device time with milliseconds, as taps arrive.
const etco2 = effective({
  id: '7c8f3e0a-2b1d-4c5e-9f6a-1b2c3d4e5f60',
  kind: 'etco2',
  at: '2026-12-01T07:49:40.487Z',
  mmHg: 18,
});
const drug = effective({
  id: '0d9e8f7a-6b5c-4d3e-8f1a-2b3c4d5e6f70',
  kind: 'drug',
  at: '2026-12-01T07:47:55.120Z',
  drug: 'epinephrine',
  dose: 1,
  unit: 'mg',
  route: 'io',
});

describe('the correction form', () => {
  it('starts from the entry as it reads now, time to the second', () => {
    expect(initialValues(etco2)).toEqual({
      time: formatClockTime(etco2.at),
      reason: '',
      mmHg: '18',
    });
    expect(initialValues(drug)).toMatchObject({ dose: '1', unit: 'mg', route: 'io' });
  });

  it('sends only what changed, typed as the entry schema wants', () => {
    expect(changesFrom(etco2, { ...initialValues(etco2), mmHg: '16' })).toEqual({ mmHg: 16 });
    expect(changesFrom(drug, { ...initialValues(drug), route: 'iv' })).toEqual({ route: 'iv' });
    // Untouched: nothing to send, and the milliseconds of the device time are not a change.
    expect(changesFrom(etco2, initialValues(etco2))).toEqual({});
  });

  it('moves the time on the same day, in the reader’s clock', () => {
    const changes = changesFrom(etco2, { ...initialValues(etco2), time: '07:50:05' });
    expect(typeof changes).toBe('object');
    const at = new Date((changes as { at: string }).at);
    expect(formatClockTime(at.toISOString())).toBe('07:50:05');
    expect(at.toDateString()).toBe(new Date(etco2.at).toDateString());
  });

  it('names a bad value instead of sending it', () => {
    expect(changesFrom(etco2, { ...initialValues(etco2), mmHg: '' })).toBe(
      'ETCO2 (mmHg): enter a number.',
    );
    expect(changesFrom(etco2, { ...initialValues(etco2), time: '7h50' })).toMatch(
      /^Time: write it as hh:mm:ss/,
    );
    expect(withClockTime(etco2.at, '24:00:00')).toBeNull();
    expect(withClockTime(etco2.at, '07:61')).toBeNull();
  });

  it('offers the fields a person may correct for each kind, and none that identify the entry', () => {
    expect(FIELDS.shock?.map((f) => f.name)).toEqual(['joules', 'synchronized']);
    const all = Object.values(FIELDS).flatMap((fields) => fields.map((f) => f.name));
    for (const fixed of ['id', 'kind', 'deviceId', 'seq', 'target'])
      expect(all).not.toContain(fixed);
  });
});
