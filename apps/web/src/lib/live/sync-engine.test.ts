import type { EntryAddAck, NewEntry, StoredEntry } from '@steadyhand/shared';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { LiveLink } from './live-socket';
import type { OutboxRecord } from './outbox';
import {
  ALARM_AFTER_MS,
  buildCodeView,
  entryStage,
  recordTap,
  type DraftTap,
  classifyAck,
  mergeLog,
  OutboxAlarm,
  outboxHealth,
  OutboxSender,
  selectToSend,
} from './sync-engine';

const uuid = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`;

function entry(n: number, at: string, extra: Partial<NewEntry> = {}): NewEntry {
  return { id: uuid(n), kind: 'rosc', at, deviceId: 'dev-a', seq: n, ...extra } as NewEntry;
}

function stored(e: NewEntry, cursor: number): StoredEntry {
  return {
    ...e,
    codeId: 'code-1',
    userId: 'u1',
    cursor,
    receivedAt: e.at,
    recordedAt: e.at,
    addendum: false,
  };
}

function rec(
  n: number,
  createdAt: number,
  status: OutboxRecord['status'] = 'pending',
  seq = n,
): OutboxRecord {
  return {
    id: uuid(n),
    codeId: 'code-1',
    seq,
    createdAt,
    entry: entry(n, '2026-03-04T07:42:10.000Z'),
    status,
  };
}

describe('mergeLog', () => {
  it('keeps the server copy when an entry is both stored and still in the outbox', () => {
    const local = entry(1, '2026-03-04T07:42:10.000Z');
    const server = stored({ ...local }, 7);
    const merged = mergeLog([server], [local]);
    expect(merged).toHaveLength(1);
    expect(merged[0]?.cursor).toBe(7);
  });

  it('orders entries from two devices by when they happened, not by when they arrived', () => {
    const a = stored(entry(1, '2026-03-04T07:43:00.000Z'), 1);
    const b = stored(entry(2, '2026-03-04T07:42:30.000Z', { deviceId: 'dev-b' }), 2);
    const waiting = entry(3, '2026-03-04T07:42:45.000Z');
    expect(mergeLog([a, b], [waiting]).map((e) => e.id)).toEqual([uuid(2), uuid(3), uuid(1)]);
  });

  it('shows waiting entries after stored ones that happened at the same instant, in sequence order', () => {
    const at = '2026-03-04T07:42:10.000Z';
    const s = stored(entry(5, at), 3);
    const w2 = entry(7, at, { seq: 7 });
    const w1 = entry(6, at, { seq: 6 });
    expect(mergeLog([s], [w2, w1]).map((e) => e.id)).toEqual([uuid(5), uuid(6), uuid(7)]);
  });
});

describe('selectToSend', () => {
  it('picks the waiting entry with the lowest sequence number, skipping refused ones', () => {
    const records = [rec(3, 0), rec(1, 0, 'failed'), rec(2, 0)];
    expect(selectToSend(records, new Set()).map((r) => r.seq)).toEqual([2]);
  });

  it('sends nothing more while the window is full, and fills a larger window in order', () => {
    const records = [rec(1, 0), rec(2, 0), rec(3, 0), rec(4, 0)];
    expect(selectToSend(records, new Set([uuid(1)]))).toEqual([]);
    expect(selectToSend(records, new Set([uuid(1)]), 3).map((r) => r.seq)).toEqual([2, 3]);
  });
});

describe('classifyAck', () => {
  it('removes on ok, also for a repeat', () => {
    const ok = {
      ok: true,
      entry: stored(entry(1, '2026-03-04T07:42:10.000Z'), 1),
      duplicate: true,
    } as EntryAddAck;
    expect(classifyAck(ok)).toBe('stored');
  });
  it('keeps and resends on a server error or no answer', () => {
    expect(classifyAck({ ok: false, status: 500, error: 'x' })).toBe('retry');
    expect(classifyAck({ ok: false, status: 503, error: 'x' })).toBe('retry');
    expect(classifyAck(null)).toBe('retry');
  });
  it('keeps and resends after the session ended (401): the tap is sent once the person signs in again', () => {
    expect(classifyAck({ ok: false, status: 401, error: 'Your session has ended' })).toBe('retry');
  });
  it('marks refused on a 4xx, so a person sees it', () => {
    expect(classifyAck({ ok: false, status: 400, error: 'bad' })).toBe('refused');
    expect(classifyAck({ ok: false, status: 403, error: 'role' })).toBe('refused');
  });
});

describe('outbox alarm', () => {
  afterEach(() => {
    vi.useRealTimers();
  });

  it('counts waiting and refused entries apart and measures the oldest wait', () => {
    const h = outboxHealth([rec(1, 1_000), rec(2, 5_000), rec(3, 0, 'failed')], 31_000);
    expect(h).toMatchObject({
      waiting: 2,
      failed: 1,
      oldestWaitingAt: 1_000,
      oldestWaitingMs: 30_000,
      alarm: false,
    });
  });

  it('raises the alarm exactly when an entry has waited 60 s, and lowers it when the outbox empties', () => {
    vi.useFakeTimers();
    vi.setSystemTime(100_000);
    const changes: boolean[] = [];
    const alarm = new OutboxAlarm((a) => changes.push(a));
    alarm.update([rec(1, 100_000)]);
    vi.advanceTimersByTime(ALARM_AFTER_MS - 100);
    expect(alarm.raised).toBe(false);
    vi.advanceTimersByTime(100);
    expect(alarm.raised).toBe(true);
    expect(changes).toEqual([true]);
    alarm.update([]);
    expect(alarm.raised).toBe(false);
    expect(changes).toEqual([true, false]);
    alarm.stop();
  });

  it('re-arms for the next oldest entry when the oldest one is acknowledged', () => {
    vi.useFakeTimers();
    vi.setSystemTime(0);
    const alarm = new OutboxAlarm(() => undefined);
    alarm.update([rec(1, 0), rec(2, 30_000)]);
    vi.advanceTimersByTime(40_000);
    alarm.update([rec(2, 30_000)]);
    vi.advanceTimersByTime(49_000);
    expect(alarm.raised).toBe(false);
    vi.advanceTimersByTime(1_000);
    expect(alarm.raised).toBe(true);
    alarm.stop();
  });
});

describe('OutboxSender: the check before sending', () => {
  /** A live link with just what the sender uses: connect events, acknowledged emits, a record of what was sent. */
  function fakeLink() {
    const handlers = new Map<string, ((...args: unknown[]) => void)[]>();
    const sent: { event: string; payload: unknown; ack: (err: Error | null, res: unknown) => void }[] = [];
    const socket = {
      connected: false,
      on(event: string, fn: (...args: unknown[]) => void) {
        handlers.set(event, [...(handlers.get(event) ?? []), fn]);
        return socket;
      },
      timeout() {
        return {
          emit(event: string, payload: unknown, ack: (err: Error | null, res: unknown) => void) {
            sent.push({ event, payload, ack });
          },
        };
      },
    };
    const fire = (event: string) => {
      for (const fn of handlers.get(event) ?? []) fn();
    };
    return {
      link: { socket, touch: () => undefined } as unknown as LiveLink,
      sent,
      connect() {
        socket.connected = true;
        fire('connect');
      },
      disconnect() {
        socket.connected = false;
        fire('disconnect');
      },
    };
  }

  const flush = () => new Promise((resolve) => setTimeout(resolve, 0));

  it('sends nothing after a (re)connect until the check has finished, then the oldest first, with what a refill carries', async () => {
    // happy-dom has no IndexedDB: the sender works from the records it is handed and says it cannot read the outbox.
    const quiet = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    const fake = fakeLink();
    const sender = new OutboxSender(fake.link);
    let finish = () => undefined as void;
    let checks = 0;
    sender.setBeforeSend(() => {
      checks++;
      return new Promise<void>((resolve) => (finish = resolve));
    });
    fake.connect();
    const refilled: OutboxRecord = { ...rec(3, 0), refill: { storedAt: '2026-03-04T07:42:10.090Z' } };
    sender.add(rec(9, 0));
    sender.add(refilled);
    await flush();
    expect(fake.sent).toEqual([]);

    finish();
    await vi.waitFor(() => expect(fake.sent).toHaveLength(1));
    expect(fake.sent[0]).toMatchObject({
      event: 'entry:add',
      payload: { codeId: 'code-1', entry: { id: uuid(3) }, refill: { storedAt: '2026-03-04T07:42:10.090Z' } },
    });

    // The link drops and comes back: the check runs again before anything more is sent.
    fake.disconnect();
    fake.connect();
    expect(checks).toBe(2);
    await flush();
    expect(fake.sent).toHaveLength(1);
    finish();
    await vi.waitFor(() => expect(fake.sent).toHaveLength(2));
    expect((fake.sent[1]?.payload as { entry: NewEntry }).entry.id).toBe(uuid(3));
    quiet.mockRestore();
  });
});

describe('the stages of a tap: recording, on this tablet, saved', () => {
  const draft = entry(9, '2026-03-04T07:42:30.000Z');
  const stageIn = (view: ReturnType<typeof buildCodeView>) => entryStage(draft.id, view);

  it('shows a tap from memory as recording, then on this tablet once in the outbox, then saved once stored', () => {
    const drafts = new Map<string, DraftTap>([[draft.id, { entry: draft, error: null }]]);
    const memory = buildCodeView('code-1', new Map(), [], drafts);
    expect(memory.entries.map((e) => e.id)).toEqual([draft.id]);
    expect(stageIn(memory)).toBe('recording');

    // Written: the outbox holds it (the draft may linger a moment; the outbox copy wins).
    const record: OutboxRecord = { id: draft.id, codeId: 'code-1', seq: 9, createdAt: 1, entry: draft, status: 'pending' };
    const onDevice = buildCodeView('code-1', new Map(), [record], drafts);
    expect(onDevice.entries).toHaveLength(1);
    expect(stageIn(onDevice)).toBe('on-device');

    const saved = buildCodeView('code-1', new Map([[draft.id, stored(draft, 3)]]), [record], new Map());
    expect(saved.entries).toHaveLength(1);
    expect(saved.entries[0]?.cursor).toBe(3);
    expect(stageIn(saved)).toBe('saved');
  });

  it('keeps a tap whose IndexedDB write failed out of the log and lists it as not kept', () => {
    const drafts = new Map<string, DraftTap>([[draft.id, { entry: draft, error: 'QuotaExceededError' }]]);
    const view = buildCodeView('code-1', new Map(), [], drafts);
    expect(view.entries).toHaveLength(0);
    expect(view.unkept).toEqual([{ entry: draft, error: 'QuotaExceededError' }]);
  });

  it('recordTap shows the draft before the write, hands the record to the sender only after it, and flags a failed write', async () => {
    const events: string[] = [];
    const view = {
      addDraft: (e: NewEntry) => events.push(`draft ${e.id}`),
      draftKept: (id: string) => events.push(`kept ${id}`),
      draftFailed: (id: string, error: string) => events.push(`failed ${id} ${error}`),
    };
    const record = { id: draft.id, entry: draft };
    let finishWrite: (r: typeof record) => void = () => undefined;
    const pending = recordTap(draft, view, () => new Promise<typeof record>((resolve) => (finishWrite = resolve)), () => events.push('sent'));
    // Synchronously, before the write settles, the draft is already shown.
    expect(events).toEqual([`draft ${draft.id}`]);
    finishWrite(record);
    await pending;
    expect(events).toEqual([`draft ${draft.id}`, 'sent', `kept ${draft.id}`]);

    events.length = 0;
    await expect(recordTap(draft, view, () => Promise.reject(new Error('disk full')), () => events.push('sent'))).rejects.toThrow('disk full');
    expect(events).toEqual([`draft ${draft.id}`, `failed ${draft.id} disk full`]);
  });
});
