import {
  compareLogOrder,
  type Code,
  type CodeJoinAck,
  type EntryAddAck,
  type EntryAddedEvent,
  type LogEntry,
  type NewEntry,
  type StoredEntry,
} from '@steadyhand/shared';
import type { LiveLink } from './live-socket';
import {
  acknowledgeOutbox,
  markOutboxFailed,
  onOutboxChange,
  readLogCache,
  readOutbox,
  writeLogCache,
  type OutboxRecord,
} from './outbox';

/* ---------------------------------------------------------------------------------------------
 * Pure rules (unit-tested)
 * ------------------------------------------------------------------------------------------- */

/** An entry waiting this long for the server's acknowledgement raises the alarm. */
export const ALARM_AFTER_MS = 60_000;
/** No acknowledgement within this time: keep the entry and send it again later. */
export const ACK_TIMEOUT_MS = 10_000;
/** Wait before resending after a server error or a timeout. */
export const RETRY_DELAY_MS = 2_000;
/** The most a connection's check before sending (the refill) may hold the outbox back. */
export const BEFORE_SEND_LIMIT_MS = 30_000;

/**
 * The log a screen shows: stored entries by id (the server's copy wins over the outbox's), plus
 * entries still waiting in the outbox, in log order (two devices merge by `at`).
 */
export function mergeLog(stored: Iterable<StoredEntry>, pending: Iterable<NewEntry>): LogEntry[] {
  const byId = new Map<string, LogEntry>();
  for (const e of stored) byId.set(e.id, e);
  for (const e of pending) if (!byId.has(e.id)) byId.set(e.id, e);
  return [...byId.values()].sort(compareLogOrder);
}

/**
 * What to send next: entries waiting (not refused), oldest sequence first, at most `window` of
 * them, none already in flight. One at a time keeps a void from overtaking the entry it voids.
 */
export function selectToSend(
  records: readonly OutboxRecord[],
  inFlight: ReadonlySet<string>,
  window = 1,
): OutboxRecord[] {
  const free = Math.max(0, window - inFlight.size);
  if (free === 0) return [];
  return records
    .filter((r) => r.status === 'pending' && !inFlight.has(r.id))
    .sort((a, b) => a.seq - b.seq)
    .slice(0, free);
}

export type AckOutcome = 'stored' | 'retry' | 'refused';

/**
 * What an acknowledgement means for the outbox. Stored (new or a repeat): remove it. A server
 * error, no answer, or a session that ended (401: it is sent again once the person has signed in
 * again): keep it and send again. Any other refusal (bad input, role, no such code): keep it,
 * marked, for a person to see; sending it again would get the same answer.
 */
export function classifyAck(ack: EntryAddAck | null | undefined): AckOutcome {
  if (!ack || typeof ack !== 'object') return 'retry';
  if (ack.ok) return 'stored';
  if (
    typeof ack.status !== 'number' ||
    ack.status >= 500 ||
    ack.status === 401 ||
    ack.status === 408 ||
    ack.status === 429
  )
    return 'retry';
  return 'refused';
}

export interface OutboxHealth {
  waiting: number;
  failed: number;
  oldestWaitingAt: number | null;
  oldestWaitingMs: number;
  alarm: boolean;
}

export function outboxHealth(
  records: readonly OutboxRecord[],
  nowMs: number,
  alarmAfterMs = ALARM_AFTER_MS,
): OutboxHealth {
  let waiting = 0;
  let failed = 0;
  let oldest: number | null = null;
  for (const r of records) {
    if (r.status === 'failed') {
      failed += 1;
      continue;
    }
    waiting += 1;
    if (oldest === null || r.createdAt < oldest) oldest = r.createdAt;
  }
  const oldestWaitingMs = oldest === null ? 0 : Math.max(0, nowMs - oldest);
  return {
    waiting,
    failed,
    oldestWaitingAt: oldest,
    oldestWaitingMs,
    alarm: oldest !== null && oldestWaitingMs >= alarmAfterMs,
  };
}

/**
 * Calls `onChange` when the alarm state flips: a timer set for the moment the oldest waiting
 * entry reaches the limit (not a polling loop), re-armed whenever the outbox changes.
 */
export class OutboxAlarm {
  private timer: ReturnType<typeof setTimeout> | null = null;
  private alarm = false;

