import type { Code, CodeLogAck, CodeRefillAck, CodeRefillRequest } from '@steadyhand/shared';
import type { LiveLink } from './live-socket';
import {
  dropKept,
  readKept,
  readLogCache,
  readOutbox,
  requeueForRefill,
  type KeptRecord,
} from './outbox';
import { ACK_TIMEOUT_MS } from './sync-engine';

/**
 * Refilling a restored server. The device keeps every tap it recorded (the `kept` store) until the
 * code's record is signed, or for 7 days after its last tap there. On every (re)connection, before
 * the outbox sends anything, it asks the server for each kept code's log and puts back in the
 * outbox, with their own ids and sequence numbers, the taps the server lacks; a code the server
 * does not know is started again with its device-made id first. The server stores them through
 * its normal path (chained in the order they arrive, audited as sent back by a device), and a
 * repeat is answered with the stored row, so nothing is doubled.
 */

/** How long kept taps outlive the code's last tap on this device when no signature comes. */
export const KEEP_MS = 7 * 24 * 60 * 60 * 1000;

/* ---------------------------------------------------------------------------------------------
 * Pure rules (unit-tested)
 * ------------------------------------------------------------------------------------------- */

export function groupByCode(kept: readonly KeptRecord[]): Map<string, KeptRecord[]> {
  const byCode = new Map<string, KeptRecord[]>();
  for (const k of kept) {
    const list = byCode.get(k.codeId) ?? [];
    list.push(k);
    byCode.set(k.codeId, list);
  }
  return byCode;
}

/** A code's kept taps are past the limit when its newest one is older than KEEP_MS. */
export function keptExpired(kept: readonly KeptRecord[], nowMs: number, keepMs = KEEP_MS): boolean {
  return kept.length > 0 && Math.max(...kept.map((k) => k.keptAt)) + keepMs < nowMs;
}

export interface RefillPlan {
  /** Kept taps the server lacks and the outbox does not hold, in this device's order. */
  requeue: KeptRecord[];
  /** The record is signed and holds every kept tap: they can be forgotten. */
  drop: boolean;
}

/** For one code: what to send again, given the ids in the server's log and those waiting in the outbox. */
export function planRefill(
  kept: readonly KeptRecord[],
  serverIds: ReadonlySet<string>,
  waiting: ReadonlySet<string>,
  signed: boolean,
): RefillPlan {
  const requeue = kept
    .filter((k) => !serverIds.has(k.id) && !waiting.has(k.id))
    .sort((a, b) => a.seq - b.seq);
  return { requeue, drop: signed && kept.every((k) => serverIds.has(k.id)) };
}

/**
 * The code to start again: the details this device last saw, or, when it never saw them, an adult
 * code whose arrest time is its earliest kept tap (the review completes the rest).
 */
export function refillCodeDetails(
  codeId: string,
  code: Code | null,
  kept: readonly KeptRecord[],
): CodeRefillRequest['code'] {
  if (code) {
    return {
      id: codeId,
      category: code.category,
      arrestAt: code.arrestAt,
      ...(code.weightKg !== null ? { weightKg: code.weightKg } : {}),
      ...(code.weightSource ? { weightSource: code.weightSource } : {}),
      ...(code.location !== null ? { location: code.location } : {}),
      ...(code.unitId !== null ? { unitId: code.unitId } : {}),
      ...(code.patient !== null ? { patient: code.patient } : {}),
    };
  }
  const first = kept.map((k) => k.entry.at).sort()[0];
  return { id: codeId, category: 'adult', arrestAt: first ?? new Date().toISOString() };
}

/* ---------------------------------------------------------------------------------------------
 * The check, over the live link
 * ------------------------------------------------------------------------------------------- */

export interface RefillRun {
  codes: number;
  requeued: number;
  started: number;
  dropped: number;
}

export class LogRefill {
  constructor(private readonly link: LiveLink) {}

  /** Compares every kept code with the server's log and queues what it lacks. */
  async run(): Promise<RefillRun> {
    const result: RefillRun = { codes: 0, requeued: 0, started: 0, dropped: 0 };
    const kept = await readKept();
    if (kept.length === 0) return result;
    const waiting = new Set((await readOutbox()).map((r) => r.id));
    const now = Date.now();
    const live: [string, KeptRecord[]][] = [];
    for (const [codeId, list] of groupByCode(kept)) {
      if (keptExpired(list, now)) {
        await dropKept(codeId);
        result.dropped++;
      } else live.push([codeId, list]);
    }
    // All codes asked at once: taps made since the connection wait for this check.
    const logs = await Promise.all(live.map(([codeId]) => this.ask<CodeLogAck>('code:log', { codeId })));
    for (const [i, [codeId, list]] of live.entries()) {
      const log = logs[i];
      if (!log?.ok) continue; // no answer or refused: the next connection asks again
      result.codes++;
      let serverIds = new Set<string>();
      let signed = false;
      if (log.exists) {
        serverIds = new Set(log.ids);
        signed = log.signed;
      } else {
        const cached = await readLogCache(codeId).catch(() => null);
        const started = await this.ask<CodeRefillAck>('code:refill', {
          code: refillCodeDetails(codeId, cached?.code ?? null, list),
          ...(cached?.code?.protocolVersion ? { protocolVersion: cached.code.protocolVersion } : {}),
        });
        if (!started?.ok) continue;
        result.started++;
      }
      const plan = planRefill(list, serverIds, waiting, signed);
      if (plan.requeue.length) result.requeued += await requeueForRefill(plan.requeue);
      if (plan.drop) {
        await dropKept(codeId);
        result.dropped++;
      }
    }
    if (result.requeued || result.started) {
      console.warn(
        `[refill] the server lacked taps this device kept: ${result.requeued} sent again, ${result.started} codes started again`,
      );
    }
    return result;
  }

  private async ask<T>(event: 'code:log' | 'code:refill', payload: object): Promise<T | null> {
    try {
      return (await this.link.socket
        .timeout(ACK_TIMEOUT_MS)
        .emitWithAck(event as 'code:log', payload as { codeId: string })) as T;
    } catch {
      return null;
    }
  }
}
