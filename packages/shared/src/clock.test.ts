import { describe, it, expect } from 'vitest';
import {
  bestClockSample,
  clockSampleFromPing,
  correctedNow,
  deviceClockJumpMs,
  isUsableClockSample,
  uncertaintyMs,
  type ClockSample,
} from './clock.js';

// Formulas: RFC 5905 (NTPv4), section 8 on-wire protocol: offset = ((t1 - t0) + (t2 - t3)) / 2,
// delay = (t3 - t0) - (t2 - t1). Keeping the smallest round trip: Cristian's method (1989).
// Both are cited in design/reliability.md section 3; the numbers below are our own worked examples.

/** Server clock at the moment the scenario starts: 2026-03-04T07:42:10Z. */
const SERVER_START = Date.parse('2026-03-04T07:42:10.000Z');

/**
 * One simulated ping from a device whose clock reads `aheadMs` more than the server's.
 * `sendAt` is true (server) time of sending; the trip out, the server's work and the trip back
 * take the given milliseconds.
 */
function ping(aheadMs: number, sendAt: number, outMs: number, serverMs: number, backMs: number): ClockSample {
  const t0 = sendAt + aheadMs;
  const t1 = sendAt + outMs;
  const t2 = t1 + serverMs;
  const t3 = t2 + backMs + aheadMs;
  return clockSampleFromPing(t0, t1, t2, t3);
}

describe('clockSampleFromPing (RFC 5905 on-wire formula)', () => {
  it('worked example: offset 590 ms, round trip 20 ms', () => {
    // t0 = 1000 (device), t1 = 1600, t2 = 1610 (server), t3 = 1030 (device):
    // offset = ((1600 - 1000) + (1610 - 1030)) / 2 = (600 + 580) / 2 = 590
    // delay  = (1030 - 1000) - (1610 - 1600) = 30 - 10 = 20
    const s = clockSampleFromPing(1000, 1600, 1610, 1030);
    expect(s).toEqual({ offsetMs: 590, roundTripMs: 20 });
    expect(uncertaintyMs(s)).toBe(10);
  });

  it('a device clock 3 min ahead: offset about -180,000 ms, off by no more than half the round trip', () => {
    // Out 40 ms, server 5 ms, back 60 ms:
    // t0 = S + 180000, t1 = S + 40, t2 = S + 45, t3 = S + 105 + 180000
    // offset = ((40 - 180000) + (45 - 180105)) / 2 = (-179960 - 180060) / 2 = -180010
    // delay  = 180105 - 180000 - 5 = 100; uncertainty 50; true offset -180000 is 10 ms away.
    const s = ping(180_000, SERVER_START, 40, 5, 60);
    expect(s.offsetMs).toBe(-180_010);
    expect(s.roundTripMs).toBe(100);
    expect(Math.abs(s.offsetMs - -180_000)).toBeLessThanOrEqual(uncertaintyMs(s));
  });

  it('symmetric trips give the exact offset', () => {
    const s = ping(-95_250, SERVER_START, 30, 2, 30);
    expect(s.offsetMs).toBe(95_250);
    expect(s.roundTripMs).toBe(60);
  });
});

describe('bestClockSample (Cristian: smallest round trip)', () => {
  it('keeps the sample with the smallest round trip', () => {
    const samples = [
      ping(120_000, SERVER_START, 150, 3, 150), // round trip 300
      ping(120_000, SERVER_START + 1000, 15, 3, 25), // round trip 40
      ping(120_000, SERVER_START + 2000, 40, 3, 80), // round trip 120
    ];
    const best = bestClockSample(samples);
    expect(best).toBe(samples[1]);
    expect(best?.roundTripMs).toBe(40);
    expect(best?.offsetMs).toBe(-120_005); // ((15 - 120000) + (18 - 120043)) / 2
  });

  it('is null without a usable sample, and skips negative round trips', () => {
    expect(bestClockSample([])).toBeNull();
    const broken: ClockSample = { offsetMs: 5, roundTripMs: -299_900 };
    expect(isUsableClockSample(broken)).toBe(false);
    expect(bestClockSample([broken])).toBeNull();
    expect(isUsableClockSample({ offsetMs: Number.NaN, roundTripMs: 10 })).toBe(false);
  });
});