  constructor(
    private readonly onChange: (alarm: boolean) => void,
    private readonly alarmAfterMs = ALARM_AFTER_MS,
    private readonly now: () => number = Date.now,
  ) {}

  get raised(): boolean {
    return this.alarm;
  }

  update(records: readonly OutboxRecord[]): void {
    if (this.timer !== null) clearTimeout(this.timer);
    this.timer = null;
    const health = outboxHealth(records, this.now(), this.alarmAfterMs);
    this.set(health.alarm);
    if (!health.alarm && health.oldestWaitingAt !== null) {
      const due = health.oldestWaitingAt + this.alarmAfterMs - this.now();
      this.timer = setTimeout(() => this.update(records), Math.max(0, due));
    }
  }

  stop(): void {
    if (this.timer !== null) clearTimeout(this.timer);
    this.timer = null;
  }

  private set(alarm: boolean): void {
    if (alarm === this.alarm) return;
    this.alarm = alarm;
    this.onChange(alarm);
  }
}

/* ---------------------------------------------------------------------------------------------
 * The device's sender: one for the tab, for every code in the outbox
 * ------------------------------------------------------------------------------------------- */

type SenderListener = () => void;
type AckListener = (record: OutboxRecord, stored: StoredEntry) => void;

/**
 * Sends the outbox over the live socket in sequence order, one entry in flight. An entry leaves
 * the outbox only on an ok acknowledgement (a repeat is ok too). The whole device's outbox is
 * sent, not only the open code's, so nothing waits for someone to reopen a code.
 */
export class OutboxSender {
  private records: OutboxRecord[] = [];
  private readonly inFlight = new Set<string>();
  private readonly listeners = new Set<SenderListener>();
  private readonly ackListeners = new Set<AckListener>();
  private retryTimer: ReturnType<typeof setTimeout> | null = null;
  /** Bumped on every disconnect: an acknowledgement from an older link is ignored. */
  private generation = 0;
  private loaded: Promise<void>;
  private reloading: Promise<void> | null = null;
  private reloadAgain = false;
  private beforeSend: (() => Promise<unknown>) | null = null;
  /** False from a (re)connect until its check before sending has finished. */
  private gateOpen = true;

  constructor(private readonly link: LiveLink) {
    this.loaded = this.reload();
    onOutboxChange(() => {
      void this.reload().then(() => this.kick());
    });
    link.socket.on('connect', () => {
      if (this.beforeSend) this.runBeforeSend();
      // Let the open codes join first (their handlers were registered on the same event).
      else queueMicrotask(() => this.kick());
    });
    link.socket.on('disconnect', () => {
      this.generation += 1;
      this.inFlight.clear();
    });
  }

  /**
   * Work to finish on every (re)connect before anything is sent: the refill check, which may
   * start a code again and put entries a restored server lacks back in line, before taps that
   * come after them. Bounded by BEFORE_SEND_LIMIT_MS, so taps never wait on it for ever.
   */
  setBeforeSend(work: () => Promise<unknown>): void {
    this.beforeSend = work;
    if (this.link.socket.connected) this.runBeforeSend();
  }

  private runBeforeSend(): void {
    const work = this.beforeSend;
    if (!work) return;
    const generation = this.generation;
    this.gateOpen = false;
    let timer: ReturnType<typeof setTimeout> | undefined;
    const limit = new Promise<void>((resolve) => {
      timer = setTimeout(resolve, BEFORE_SEND_LIMIT_MS);
    });
    void Promise.race([work(), limit])
      .catch((err: unknown) => console.error('the check before sending failed', err))
      .finally(() => {
        clearTimeout(timer);
        // A link that dropped meanwhile runs the check again on its next connect.
        if (generation !== this.generation) return;
        this.gateOpen = true;
        void this.reload().then(() => this.kick());
      });
  }

  getRecords(): readonly OutboxRecord[] {
    return this.records;
  }

  ready(): Promise<void> {
    return this.loaded;
  }

