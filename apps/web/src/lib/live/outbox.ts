import type { Code, NewEntry, ProtocolSettings, RefillInfo, StoredEntry } from '@steadyhand/shared';
import { buildEntry, type EntryFields, type EntryStamp } from './entry-build';
import { readTx, requestResult, STORES, writeTx } from './idb';

/**
 * The device's outbox: every tap lands here first (strict durability) and leaves only when the
 * server has acknowledged it after its commit. Every tap is also kept, in the same transaction,
 * in the `kept` store, acknowledged or not, until its code's record is signed (or 7 days), so the
 * device can send it again to a server restored from an older copy. Also keeps the device's
 * identity and sequence counter, and the last known log of each code so a reload shows it at
 * once, offline too.
 */

export interface OutboxRecord {
  id: string;
  codeId: string;
  seq: number;
  /** Device wall clock when the tap was written here (for the 60 s alarm). */
  createdAt: number;
  entry: NewEntry;
  /** 'failed': the server refused it (4xx); it stays here and on screen until someone acts. */
  status: 'pending' | 'failed';
  error?: string;
  errorStatus?: number;
  /** Put back in line because a restored server lacked it; sent with what the device knows of its first storing. */
  refill?: RefillInfo;
}

/** A tap this device recorded, kept after its acknowledgement until the code's record is signed. */
export interface KeptRecord {
  id: string;
  codeId: string;
  seq: number;
  /** Device wall clock when the tap was written (the 7-day limit counts from the code's last one). */
  keptAt: number;
  entry: NewEntry;
  /** From the acknowledgement: when and by whom the server stored it. */
  storedAt?: string;
  storedBy?: string;
}

export interface DeviceIdentity {
  key: 'identity';
  deviceId: string;
  nextSeq: number;
}

/**
 * The sequence number for the next tap and the identity to store back: a device id is made
 * once, on the first tap, and the counter only ever goes up.
 */
export function takeSeq(
  found: DeviceIdentity | undefined,
  makeId: () => string,
): { deviceId: string; seq: number; next: DeviceIdentity } {
  const identity: DeviceIdentity = found ?? { key: 'identity', deviceId: makeId(), nextSeq: 1 };
  return {
    deviceId: identity.deviceId,
    seq: identity.nextSeq,
    next: { ...identity, nextSeq: identity.nextSeq + 1 },
  };
}

export interface LogCacheRecord {
  codeId: string;
  code: Code | null;
  entries: StoredEntry[];
  cursor: number;
  savedAt: number;
}

interface ProtocolCacheRecord {
  /** 'protocol:<version>', and 'protocol' for the last version seen. */
  key: string;
  protocol: ProtocolSettings;
}

/** Tells this tab and others that the outbox changed. */
const CHANNEL = 'steadyhand-outbox';
const localEvents = new EventTarget();
let channel: BroadcastChannel | null = null;
function getChannel(): BroadcastChannel | null {
  if (channel === null && typeof BroadcastChannel !== 'undefined') {
    channel = new BroadcastChannel(CHANNEL);
    channel.onmessage = () => localEvents.dispatchEvent(new Event('change'));
  }
  return channel;
}

function announceChange(): void {
  localEvents.dispatchEvent(new Event('change'));
  getChannel()?.postMessage('change');
}

export function onOutboxChange(listener: () => void): () => void {
  getChannel();
  localEvents.addEventListener('change', listener);
  return () => localEvents.removeEventListener('change', listener);
}

export type StampWithoutIdentity = Omit<EntryStamp, 'deviceId' | 'seq'>;

/**
 * Writes a tap to the outbox. The device id and the next sequence number are read and advanced
 * in the same transaction as the outbox write, so two tabs never share a number. Resolves with
 * the stored entry once the transaction is complete: only then is the tap "saved on this device".
 */
export async function addToOutbox(
  codeId: string,
  fields: EntryFields,
  stamp: StampWithoutIdentity,
): Promise<OutboxRecord> {
  const record = await writeTx([STORES.device, STORES.outbox, STORES.kept], async (tx) => {
    const device = tx.objectStore(STORES.device);
    const found = (await requestResult(device.get('identity'))) as DeviceIdentity | undefined;
    const { deviceId, seq, next } = takeSeq(found, () => crypto.randomUUID());
    const entry = buildEntry(fields, { ...stamp, deviceId, seq });
    const rec: OutboxRecord = {
      id: entry.id,
      codeId,
      seq,
      createdAt: Date.now(),
      entry,
      status: 'pending',
    };
    device.put(next);
    tx.objectStore(STORES.outbox).add(rec);
    tx.objectStore(STORES.kept).put({
      id: rec.id,
      codeId,
      seq,
      keptAt: rec.createdAt,
      entry,
    } satisfies KeptRecord);
    return rec;
  });
  announceChange();
  return record;
}

/** Every outbox record of this device, in sequence order. */
export async function readOutbox(): Promise<OutboxRecord[]> {
  return readTx([STORES.outbox], (tx) =>
    requestResult(
      tx.objectStore(STORES.outbox).index('by-seq').getAll() as IDBRequest<OutboxRecord[]>,
    ),
  );
}

