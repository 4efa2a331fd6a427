/**
 * A small promise wrapper over the native IndexedDB API. Every write is a readwrite transaction
 * opened with strict durability and resolves only on `complete`: that is when the data is on
 * disk, not when the request succeeded (a transaction can still abort after that).
 */

export const DB_NAME = 'steadyhand-device';
// 2: the `kept` store (every entry this device recorded, until its record is signed).
const DB_VERSION = 2;

export const STORES = {
  outbox: 'outbox',
  device: 'device',
  logCache: 'log-cache',
  kept: 'kept',
} as const;
export type StoreName = (typeof STORES)[keyof typeof STORES];

let dbPromise: Promise<IDBDatabase> | null = null;

export function openDeviceDb(): Promise<IDBDatabase> {
  if (!dbPromise) {
    const pending = new Promise<IDBDatabase>((resolve, reject) => {
      if (typeof indexedDB === 'undefined') {
        reject(new Error('This browser cannot store taps on the device (no IndexedDB).'));
        return;
      }
      const req = indexedDB.open(DB_NAME, DB_VERSION);
      req.onupgradeneeded = () => {
        const db = req.result;
        if (!db.objectStoreNames.contains(STORES.outbox)) {
          const outbox = db.createObjectStore(STORES.outbox, { keyPath: 'id' });
          outbox.createIndex('by-seq', 'seq');
        }
        if (!db.objectStoreNames.contains(STORES.device))
          db.createObjectStore(STORES.device, { keyPath: 'key' });
        if (!db.objectStoreNames.contains(STORES.logCache))
          db.createObjectStore(STORES.logCache, { keyPath: 'codeId' });
        if (!db.objectStoreNames.contains(STORES.kept)) {
          const kept = db.createObjectStore(STORES.kept, { keyPath: 'id' });
          kept.createIndex('by-code', 'codeId');
        }
      };
      req.onsuccess = () => {
        const db = req.result;
        // Another tab upgrading the schema: let it, and reopen on next use.
        db.onversionchange = () => {
          db.close();
          dbPromise = null;
        };
        resolve(db);
      };
      req.onerror = () => reject(req.error ?? new Error('IndexedDB could not be opened'));
      req.onblocked = () =>
        reject(new Error('IndexedDB is blocked by another tab; close other Steadyhand tabs.'));
    });
    dbPromise = pending;
    pending.catch(() => {
      if (dbPromise === pending) dbPromise = null;
    });
  }
  return dbPromise;
}

export function requestResult<T>(req: IDBRequest<T>): Promise<T> {
  return new Promise((resolve, reject) => {
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error ?? new Error('IndexedDB request failed'));
  });
}

/**
 * Runs `work` in one readwrite transaction (strict durability) and resolves with its result
 * once the transaction has completed. `work` must only queue requests synchronously or from
 * their callbacks; awaiting anything else would let the transaction commit early.
 */
export async function writeTx<T>(
  stores: StoreName[],
  work: (tx: IDBTransaction) => Promise<T> | T,
): Promise<T> {
  const db = await openDeviceDb();
  const tx = db.transaction(stores, 'readwrite', { durability: 'strict' });
  const done = new Promise<void>((resolve, reject) => {
    tx.oncomplete = () => resolve();
    tx.onabort = () => reject(tx.error ?? new Error('IndexedDB transaction aborted'));
    tx.onerror = () => reject(tx.error ?? new Error('IndexedDB transaction failed'));
  });
  let result: T;
  try {
    result = await work(tx);
  } catch (err) {
    try {
      tx.abort();
    } catch {
      // already finished
    }
    await done.catch(() => undefined);
    throw err;
  }
  await done;
  return result;
}

export async function readTx<T>(
  stores: StoreName[],
  work: (tx: IDBTransaction) => Promise<T>,
): Promise<T> {
  const db = await openDeviceDb();
  const tx = db.transaction(stores, 'readonly');
  return work(tx);
}