  subscribe(listener: SenderListener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  onAck(listener: AckListener): () => void {
    this.ackListeners.add(listener);
    return () => this.ackListeners.delete(listener);
  }

  /** Re-reads the outbox (another tab may have written to it). */
  reload(): Promise<void> {
    if (this.reloading) {
      // A read already running may have started before the latest write: read once more after it.
      this.reloadAgain = true;
      return this.reloading;
    }
    this.reloading = (async () => {
      do {
        this.reloadAgain = false;
        try {
          this.records = await readOutbox();
          this.emit();
        } catch (err) {
          console.error('outbox could not be read', err);
        }
      } while (this.reloadAgain);
    })().finally(() => {
      this.reloading = null;
    });
    return this.reloading;
  }

  /** A tap just written to the outbox: show and send it without waiting for a re-read. */
  add(record: OutboxRecord): void {
    if (!this.records.some((r) => r.id === record.id)) {
      this.records = [...this.records, record].sort((a, b) => a.seq - b.seq);
      this.emit();
    }
    this.kick();
  }

  /** Sends what is waiting, if the link is up and nothing is in flight. */
  kick(): void {
    if (!this.link.socket.connected || !this.gateOpen) return;
    const [next] = selectToSend(this.records, this.inFlight);
    if (!next) return;
    this.send(next);
  }

  private send(record: OutboxRecord): void {
    const generation = this.generation;
    this.inFlight.add(record.id);
    this.link.socket
      .timeout(ACK_TIMEOUT_MS)
      .emit(
        'entry:add',
        {
          codeId: record.codeId,
          entry: record.entry,
          ...(record.refill ? { refill: record.refill } : {}),
        },
        (err: Error | null, ack: EntryAddAck) => {
          if (generation !== this.generation) return; // the link dropped meanwhile; resent on reconnect
          this.link.touch();
          void this.settle(record, err ? null : ack);
        },
      );
  }

  private async settle(record: OutboxRecord, ack: EntryAddAck | null): Promise<void> {
    const outcome = classifyAck(ack);
    try {
      if (outcome === 'stored' && ack?.ok) {
        for (const l of this.ackListeners) l(record, ack.entry);
        await acknowledgeOutbox(record, ack.entry);
        this.records = this.records.filter((r) => r.id !== record.id);
      } else if (outcome === 'refused' && ack && !ack.ok) {
        await markOutboxFailed(record.id, ack.error, ack.status);
      }
    } catch (err) {
      console.error('outbox could not be updated', err);
    }
    this.inFlight.delete(record.id);
    await this.reload();
    if (outcome === 'retry') this.scheduleRetry();
    else this.kick();
  }

  private scheduleRetry(): void {
    if (this.retryTimer !== null) return;
    this.retryTimer = setTimeout(() => {
      this.retryTimer = null;
      this.kick();
    }, RETRY_DELAY_MS);
  }

  private emit(): void {
    for (const l of this.listeners) l();
  }
}

/**
 * Whether this device's copy of a log, merged with what a join returned, holds another number of
 * entries than the server says the log holds (`count` is absent from older servers).
 */
export function logCopyDiffers(
  stored: ReadonlyMap<string, StoredEntry>,
  received: readonly StoredEntry[],
  count: number | undefined,
): boolean {
  if (count === undefined) return false;
  let size = stored.size;
  for (const e of received) if (!stored.has(e.id)) size++;
  return size !== count;
}

/* ---------------------------------------------------------------------------------------------
 * One open code: its stored log, kept in step with the server and cached on the device
 * ------------------------------------------------------------------------------------------- */

/**
 * Where a tap is on its way, as the pad shows it: `recording` (in memory, the IndexedDB write not
 * yet committed: shown as pending, never as kept), `on-device` (in the outbox, waiting for the
 * server), `saved` (the server acknowledged it after its commit).
 */
export type EntryStage = 'recording' | 'on-device' | 'saved';

/** A tap whose IndexedDB write failed: it is in no log and must be said loudly. */
export interface UnkeptTap {
  entry: NewEntry;
  error: string;
}

/** A tap held in memory from the click until its IndexedDB write settles. */
export interface DraftTap {
  entry: NewEntry;
  /** Set when the write failed. */
  error: string | null;
}

export function entryStage(
  id: string,
  view: { recordingIds: ReadonlySet<string>; pendingIds: ReadonlySet<string> },
): EntryStage {
  if (view.recordingIds.has(id)) return 'recording';
  if (view.pendingIds.has(id)) return 'on-device';
  return 'saved';
}

/**
 * The log one code shows, from the server's stored entries, this device's outbox and the taps
 * still being written: a stored copy wins over the outbox's, the outbox's over the memory's.
 * A draft whose write failed is kept out of the log (it was never kept) and listed as unkept.
 */
export function buildCodeView(
  codeId: string,
  stored: ReadonlyMap<string, StoredEntry>,
  records: readonly OutboxRecord[],
  drafts: ReadonlyMap<string, DraftTap>,
): Pick<CodeSyncSnapshot, 'entries' | 'pendingIds' | 'recordingIds' | 'failed' | 'unkept'> {
  const mine = records.filter((r) => r.codeId === codeId);
  const inOutbox = new Set(mine.map((r) => r.id));
  const pending = mine.filter((r) => r.status === 'pending' && !stored.has(r.id));
  const recording = [...drafts.values()].filter(
    (d) => d.error === null && !stored.has(d.entry.id) && !inOutbox.has(d.entry.id),
  );
  return {
    entries: mergeLog(stored.values(), [...pending.map((r) => r.entry), ...recording.map((d) => d.entry)]),
    pendingIds: new Set(pending.map((r) => r.id)),
    recordingIds: new Set(recording.map((d) => d.entry.id)),
    failed: mine.filter((r) => r.status === 'failed' && !stored.has(r.id)),
    unkept: [...drafts.values()].flatMap((d) => (d.error === null ? [] : [{ entry: d.entry, error: d.error }])),
  };
}

/**
 * One tap's way: shown from memory at once (same frame as the click), then written to the
 * outbox; only once that write committed is it handed to the sender and shown as on this
 * device. A failed write stays on screen as unkept, and the promise rejects.
 */
export async function recordTap<R extends { id: string; entry: NewEntry }>(
  draft: NewEntry,
  view: { addDraft(entry: NewEntry): void; draftKept(id: string): void; draftFailed(id: string, error: string): void },
  write: () => Promise<R>,
  send: (record: R) => void,
): Promise<R> {
  view.addDraft(draft);
  let record: R;
  try {
    record = await write();
  } catch (err) {
    view.draftFailed(draft.id, err instanceof Error ? err.message : String(err));
    throw err;
  }
  send(record);
  view.draftKept(draft.id);
  return record;
}

export interface CodeSyncSnapshot {
  /** Stored, waiting and still-recording entries, merged, in log order. */
  entries: LogEntry[];
  /** Ids of entries in this device's outbox, not yet acknowledged. */
  pendingIds: ReadonlySet<string>;
  /** Ids of taps shown from memory whose IndexedDB write has not committed yet. */
  recordingIds: ReadonlySet<string>;
  /** Taps whose IndexedDB write failed. */
  unkept: UnkeptTap[];
  /** Entries the server refused; they stay on screen until someone acts. */
  failed: OutboxRecord[];
  /** True once the log cache (or the server) has been read. */
  loaded: boolean;
  /** True after the last (re)connect's join was answered. */
  joined: boolean;
  /** The code as last read from the server (or the cache). */
  code: Code | null;
  joinError: string | null;
}

type Listener = () => void;

const CACHE_WRITE_DELAY_MS = 150;

export class CodeSync {
  private readonly stored = new Map<string, StoredEntry>();
  private readonly drafts = new Map<string, DraftTap>();
  private cursor = 0;
  private code: Code | null = null;
  private loaded = false;
  private joined = false;
  private joinError: string | null = null;
  private snapshot: CodeSyncSnapshot;
  private readonly listeners = new Set<Listener>();
  private readonly cleanups: (() => void)[] = [];
  private cacheTimer: ReturnType<typeof setTimeout> | null = null;

