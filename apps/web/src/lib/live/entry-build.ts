import type { NewEntry } from '@steadyhand/shared';

type DistributiveOmit<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never;

/** What a tap on the pad supplies: the kind and its fields. The rest is filled in here. */
export type EntryFields = DistributiveOmit<
  NewEntry,
  'id' | 'at' | 'deviceId' | 'seq' | 'offsetMs' | 'offsetUncertaintyMs'
>;

export interface EntryStamp {
  id: string;
  /** Corrected clock (device time + measured offset) at the tap, epoch ms. */
  atMs: number;
  deviceId: string;
  seq: number;
  offsetMs: number;
  /** Null while no clock sample has been taken yet. */
  offsetUncertaintyMs: number | null;
}

/** The entry as the device stores and sends it. */
export function buildEntry(fields: EntryFields, stamp: EntryStamp): NewEntry {
  const entry: NewEntry = {
    ...fields,
    id: stamp.id,
    at: new Date(stamp.atMs).toISOString(),
    deviceId: stamp.deviceId,
    seq: stamp.seq,
    offsetMs: Math.round(stamp.offsetMs),
    ...(stamp.offsetUncertaintyMs === null
      ? {}
      : { offsetUncertaintyMs: Math.round(stamp.offsetUncertaintyMs) }),
  };
  return entry;
}
