/**
 * Keeping every screen on the server's clock. Each device pings the server, estimates its offset
 * with the RFC 5905 on-wire formula, keeps the sample with the smallest round trip (Cristian's
 * method: the shortest trip bounds the error most tightly), and shows device time + offset.
 * Timers read this corrected clock every tick, so two screens agree even when their device
 * clocks differ by minutes.
 */

export interface ClockSample {
  /** Server clock minus device clock, ms: add it to device time to get server time. */
  offsetMs: number;
  /** Time on the wire, server processing excluded. */
  roundTripMs: number;
}

/**
 * One ping. t0: device sends; t1: server receives; t2: server sends; t3: device receives.
 * t0 and t3 are device clock readings, t1 and t2 server clock readings (epoch ms).
 * RFC 5905 section 8: offset = ((t1 - t0) + (t2 - t3)) / 2, delay = (t3 - t0) - (t2 - t1).
 */
export function clockSampleFromPing(t0: number, t1: number, t2: number, t3: number): ClockSample {
  return {
    offsetMs: (t1 - t0 + (t2 - t3)) / 2,
    roundTripMs: t3 - t0 - (t2 - t1),
  };
}

/**
 * A sample is usable when its numbers are finite and its round trip is not negative. A negative
 * round trip means the device clock jumped backwards during the ping (or the server's clock
 * did), so its offset says nothing.
 */
export function isUsableClockSample(sample: ClockSample): boolean {
  return Number.isFinite(sample.offsetMs) && Number.isFinite(sample.roundTripMs) && sample.roundTripMs >= 0;
}

/**
 * The usable sample with the smallest round trip (the first one on a tie), or null when none
 * is usable. Callers drop their samples when the device clock jumps (see deviceClockJumpMs):
 * samples from before a jump carry the old offset.
 */
export function bestClockSample(samples: readonly ClockSample[]): ClockSample | null {
  let best: ClockSample | null = null;
  for (const s of samples) {
    if (!isUsableClockSample(s)) continue;
    if (best === null || s.roundTripMs < best.roundTripMs) best = s;
  }
  return best;
}

/**
 * How far the corrected time may be off: the true offset lies within offset +/- roundTrip/2
 * whatever the split between the outbound and return trips.
 */
export function uncertaintyMs(sample: Pick<ClockSample, 'roundTripMs'>): number {
  return sample.roundTripMs / 2;
}

/** Device time corrected to the server's clock. */
export function correctedNow(deviceNowMs: number, offsetMs: number): number {
  return deviceNowMs + offsetMs;
}

/**
 * How much the device's wall clock jumped between two readings, measured against a monotonic
 * clock (performance.now(), which never jumps): positive forwards, negative backwards, about 0
 * when nothing happened. A jump larger than the caller's tolerance means the offset is stale:
 * drop the samples and ping again.
 */
export function deviceClockJumpMs(
  before: { wallMs: number; monotonicMs: number },
  after: { wallMs: number; monotonicMs: number },
): number {
  return after.wallMs - before.wallMs - (after.monotonicMs - before.monotonicMs);
}
