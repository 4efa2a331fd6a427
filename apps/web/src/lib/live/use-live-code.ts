import {
  codeSchema,
  type Code,
  type LogEntry,
  type NewEntry,
  type ProtocolSettings,
  type StoredEntry,
} from '@steadyhand/shared';
import { queryOptions, useQuery, useQueryClient } from '@tanstack/react-query';
import { useCallback, useEffect, useMemo, useState, useSyncExternalStore } from 'react';
import { api, isApiError } from '../api-client';
import { useCodeProtocol } from '../protocol';
import { getClockSync, type ClockState } from './clock-sync';
import type { EntryFields } from './entry-build';
import { getLiveLink, type LinkState } from './live-socket';
import {
  addToOutbox,
  countOutbox,
  onOutboxChange,
  readLogCache,
  retryFailed,
  type OutboxRecord,
} from './outbox';
import { LogRefill } from './refill';
import {
  CodeSync,
  entryStage,
  OutboxAlarm,
  recordTap,
  OutboxSender,
  outboxHealth,
  type CodeSyncSnapshot,
  type EntryStage,
  type UnkeptTap,
} from './sync-engine';
import { buildEntry } from './entry-build';

/* One link, one clock and one sender per tab; one CodeSync per open code, shared by hooks. */

let sender: OutboxSender | null = null;
function getSender(): OutboxSender {
  if (!sender) {
    const link = getLiveLink();
    getClockSync().start(link);
    sender = new OutboxSender(link);
    // On every (re)connect: send back what a restored server lacks, before any newer tap.
    const refill = new LogRefill(link);
    sender.setBeforeSend(() => refill.run());
  }
  return sender;
}

const codeSyncs = new Map<string, { sync: CodeSync; users: number }>();
function codeSyncFor(codeId: string): { sync: CodeSync; users: number } {
  let held = codeSyncs.get(codeId);
  if (!held) {
    held = { sync: new CodeSync(codeId, getLiveLink(), getSender()), users: 0 };
    held.sync.start();
    codeSyncs.set(codeId, held);
  }
  return held;
}

/** The code's sync, kept running while a component shows it (and a moment after, for remounts). */
function useCodeSync(codeId: string): CodeSync {
  const sync = codeSyncFor(codeId).sync;
  useEffect(() => {
    const held = codeSyncFor(codeId);
    held.users += 1;
    return () => {
      held.users -= 1;
      setTimeout(() => {
        if (held.users <= 0 && codeSyncs.get(codeId) === held) {
          held.sync.stop();
          codeSyncs.delete(codeId);
        }
      }, 1000);
    };
  }, [codeId]);
  return sync;
}

/* ------------------------------------------------------------------------------------------ */

const isNetworkFailure = (err: unknown) => !isApiError(err);

export const codeDetailQueryKey = (codeId: string) => ['codes', 'detail', codeId] as const;

/** GET /api/codes/:id; offline, the copy this device last saw. */
async function fetchCode(codeId: string, sync: CodeSync): Promise<Code> {
  try {
    const body = (await api.get(`/api/codes/${encodeURIComponent(codeId)}`)) as {
      code: unknown;
      entries: StoredEntry[];
    };
    const code = codeSchema.parse(body.code);
    sync.applyServerCopy(code, Array.isArray(body.entries) ? body.entries : []);
    return code;
  } catch (err) {
    if (!isNetworkFailure(err)) throw err;
    const cached = await readLogCache(codeId).catch(() => null);
    if (cached?.code) return cached.code;
    throw err;
  }
}

const codeQueryOptions = (codeId: string, sync: CodeSync) =>
  queryOptions({
    queryKey: codeDetailQueryKey(codeId),
    queryFn: () => fetchCode(codeId, sync),
    staleTime: 60_000,
    retry: (count, err) => isNetworkFailure(err) && count < 2,
  });


/* ------------------------------------------------------------------------------------------ */

export interface LiveSyncState {
  connected: boolean;
  /** Entries on this device not yet acknowledged by the server (all codes). */
  waiting: number;
  /** Entries the server refused (all codes). */
  failedCount: number;
  oldestWaitingAt: number | null;
  oldestWaitingMs: number;
  /** An entry has waited 60 s or more. */
  alarm: boolean;
  lastContactAt: number | null;
  browserOffline: boolean;
  /** Joined the code's room since the last (re)connect. */
  joined: boolean;
  refusal: string | null;
}

export interface LiveClock extends ClockState {
  correctedNow: () => number;
}

export interface LiveCode {
  code: Code | null;
  codeError: Error | null;
  codeLoading: boolean;
  protocol: ProtocolSettings | null;
  entries: LogEntry[];
  pendingIds: ReadonlySet<string>;
  /** Where an entry is on its way: recording (memory), on this device (IndexedDB), saved (server). */
  stageOf: (id: string) => EntryStage;
  /** Taps whose IndexedDB write failed: never kept, shown loudly. */
  unkept: UnkeptTap[];
  failed: OutboxRecord[];
  sync: LiveSyncState;
  clock: LiveClock;
  /** Records a tap: shown at once as recording; resolves once it is in the outbox (saved on this device). */
  record: (fields: EntryFields) => Promise<NewEntry>;
  retryFailed: (id: string) => Promise<void>;
  /** After a PATCH: the new details, here and in the device's cache. */
  setCode: (code: Code) => void;
}

