import {
  bestClockSample,
  clockSampleFromPing,
  correctedNow as correct,
  deviceClockJumpMs,
  uncertaintyMs as uncertaintyOf,
  type ClockSample,
  type TimePingAck,
} from '@steadyhand/shared';
import { api } from '../api-client';
import type { LiveLink } from './live-socket';

/**
 * Keeps this tab on the server's clock: a burst of pings (over the live socket, or
 * GET /api/time when it is down), keep the sample with the smallest round trip, again every
 * minute, when the tab becomes visible and on every reconnect. A device clock jump (the
 * tablet's time was set, or it woke from sleep) makes the samples stale: they are dropped, the
 * offset is marked unmeasured, and a new burst starts.
 */

export interface ClockState {
  offsetMs: number;
  /** Null until the first sample: the offset is then a guess (0, or the last one remembered). */
  uncertaintyMs: number | null;
  sampledAt: number | null;
}

const BURST = 5;
const RESAMPLE_MS = 60_000;
const JUMP_CHECK_MS = 2_000;
const JUMP_TOLERANCE_MS = 1_000;
const PING_TIMEOUT_MS = 3_000;
const REMEMBERED_KEY = 'steadyhand.clock';

type Listener = (state: ClockState) => void;

class ClockSync {
  private state: ClockState = { offsetMs: 0, uncertaintyMs: null, sampledAt: null };
  private samples: ClockSample[] = [];
  private readonly listeners = new Set<Listener>();
  private mark = { wallMs: Date.now(), monotonicMs: performance.now() };
  private link: LiveLink | null = null;
  private running = false;
  private estimating: Promise<void> | null = null;

  constructor() {
    try {
      const raw = localStorage.getItem(REMEMBERED_KEY);
      const remembered = raw ? (JSON.parse(raw) as { offsetMs?: unknown }) : null;
      // Until this tab measures, the last offset measured on this device beats assuming 0.
      if (
        remembered &&
        typeof remembered.offsetMs === 'number' &&
        Number.isFinite(remembered.offsetMs)
      ) {
        this.state = { offsetMs: remembered.offsetMs, uncertaintyMs: null, sampledAt: null };
      }
    } catch {
      // storage unavailable: start from 0
    }
  }

  start(link: LiveLink): void {
    if (this.running) return;
    this.running = true;
    this.link = link;
    link.socket.on('connect', () => void this.estimate());
    document.addEventListener('visibilitychange', () => {
      if (document.visibilityState === 'visible') void this.estimate();
    });
    setInterval(() => void this.estimate(), RESAMPLE_MS);
    setInterval(() => this.checkJump(), JUMP_CHECK_MS);
    void this.estimate();
  }

  correctedNow = (): number => correct(Date.now(), this.state.offsetMs);

  getState(): ClockState {
    return this.state;
  }

  subscribe(listener: Listener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  estimate(): Promise<void> {
    this.estimating ??= this.burst().finally(() => {
      this.estimating = null;
    });
    return this.estimating;
  }

  private async burst(): Promise<void> {
    const fresh: ClockSample[] = [];
    for (let i = 0; i < BURST; i++) {
      const before = { wallMs: Date.now(), monotonicMs: performance.now() };
      const sample = await this.pingOnce().catch(() => null);
      const after = { wallMs: Date.now(), monotonicMs: performance.now() };
      if (Math.abs(deviceClockJumpMs(before, after)) > JUMP_TOLERANCE_MS) {
        fresh.length = 0; // the clock jumped during this burst: nothing from it is trustworthy
        continue;
      }
      if (sample) fresh.push(sample);
    }
    if (fresh.length === 0) return;
    // Older samples stay useful until a jump: the smallest round trip wins across bursts,
    // but only the last few bursts count, so a drifting clock is followed.
    this.samples = [...this.samples, ...fresh].slice(-BURST * 3);
    const best = bestClockSample(this.samples);
    if (!best) return;
    this.set({
      offsetMs: best.offsetMs,
      uncertaintyMs: uncertaintyOf(best),
      sampledAt: Date.now(),
    });
    try {
      localStorage.setItem(REMEMBERED_KEY, JSON.stringify({ offsetMs: best.offsetMs }));
    } catch {
      // not critical
    }
  }

  private pingOnce(): Promise<ClockSample> {
    const socket = this.link?.socket;
    if (socket?.connected) {
      return new Promise((resolve, reject) => {
        const t0 = Date.now();
        socket
          .timeout(PING_TIMEOUT_MS)
          .emit('time:ping', { t0 }, (err: Error | null, ack: TimePingAck) => {
            const t3 = Date.now();
            if (err || typeof ack?.t1 !== 'number') reject(err ?? new Error('bad time answer'));
            else resolve(clockSampleFromPing(t0, ack.t1, ack.t2, t3));
          });
      });
    }
    return this.pingOverHttp();
  }

  private async pingOverHttp(): Promise<ClockSample> {
    const t0 = Date.now();
    const body = (await api.get('/api/time')) as { serverTime?: unknown };
    const t3 = Date.now();
    if (typeof body?.serverTime !== 'number') throw new Error('bad time answer');
    // One server reading: receive and send time are the same instant as far as we know.
    return clockSampleFromPing(t0, body.serverTime, body.serverTime, t3);
  }

  private checkJump(): void {
    const now = { wallMs: Date.now(), monotonicMs: performance.now() };
    const jump = deviceClockJumpMs(this.mark, now);
    this.mark = now;
    if (Math.abs(jump) <= JUMP_TOLERANCE_MS) return;
    // The samples describe the clock before the jump. The offset itself is kept: after a sleep,
    // the monotonic clock may have paused while the wall clock did not, which looks the same.
    this.samples = [];
    this.set({ ...this.state, uncertaintyMs: null });
    void this.estimate();
  }

  private set(state: ClockState): void {
    this.state = state;
    for (const l of this.listeners) l(state);
  }
}

let clock: ClockSync | null = null;

export function getClockSync(): ClockSync {
  clock ??= new ClockSync();
  return clock;
}

/** Server time as this tab best knows it, epoch ms. Every timer reads this. */
export function correctedNow(): number {
  return getClockSync().correctedNow();
}

export type { ClockSync };
