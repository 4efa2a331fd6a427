import { z } from 'zod';
import { textSchema } from './text.js';
import { newEntrySchema, type StoredEntry } from './entries.js';

/** socket.io namespace and event payloads shared by the gateway and every screen. */
export const LIVE_NAMESPACE = '/live';

export const codeJoinSchema = z.object({
  codeId: textSchema().min(1).max(64),
  /** The last cursor this screen has seen; the answer holds everything after it. */
  after: z.number().int().nonnegative().optional(),
});
export type CodeJoinRequest = z.infer<typeof codeJoinSchema>;

export const entryAddSchema = z.object({
  codeId: textSchema().min(1).max(64),
  entry: newEntrySchema,
});
export type EntryAddRequest = z.infer<typeof entryAddSchema>;

export const timePingSchema = z.object({ t0: z.number().finite() });

export type LiveError = { ok: false; error: string; status: number };
export type CodeJoinAck = { ok: true; entries: StoredEntry[]; cursor: number } | LiveError;
export type EntryAddAck = { ok: true; entry: StoredEntry; duplicate: boolean } | LiveError;
export type TimePingAck = { t0: number; t1: number; t2: number };

export interface EntryAddedEvent {
  codeId: string;
  entry: StoredEntry;
  cursor: number;
}

export interface LiveClientToServer {
  'code:join': (payload: CodeJoinRequest, ack: (res: CodeJoinAck) => void) => void;
  'code:leave': (payload: { codeId: string }) => void;
  'entry:add': (payload: EntryAddRequest, ack: (res: EntryAddAck) => void) => void;
  'time:ping': (payload: { t0: number }, ack: (res: TimePingAck) => void) => void;
}

export interface LiveServerToClient {
  'entry:added': (event: EntryAddedEvent) => void;
  /** A code was started or ended: boards of live codes refresh. */
  'codes:changed': (event: { codeId: string }) => void;
}