function useLinkState(): LinkState {
  const link = getLiveLink();
  return useSyncExternalStore(
    useCallback((cb) => link.subscribe(cb), [link]),
    () => link.getState(),
  );
}

function useClockState(): ClockState {
  const clock = getClockSync();
  return useSyncExternalStore(
    useCallback((cb) => clock.subscribe(cb), [clock]),
    () => clock.getState(),
  );
}

function useSenderRecords(): readonly OutboxRecord[] {
  const s = getSender();
  return useSyncExternalStore(
    useCallback((cb) => s.subscribe(cb), [s]),
    () => s.getRecords(),
  );
}

export function useLiveCode(codeId: string): LiveCode {
  const sync = useCodeSync(codeId);
  const snap: CodeSyncSnapshot = useSyncExternalStore(sync.subscribe, sync.getSnapshot);
  const link = useLinkState();
  const clockState = useClockState();
  const records = useSenderRecords();
  const codeQuery = useQuery(codeQueryOptions(codeId, sync));

  const [alarm, setAlarm] = useState(false);
  useEffect(() => {
    const watcher = new OutboxAlarm(setAlarm);
    watcher.update(records);
    return () => watcher.stop();
  }, [records]);

  // Re-read once a second while something waits, so the wait shown keeps growing.
  const [nowMs, setNowMs] = useState(() => Date.now());
  const anyWaiting = records.length > 0;
  useEffect(() => {
    if (!anyWaiting) return;
    const timer = setInterval(() => setNowMs(Date.now()), 1000);
    return () => clearInterval(timer);
  }, [anyWaiting]);

  const code = codeQuery.data ?? snap.code;
  const protocolQuery = useCodeProtocol(code ? code.protocolVersion : undefined);
  const health = outboxHealth(
    records,
    Math.max(
      nowMs,
      records.reduce((m, r) => Math.max(m, r.createdAt), 0),
    ),
  );
  const clock = getClockSync();

  const record = useCallback(
    async (fields: EntryFields) => {
      const s = getSender();
      const c = getClockSync();
      const state = c.getState();
      // The time of the tap, read before anything else can delay it.
      const atMs = c.correctedNow();
      const stamp = {
        id: crypto.randomUUID(),
        atMs,
        offsetMs: state.offsetMs,
        offsetUncertaintyMs: state.uncertaintyMs,
      };
      // The memory copy has no device sequence yet: the outbox write gives it one.
      const draft = buildEntry(fields, { ...stamp, deviceId: 'this-device', seq: Number.MAX_SAFE_INTEGER });
      const rec = await recordTap(
        draft,
        sync,
        () => addToOutbox(codeId, fields, stamp),
        (r) => s.add(r),
      );
      return rec.entry;
    },
    [codeId, sync],
  );
  const stageOf = useCallback((id: string) => entryStage(id, snap), [snap]);

  const queryClient = useQueryClient();
  const setCode = useCallback(
    (next: Code) => {
      queryClient.setQueryData(codeDetailQueryKey(codeId), next);
      sync.setCode(next);
    },
    [queryClient, codeId, sync],
  );
  useEffect(() => {
    if (codeQuery.data) sync.setCode(codeQuery.data);
  }, [codeQuery.data, sync]);

  const liveClock = useMemo<LiveClock>(
    () => ({ ...clockState, correctedNow: clock.correctedNow }),
    [clockState, clock],
  );

  return {
    code,
    codeError: code ? null : codeQuery.error,
    codeLoading: !code && (codeQuery.isPending || !snap.loaded),
    protocol: protocolQuery.data ?? null,
    entries: snap.entries,
    pendingIds: snap.pendingIds,
    stageOf,
    unkept: snap.unkept,
    failed: snap.failed,
    sync: {
      connected: link.connected,
      waiting: health.waiting,
      failedCount: health.failed,
      oldestWaitingAt: health.oldestWaitingAt,
      oldestWaitingMs: health.oldestWaitingMs,
      alarm: alarm || health.alarm,
      lastContactAt: link.lastContactAt,
      browserOffline: link.browserOffline,
      joined: snap.joined,
      refusal: link.refusal ?? snap.joinError,
    },
    clock: liveClock,
    record,
    retryFailed,
    setCode,
  };
}

/** How many entries on this device still wait for the server; for any page (sign-out...). */
export function useOutboxCount(): number | null {
  const [count, setCount] = useState<number | null>(null);
  useEffect(() => {
    let alive = true;
    const read = () => {
      countOutbox()
        .then((n) => alive && setCount(n))
        .catch(() => alive && setCount(null));
    };
    read();
    const off = onOutboxChange(read);
    const timer = setInterval(read, 5_000);
    return () => {
      alive = false;
      off();
      clearInterval(timer);
    };
  }, []);
  return count;
}

export { countOutbox };
