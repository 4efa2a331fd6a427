import { randomUUID } from 'node:crypto';
import type { CodeJoinAck, EntryAddAck, EntryAddedEvent, NewEntry, StoredEntry } from '@steadyhand/shared';
import { io } from 'socket.io-client';
import type { LiveClient } from './live-client.js';

type DeviceFields = 'id' | 'at' | 'deviceId' | 'seq';
/** What the person tapped; the device adds the id, the time and its sequence number. */
export type TapFields = NewEntry extends infer T ? (T extends unknown ? Omit<T, DeviceFields> : never) : never;

export interface OutboxItem {
  codeId: string;
  entry: NewEntry;
  /** True only once the server acknowledged it with ok (that is, after its commit). */
  saved: boolean;
  stored?: StoredEntry;
  sends: number;
}

export interface OutboxClientOptions {
  /** Where the live socket is reached (the server, or a proxy in front of it). */
  url: string;
  cookie: string;
  origin: string;
  deviceId: string;
  /** The codes this screen shows: joined on every (re)connect. */
  codes: string[];
  /** Entries sent before the first of them is acknowledged. */
  window?: number;
  /** A connection that does not answer in this time is treated as dead and opened again. */
  ackTimeoutMs?: number;
}

export interface OutboxStats {
  connects: number;
  disconnects: number;
  sends: number;
  /** Sends of an entry that had been sent before. */
  resends: number;
  acks: number;
  /** Acknowledgements saying the server had stored that id already. */
  duplicates: number;
  /** Error acknowledgements: none are expected for valid entries from a writer. */
  errors: string[];
}

interface View {
  cursor: number;
  entries: Map<string, StoredEntry>;
}

/**
 * A device as the design describes it: every tap goes into an outbox first (its own UUID and
 * per-device sequence number); the outbox is sent in order with a small window; an entry counts
 * as saved only on an ok acknowledgement; on every (re)connect the device joins its codes with
 * the last cursor it saw, merges what it missed, then resends everything unsaved from the first
 * unsaved entry on. Its view of each code is kept by id and ordered by cursor.
 */
export class OutboxClient {
  readonly deviceId: string;
  readonly outbox: OutboxItem[] = [];
  readonly stats: OutboxStats = { connects: 0, disconnects: 0, sends: 0, resends: 0, acks: 0, duplicates: 0, errors: [] };
  private readonly socket: LiveClient;
  private readonly codes: string[];
  private readonly window: number;
  private readonly ackTimeoutMs: number;
  private readonly views = new Map<string, View>();
  /** Bumped on every connect and disconnect: answers from an older connection do not steer sending. */
  private epoch = 0;
  private ready = false;
  private readonly inFlight = new Set<string>();
  private nextToSend = 0;
  private firstUnsaved = 0;
  private seq = 0;
  private closed = false;

  constructor(options: OutboxClientOptions) {
    this.deviceId = options.deviceId;
    this.codes = options.codes;
    this.window = options.window ?? 1;
    this.ackTimeoutMs = options.ackTimeoutMs ?? 10_000;
    for (const codeId of options.codes) this.views.set(codeId, { cursor: 0, entries: new Map() });
    this.socket = io(`${options.url}/live`, {
      transports: ['websocket'],
      extraHeaders: { cookie: options.cookie, origin: options.origin },
      forceNew: true,
      reconnection: true,
      // Short delays keep a test with many reconnects bounded; the backoff still spreads them.
      reconnectionDelay: 100,
      reconnectionDelayMax: 1000,
      timeout: 5000,
    });
    this.socket.on('connect', () => {
      const epoch = ++this.epoch;
      this.stats.connects++;
      this.ready = false;
      this.inFlight.clear();
      void this.rejoin(epoch);
    });
    this.socket.on('disconnect', () => {
      this.epoch++;
      this.stats.disconnects++;
      this.ready = false;
      this.inFlight.clear();
    });
    this.socket.on('entry:added', (event: EntryAddedEvent) => this.merge(event.codeId, [event.entry], event.cursor));
  }

  /** A tap: into the outbox at once, sent when the link allows. */
  tap(codeId: string, fields: TapFields): NewEntry {
    const entry = { ...fields, id: randomUUID(), at: new Date().toISOString(), deviceId: this.deviceId, seq: ++this.seq } as NewEntry;
    this.outbox.push({ codeId, entry, saved: false, sends: 0 });
    this.pump();
    return entry;
  }

  get connected(): boolean {
    return this.socket.connected;
  }

  get pending(): number {
    return this.outbox.filter((item) => !item.saved).length;
  }

  /** Ids the server has acknowledged as stored. */
  savedIds(): string[] {
    return this.outbox.filter((item) => item.saved).map((item) => item.entry.id);
  }

  /** This screen's log of a code, ordered by cursor. */
  view(codeId: string): StoredEntry[] {
    const view = this.views.get(codeId);
    if (!view) throw new Error(`${this.deviceId} does not show code ${codeId}`);
    return [...view.entries.values()].sort((a, b) => a.cursor - b.cursor);
  }

  cursor(codeId: string): number {
    return this.views.get(codeId)?.cursor ?? 0;
  }