describe('two screens on one clock', () => {
  it('device clocks 4 min ahead and 2.5 min behind give the same corrected time within 100 ms', () => {
    const aheadA = 4 * 60_000 + 137;
    const aheadB = -(2 * 60_000 + 30_000) + 42;
    // Several pings each, with uneven trips (Wi-Fi); each screen keeps its best.
    const a = bestClockSample([
      ping(aheadA, SERVER_START, 180, 4, 40),
      ping(aheadA, SERVER_START + 60_000, 22, 4, 31),
      ping(aheadA, SERVER_START + 120_000, 90, 4, 300),
    ]);
    const b = bestClockSample([
      ping(aheadB, SERVER_START + 500, 45, 2, 12),
      ping(aheadB, SERVER_START + 60_500, 400, 2, 35),
    ]);
    expect(a).not.toBeNull();
    expect(b).not.toBeNull();
    if (!a || !b) return;

    const trueNow = SERVER_START + 5 * 60_000;
    const shownA = correctedNow(trueNow + aheadA, a.offsetMs);
    const shownB = correctedNow(trueNow + aheadB, b.offsetMs);
    expect(Math.abs(shownA - shownB)).toBeLessThan(100);
    expect(Math.abs(shownA - trueNow)).toBeLessThanOrEqual(uncertaintyMs(a));
    expect(Math.abs(shownB - trueNow)).toBeLessThanOrEqual(uncertaintyMs(b));
    // Uncorrected, the two device clocks are 6.5 min apart.
    expect(Math.abs(trueNow + aheadA - (trueNow + aheadB))).toBeGreaterThan(6 * 60_000);
  });

  it('a device clock that jumps back 5 min: the ping across the jump is refused, a fresh one agrees again', () => {
    const aheadA = 90_000;
    const a = bestClockSample([ping(aheadA, SERVER_START, 20, 3, 20)]);

    // Device B starts 10 s ahead; its clock is set back 5 min while a ping is in flight.
    const before = 10_000;
    const after = before - 5 * 60_000;
    const sendAt = SERVER_START + 30_000;
    const t0 = sendAt + before;
    const t1 = sendAt + 25;
    const t2 = t1 + 3;
    const t3 = t2 + 25 + after; // received after the jump
    const across = clockSampleFromPing(t0, t1, t2, t3);
    expect(across.roundTripMs).toBe(50 - 300_000); // 25 + 25 ms on the wire, minus the 5-min jump
    const good = ping(before, SERVER_START, 25, 3, 25);
    expect(bestClockSample([good, across])).toBe(good); // the broken one is never picked

    // The screen notices the jump against its monotonic clock and drops its old samples.
    const jump = deviceClockJumpMs(
      { wallMs: SERVER_START + 40_000 + before, monotonicMs: 1_000_000 },
      { wallMs: SERVER_START + 41_000 + after, monotonicMs: 1_001_000 },
    );
    expect(jump).toBe(-300_000);

    // Had it kept the old offset, it would be 5 min wrong; a fresh ping puts it right.
    const trueNow = SERVER_START + 60_000;
    const stale = correctedNow(trueNow + after, good.offsetMs);
    expect(Math.abs(stale - trueNow)).toBeGreaterThan(4 * 60_000);
    const fresh = bestClockSample([ping(after, SERVER_START + 45_000, 25, 3, 31)]);
    expect(fresh).not.toBeNull();
    if (!a || !fresh) return;
    const shownA = correctedNow(trueNow + aheadA, a.offsetMs);
    const shownB = correctedNow(trueNow + after, fresh.offsetMs);
    expect(Math.abs(shownA - shownB)).toBeLessThan(100);
    expect(Math.abs(shownB - trueNow)).toBeLessThanOrEqual(uncertaintyMs(fresh));
  });

  it('deviceClockJumpMs is 0 when the wall clock keeps pace with the monotonic clock', () => {
    expect(deviceClockJumpMs({ wallMs: 5_000, monotonicMs: 100 }, { wallMs: 65_000, monotonicMs: 60_100 })).toBe(0);
    expect(deviceClockJumpMs({ wallMs: 5_000, monotonicMs: 100 }, { wallMs: 185_000, monotonicMs: 60_100 })).toBe(120_000);
  });
});