export async function countOutbox(): Promise<number> {
  return readTx([STORES.outbox], (tx) => requestResult(tx.objectStore(STORES.outbox).count()));
}

/**
 * The server acknowledged an entry (stored, or stored before): it leaves the outbox and its kept
 * copy notes when and by whom it was stored, in one transaction.
 */
export async function acknowledgeOutbox(record: OutboxRecord, stored: StoredEntry): Promise<void> {
  await writeTx([STORES.outbox, STORES.kept], async (tx) => {
    tx.objectStore(STORES.outbox).delete(record.id);
    const kept = tx.objectStore(STORES.kept);
    const found = (await requestResult(kept.get(record.id))) as KeptRecord | undefined;
    kept.put({
      ...(found ?? {
        id: record.id,
        codeId: record.codeId,
        seq: record.seq,
        keptAt: record.createdAt,
        entry: record.entry,
      }),
      storedAt: stored.recordedAt,
      storedBy: stored.userId,
    } satisfies KeptRecord);
  });
  announceChange();
}

/** Every kept tap of this device, all codes. */
export async function readKept(): Promise<KeptRecord[]> {
  return readTx([STORES.kept], (tx) =>
    requestResult(tx.objectStore(STORES.kept).getAll() as IDBRequest<KeptRecord[]>),
  );
}

/** Forgets a code's kept taps (its record is signed and holds them all, or they are older than the limit). */
export async function dropKept(codeId: string): Promise<void> {
  await writeTx([STORES.kept], async (tx) => {
    const store = tx.objectStore(STORES.kept);
    const keys = await requestResult(store.index('by-code').getAllKeys(codeId));
    for (const key of keys) store.delete(key);
  });
}

/**
 * Puts kept taps that a restored server lacks back in the outbox, with their own ids and sequence
 * numbers, so they are sent in their first order and a repeat is still answered with the stored
 * row. A tap already waiting in the outbox is left as it is. Resolves with how many were queued.
 */
export async function requeueForRefill(records: readonly KeptRecord[]): Promise<number> {
  let queued = 0;
  await writeTx([STORES.outbox], async (tx) => {
    const outbox = tx.objectStore(STORES.outbox);
    for (const k of records) {
      if (await requestResult(outbox.getKey(k.id))) continue;
      outbox.put({
        id: k.id,
        codeId: k.codeId,
        seq: k.seq,
        createdAt: Date.now(),
        entry: k.entry,
        status: 'pending',
        refill: { ...(k.storedAt ? { storedAt: k.storedAt } : {}), ...(k.storedBy ? { storedBy: k.storedBy } : {}) },
      } satisfies OutboxRecord);
      queued++;
    }
  });
  if (queued) announceChange();
  return queued;
}

export async function markOutboxFailed(
  id: string,
  error: string,
  errorStatus: number,
): Promise<void> {
  await writeTx([STORES.outbox], async (tx) => {
    const store = tx.objectStore(STORES.outbox);
    const rec = (await requestResult(store.get(id))) as OutboxRecord | undefined;
    if (rec) store.put({ ...rec, status: 'failed', error, errorStatus } satisfies OutboxRecord);
  });
  announceChange();
}

/** Puts a refused entry back in line, for example after the code's details were fixed. */
export async function retryFailed(id: string): Promise<void> {
  await writeTx([STORES.outbox], async (tx) => {
    const store = tx.objectStore(STORES.outbox);
    const rec = (await requestResult(store.get(id))) as OutboxRecord | undefined;
    if (rec)
      store.put({
        id: rec.id,
        codeId: rec.codeId,
        seq: rec.seq,
        createdAt: Date.now(),
        entry: rec.entry,
        status: 'pending',
        ...(rec.refill ? { refill: rec.refill } : {}),
      } satisfies OutboxRecord);
  });
  announceChange();
}

export async function readLogCache(codeId: string): Promise<LogCacheRecord | null> {
  return readTx([STORES.logCache], async (tx) => {
    const rec = (await requestResult(tx.objectStore(STORES.logCache).get(codeId))) as
      LogCacheRecord | undefined;
    return rec ?? null;
  });
}

export async function writeLogCache(record: LogCacheRecord): Promise<void> {
  await writeTx([STORES.logCache], (tx) => {
    tx.objectStore(STORES.logCache).put(record);
  });
}

/** A protocol version this device has seen (null: the last one seen, whatever its number). */
export async function readCachedProtocol(version: number | null): Promise<ProtocolSettings | null> {
  return readTx([STORES.device], async (tx) => {
    const rec = (await requestResult(tx.objectStore(STORES.device).get(version === null ? 'protocol' : `protocol:${version}`))) as
      ProtocolCacheRecord | undefined;
    return rec?.protocol ?? null;
  });
}

export async function writeCachedProtocol(version: number, protocol: ProtocolSettings): Promise<void> {
  await writeTx([STORES.device], (tx) => {
    const store = tx.objectStore(STORES.device);
    store.put({ key: `protocol:${version}`, protocol } satisfies ProtocolCacheRecord);
    store.put({ key: 'protocol', protocol } satisfies ProtocolCacheRecord);
  });
}