  constructor(
    readonly codeId: string,
    private readonly link: LiveLink,
    private readonly sender: OutboxSender,
  ) {
    this.snapshot = this.build();
  }

  start(): void {
    const socket = this.link.socket;
    const onConnect = () => this.join();
    const onAdded = (event: EntryAddedEvent) => {
      if (event.codeId !== this.codeId) return;
      this.cursor = Math.max(this.cursor, event.cursor);
      this.store([event.entry]);
    };
    socket.on('connect', onConnect);
    socket.on('entry:added', onAdded);
    this.cleanups.push(
      () => socket.off('connect', onConnect),
      () => socket.off('entry:added', onAdded),
      this.sender.subscribe(() => this.refresh()),
      this.sender.onAck((record, entry) => {
        if (record.codeId === this.codeId) this.store([entry]);
      }),
      this.link.subscribe((state) => {
        if (!state.connected && this.joined) {
          this.joined = false;
          this.refresh();
        }
      }),
    );
    void readLogCache(this.codeId)
      .then((cache) => {
        if (cache) {
          this.code ??= cache.code;
          this.cursor = Math.max(this.cursor, cache.cursor);
          for (const e of cache.entries) if (!this.stored.has(e.id)) this.stored.set(e.id, e);
        }
      })
      .catch((err: unknown) => console.error('log cache could not be read', err))
      .finally(() => {
        this.loaded = true;
        this.refresh();
        if (socket.connected) this.join();
      });
  }