  /**
   * The device lost its record of the last `count` acknowledgements (say it was restarted before
   * writing them down), so it sends those entries again.
   */
  forgetSaved(count: number): number {
    let forgotten = 0;
    for (let i = this.outbox.length - 1; i >= 0 && forgotten < count; i--) {
      const item = this.outbox[i]!;
      if (!item.saved) continue;
      item.saved = false;
      forgotten++;
    }
    this.firstUnsaved = 0;
    this.advanceFirstUnsaved();
    // Start sending again from the first unsaved entry, in order, on a fresh connection.
    if (this.socket.connected) this.reopen();
    return forgotten;
  }

  /** Resolves once every tap is acknowledged. */
  whenIdle(timeoutMs: number): Promise<void> {
    return this.waitFor(() => this.pending === 0, timeoutMs, () => `${this.pending} entries unsaved`);
  }

  /** Resolves once this screen has seen everything up to `cursor` in the code. */
  whenCaughtUp(codeId: string, cursor: number, timeoutMs: number): Promise<void> {
    return this.waitFor(() => this.cursor(codeId) >= cursor, timeoutMs, () => `cursor ${this.cursor(codeId)} of ${cursor} in ${codeId}`);
  }

  close(): void {
    this.closed = true;
    this.socket.disconnect();
  }

  private async waitFor(done: () => boolean, timeoutMs: number, describe: () => string): Promise<void> {
    const deadline = Date.now() + timeoutMs;
    while (!done()) {
      if (Date.now() > deadline) {
        throw new Error(`${this.deviceId}: gave up after ${timeoutMs} ms: ${describe()}; connected=${this.socket.connected} stats=${JSON.stringify(this.stats)}`);
      }
      await new Promise((r) => setTimeout(r, 20));
    }
  }

  /** Treats the link as dead: a new connection, then join and resend. */
  private reopen(): void {
    if (this.closed) return;
    this.socket.disconnect();
    this.socket.connect();
  }

  private async rejoin(epoch: number): Promise<void> {
    for (const codeId of this.codes) {
      let ack: CodeJoinAck;
      try {
        ack = await this.socket.timeout(this.ackTimeoutMs).emitWithAck('code:join', { codeId, after: this.cursor(codeId) });
      } catch {
        // Disconnected meanwhile (the next connect starts over) or no answer (open a new link).
        if (epoch === this.epoch) this.reopen();
        return;
      }
      if (epoch !== this.epoch) return;
      if (!ack.ok) {
        this.stats.errors.push(`code:join ${codeId}: ${ack.status} ${ack.error}`);
        setTimeout(() => epoch === this.epoch && this.reopen(), 200);
        return;
      }
      this.merge(codeId, ack.entries, ack.cursor);
    }
    this.ready = true;
    this.nextToSend = this.firstUnsaved;
    this.pump();
  }

  private pump(): void {
    if (!this.ready || this.closed || !this.socket.connected) return;
    while (this.inFlight.size < this.window && this.nextToSend < this.outbox.length) {
      const item = this.outbox[this.nextToSend++]!;
      if (!item.saved) this.send(item);
    }
  }

  private send(item: OutboxItem): void {
    const epoch = this.epoch;
    const { id } = item.entry;
    this.inFlight.add(id);
    item.sends++;
    this.stats.sends++;
    if (item.sends > 1) this.stats.resends++;
    this.socket
      .timeout(this.ackTimeoutMs)
      .emitWithAck('entry:add', { codeId: item.codeId, entry: item.entry })
      .then(
        (ack: EntryAddAck) => {
          if (ack.ok) this.saved(item, ack.entry, ack.duplicate);
          if (epoch !== this.epoch) return;
          this.inFlight.delete(id);
          if (!ack.ok) {
            // Later entries may be in flight already; a fresh link resends from the first unsaved one.
            this.stats.errors.push(`entry:add seq ${item.entry.seq}: ${ack.status} ${ack.error}`);
            setTimeout(() => epoch === this.epoch && this.reopen(), 200);
            return;
          }
          this.pump();
        },
        () => {
          // Lost with its connection (resent after the next join), or no answer in time.
          if (epoch === this.epoch) this.reopen();
        },
      );
  }

  private saved(item: OutboxItem, stored: StoredEntry, duplicate: boolean): void {
    this.stats.acks++;
    if (duplicate) this.stats.duplicates++;
    if (item.saved) return;
    item.saved = true;
    item.stored = stored;
    // Shown at once on the tapping screen; the cursor only moves with broadcasts and joins, which
    // arrive in order, so nothing between is skipped.
    this.views.get(item.codeId)?.entries.set(stored.id, stored);
    this.advanceFirstUnsaved();
  }

  private advanceFirstUnsaved(): void {
    while (this.firstUnsaved < this.outbox.length && this.outbox[this.firstUnsaved]!.saved) this.firstUnsaved++;
  }

  private merge(codeId: string, entries: StoredEntry[], cursor: number): void {
    const view = this.views.get(codeId);
    if (!view) return;
    for (const entry of entries) view.entries.set(entry.id, entry);
    view.cursor = Math.max(view.cursor, cursor);
  }
}
