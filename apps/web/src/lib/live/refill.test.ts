import type { Code, NewEntry, StoredEntry } from '@steadyhand/shared';
import { describe, expect, it } from 'vitest';
import type { KeptRecord } from './outbox';
import { groupByCode, KEEP_MS, keptExpired, planRefill, refillCodeDetails } from './refill';
import { logCopyDiffers } from './sync-engine';

const uuid = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`;

function kept(n: number, codeId = 'code-1', keptAt = 1_000, at = '2026-03-04T07:42:10.000Z'): KeptRecord {
  const entry = { id: uuid(n), kind: 'rosc', at, deviceId: 'pad-a', seq: n } as NewEntry;
  return { id: uuid(n), codeId, seq: n, keptAt, entry, storedAt: at, storedBy: 'u1' };
}

describe('planRefill', () => {
  it('sends again, in this device’s order, what the server lacks and the outbox does not already hold', () => {
    const list = [kept(5), kept(2), kept(3), kept(4), kept(1)];
    const server = new Set([uuid(1), uuid(2)]);
    const waiting = new Set([uuid(4)]);
    const plan = planRefill(list, server, waiting, false);
    expect(plan.requeue.map((k) => k.seq)).toEqual([3, 5]);
    expect(plan.drop).toBe(false);
  });

  it('sends everything again to a server that had to start the code again', () => {
    const plan = planRefill([kept(2), kept(1)], new Set(), new Set(), false);
    expect(plan.requeue.map((k) => k.seq)).toEqual([1, 2]);
  });

  it('forgets a code’s taps once its record is signed and holds them all, not before', () => {
    const list = [kept(1), kept(2)];
    expect(planRefill(list, new Set([uuid(1), uuid(2)]), new Set(), true)).toEqual({ requeue: [], drop: true });
    expect(planRefill(list, new Set([uuid(1), uuid(2)]), new Set(), false).drop).toBe(false);
    // Signed but missing one: it is sent again (it becomes an addendum), and kept until it is there.
    const missing = planRefill(list, new Set([uuid(1)]), new Set(), true);
    expect(missing.requeue.map((k) => k.seq)).toEqual([2]);
    expect(missing.drop).toBe(false);
  });
});

describe('keeping limits and grouping', () => {
  it('keeps a code’s taps for 7 days after its last tap on this device', () => {
    const list = [kept(1, 'c', 0), kept(2, 'c', 50_000)];
    expect(keptExpired(list, 50_000 + KEEP_MS)).toBe(false);
    expect(keptExpired(list, 50_001 + KEEP_MS)).toBe(true);
    expect(keptExpired([], Number.MAX_SAFE_INTEGER)).toBe(false);
  });

  it('groups kept taps by code', () => {
    const groups = groupByCode([kept(1, 'a'), kept(2, 'b'), kept(3, 'a')]);
    expect([...groups.entries()].map(([c, l]) => [c, l.map((k) => k.seq)])).toEqual([
      ['a', [1, 3]],
      ['b', [2]],
    ]);
  });
});

describe('refillCodeDetails', () => {
  it('starts the code again with the details this device last saw, leaving out empty ones', () => {
    const code: Code = {
      id: 'c1',
      status: 'active',
      category: 'pediatric',
      weightKg: 18,
      weightSource: 'length-tape',
      protocolVersion: 3,
      categoryChangedAt: null,
      location: '4 West, bed 12',
      unitId: null,
      patient: null,
      arrestAt: '2026-03-04T07:40:00.000Z',
      createdAt: '2026-03-04T07:40:01.000Z',
      createdBy: 'u1',
      endedAt: null,
      outcome: null,
    };
    expect(refillCodeDetails('c1', code, [])).toEqual({
      id: 'c1',
      category: 'pediatric',
      arrestAt: '2026-03-04T07:40:00.000Z',
      weightKg: 18,
      weightSource: 'length-tape',
      location: '4 West, bed 12',
    });
  });

  it('without details, starts an adult code at its earliest kept tap', () => {
    const list = [kept(2, 'c1', 0, '2026-03-04T07:45:00.000Z'), kept(1, 'c1', 0, '2026-03-04T07:41:00.000Z')];
    expect(refillCodeDetails('c1', null, list)).toEqual({ id: 'c1', category: 'adult', arrestAt: '2026-03-04T07:41:00.000Z' });
  });
});

describe('logCopyDiffers', () => {
  const stored = (n: number) => ({ id: uuid(n), cursor: n }) as StoredEntry;
  it('says a copy is off when it holds more or fewer entries than the server’s log, merged with what the join returned', () => {
    const copy = new Map([1, 2, 3].map((n) => [uuid(n), stored(n)]));
    expect(logCopyDiffers(copy, [stored(3), stored(4)], 4)).toBe(false);
    // The server was restored from a copy with two entries: this device saw three.
    expect(logCopyDiffers(copy, [], 2)).toBe(true);
    // The device missed one.
    expect(logCopyDiffers(copy, [], 5)).toBe(true);
    expect(logCopyDiffers(copy, [], undefined)).toBe(false);
  });
});
