import { randomUUID } from 'node:crypto';
import type { NewEntry } from '@steadyhand/shared';

type Without<T> = T extends unknown ? Omit<T, 'id' | 'at'> : never;

/** An entry as a device makes it: its own UUID and the time of the tap. */
export function makeEntry(fields: Without<NewEntry>, at: Date | string = new Date()): NewEntry {
  return { id: randomUUID(), at: typeof at === 'string' ? at : at.toISOString(), ...fields };
}
