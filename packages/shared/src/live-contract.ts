import { z } from 'zod';
import { textSchema } from './text.js';
import { createCodeSchema, type Code } from './codes.js';
import { newEntrySchema, type StoredEntry } from './entries.js';

/** socket.io namespace and event payloads shared by the gateway and every screen. */
export const LIVE_NAMESPACE = '/live';

export const codeJoinSchema = z.object({
  codeId: textSchema().min(1).max(64),
  /** The last cursor this screen has seen; the answer holds everything after it. */
  after: z.number().int().nonnegative().optional(),
});
export type CodeJoinRequest = z.infer<typeof codeJoinSchema>;

/**
 * What a device knows of an entry it sends back to a server that lacks it (a server restored from
 * an older copy): when and by whom the server had first stored it, as the device was told then.
 */
export const refillInfoSchema = z
  .object({
    storedAt: z.iso.datetime().optional(),
    storedBy: textSchema().max(64).optional(),
  })
  .strict();
export type RefillInfo = z.infer<typeof refillInfoSchema>;

export const entryAddSchema = z.object({
  codeId: textSchema().min(1).max(64),
  entry: newEntrySchema,
  /** Present when the device sends back an entry the server had acknowledged before (a refill). */
  refill: refillInfoSchema.optional(),
});
export type EntryAddRequest = z.infer<typeof entryAddSchema>;

/** A device asks for the ids in a code's log, to send back what the server lacks. */
export const codeLogSchema = z.object({ codeId: textSchema().min(1).max(64) }).strict();
export type CodeLogRequest = z.infer<typeof codeLogSchema>;

/** A device starts again, with its own id, a code the server does not know (restored from an older copy). */
export const codeRefillSchema = z
  .object({
    code: createCodeSchema.required({ id: true }),
    /** The protocol version the code started with, as the device kept it: the code keeps it again. */
    protocolVersion: z.number().int().positive().optional(),
  })
  .strict();
export type CodeRefillRequest = z.input<typeof codeRefillSchema>;

export const timePingSchema = z.object({ t0: z.number().finite() });

export type LiveError = { ok: false; error: string; status: number };
/**
 * `count`: how many entries the code's log holds now. A screen whose copy holds a different number
 * after merging `entries` (the server was restored from an older copy, or it missed something)
 * joins again from cursor 0 and takes the server's log as it is.
 */
export type CodeJoinAck = { ok: true; entries: StoredEntry[]; cursor: number; count?: number } | LiveError;
/** `ids` in the log's (cursor) order; `signed`: the record has at least one signature. */
export type CodeLogAck = { ok: true; exists: false } | { ok: true; exists: true; ids: string[]; signed: boolean } | LiveError;
export type CodeRefillAck = { ok: true; code: Code; created: boolean } | LiveError;
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
  'code:log': (payload: CodeLogRequest, ack: (res: CodeLogAck) => void) => void;
  'code:refill': (payload: CodeRefillRequest, ack: (res: CodeRefillAck) => void) => void;
  'time:ping': (payload: { t0: number }, ack: (res: TimePingAck) => void) => void;
}

export interface LiveServerToClient {
  'entry:added': (event: EntryAddedEvent) => void;
  /** A code was started or ended: boards of live codes refresh. */
  'codes:changed': (event: { codeId: string }) => void;
}