  stop(): void {
    for (const c of this.cleanups.splice(0)) c();
    if (this.link.socket.connected) this.link.socket.emit('code:leave', { codeId: this.codeId });
    if (this.cacheTimer !== null) {
      clearTimeout(this.cacheTimer);
      this.persist();
    }
  }

  getSnapshot = (): CodeSyncSnapshot => this.snapshot;

  subscribe = (listener: Listener): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  /** A tap shown from memory before its IndexedDB write. */
  addDraft(entry: NewEntry): void {
    this.drafts.set(entry.id, { entry, error: null });
    this.refresh();
  }

  /** The draft's write committed: from now on the outbox shows it. */
  draftKept(id: string): void {
    if (this.drafts.delete(id)) this.refresh();
  }

  draftFailed(id: string, error: string): void {
    const d = this.drafts.get(id);
    if (!d) return;
    this.drafts.set(id, { ...d, error });
    this.refresh();
  }

  /** The code and its whole stored log, read over REST. */
  applyServerCopy(code: Code, entries: StoredEntry[]): void {
    this.code = code;
    for (const e of entries) this.cursor = Math.max(this.cursor, e.cursor);
    this.loaded = true;
    this.store(entries);
  }

  setCode(code: Code): void {
    this.code = code;
    this.refresh();
    this.schedulePersist();
  }

  /**
   * Joins the code's room with the last cursor seen. When the server's count of the log differs
   * from this copy after the merge (a server restored from an older copy reuses cursors, or this
   * copy missed something), joins again from the start and takes the server's log as it stands;
   * entries still waiting in the outbox keep showing as waiting.
   */
  private join(fromStart = false): void {
    if (!this.loaded) return; // joins once the cache is read, so `after` is right
    const after = fromStart ? 0 : this.cursor;
    this.link.socket
      .timeout(ACK_TIMEOUT_MS)
      .emit('code:join', { codeId: this.codeId, after }, (err: Error | null, ack: CodeJoinAck) => {
        if (err || !ack) return; // the next connect joins again
        this.link.touch();
        if (!ack.ok) {
          this.joinError = ack.error;
          this.refresh();
          return;
        }
        this.joinError = null;
        if (fromStart) {
          this.stored.clear();
          this.cursor = ack.cursor;
        }
        this.cursor = Math.max(this.cursor, ack.cursor);
        if (!fromStart && logCopyDiffers(this.stored, ack.entries, ack.count)) {
          this.join(true);
          return;
        }
        this.joined = true;
        this.store(ack.entries);
        this.sender.kick();
      });
  }

  private store(entries: readonly StoredEntry[]): void {
    for (const e of entries) {
      if (e.codeId === this.codeId) this.stored.set(e.id, e);
    }
    this.refresh();
    this.schedulePersist();
  }

  private refresh(): void {
    this.snapshot = this.build();
    for (const l of this.listeners) l();
  }

  private build(): CodeSyncSnapshot {
    return {
      ...buildCodeView(this.codeId, this.stored, this.sender.getRecords(), this.drafts),
      loaded: this.loaded,
      joined: this.joined,
      code: this.code,
      joinError: this.joinError,
    };
  }

  private schedulePersist(): void {
    if (this.cacheTimer !== null) return;
    this.cacheTimer = setTimeout(() => {
      this.cacheTimer = null;
      this.persist();
    }, CACHE_WRITE_DELAY_MS);
  }

  private persist(): void {
    writeLogCache({
      codeId: this.codeId,
      code: this.code,
      entries: [...this.stored.values()],
      cursor: this.cursor,
      savedAt: Date.now(),
    }).catch((err: unknown) => console.error('log cache could not be written', err));
  }
}
