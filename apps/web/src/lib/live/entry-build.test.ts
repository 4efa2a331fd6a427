import { newEntrySchema } from '@steadyhand/shared';
import { describe, expect, it } from 'vitest';
import { buildEntry } from './entry-build';
import { takeSeq } from './outbox';

const stamp = {
  id: '11111111-2222-4333-8444-555555555555',
  deviceId: 'tablet-1',
  offsetMs: 120_000.4,
  offsetUncertaintyMs: 6.6,
};

describe('buildEntry', () => {
  it('stamps the tap with the corrected time, the offset used and its uncertainty', () => {
    const deviceNow = Date.UTC(2026, 2, 4, 7, 40, 10);
    const corrected = deviceNow + stamp.offsetMs; // the device runs two minutes slow
    const entry = buildEntry(
      { kind: 'shock', joules: 200, synchronized: false },
      { ...stamp, atMs: corrected, seq: 4 },
    );
    expect(entry).toMatchObject({
      kind: 'shock',
      joules: 200,
      at: '2026-03-04T07:42:10.000Z',
      deviceId: 'tablet-1',
      seq: 4,
      offsetMs: 120_000,
      offsetUncertaintyMs: 7,
    });
    expect(newEntrySchema.safeParse(entry).success).toBe(true);
  });

  it('numbers consecutive taps 1, 2, 3 under one device id made on the first tap', () => {
    let made = 0;
    const makeId = () => `device-${++made}`;
    const first = takeSeq(undefined, makeId);
    const second = takeSeq(first.next, makeId);
    const third = takeSeq(second.next, makeId);
    expect([first.seq, second.seq, third.seq]).toEqual([1, 2, 3]);
    expect(new Set([first.deviceId, second.deviceId, third.deviceId])).toEqual(
      new Set(['device-1']),
    );
    const entries = [first, second, third].map((t, i) =>
      buildEntry(
        { kind: 'rosc' },
        {
          ...stamp,
          id: `11111111-2222-4333-8444-55555555555${i}`,
          atMs: i,
          deviceId: t.deviceId,
          seq: t.seq,
        },
      ),
    );
    expect(entries.map((e) => e.seq)).toEqual([1, 2, 3]);
  });

  it('leaves out the uncertainty while the clock has not been measured yet', () => {
    const entry = buildEntry(
      { kind: 'rosc' },
      { ...stamp, atMs: 0, seq: 1, offsetUncertaintyMs: null },
    );
    expect('offsetUncertaintyMs' in entry).toBe(false);
  });
});
