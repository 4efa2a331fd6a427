import type { LogEntry } from './effective-log.js';
import type { CPR_STOP_REASONS, DoseUnit, Outcome, Rhythm } from './entries.js';

/**
 * Builders for entry logs in tests: times are offsets from an arrest at 07:42:10 (the demo
 * scenario's clock time, invented), written t(min, sec). Not part of the build.
 */

// tsconfig has no DOM or Node types; the Web Crypto global exists in Node and browsers.
export const uuid = (): string => (globalThis as unknown as { crypto: { randomUUID(): string } }).crypto.randomUUID();

export const ARREST_MS = Date.parse('2026-03-04T07:42:10.000Z');
export const S = 1000;
export const MIN = 60 * S;
export const t = (min: number, sec = 0): number => min * MIN + sec * S;
export const iso = (offsetMs: number): string => new Date(ARREST_MS + offsetMs).toISOString();
export const abs = (offsetMs: number): number => ARREST_MS + offsetMs;
const base = (offsetMs: number) => ({ id: uuid(), at: iso(offsetMs) });

type StopReason = (typeof CPR_STOP_REASONS)[number];

export const cprStart = (at: number): LogEntry => ({ ...base(at), kind: 'cpr', action: 'start' });
export const cprStop = (at: number, reason?: StopReason): LogEntry =>
  reason ? { ...base(at), kind: 'cpr', action: 'stop', reason } : { ...base(at), kind: 'cpr', action: 'stop' };
export const swap = (at: number): LogEntry => ({ ...base(at), kind: 'cpr', action: 'swap' });
export const rhythm = (at: number, r: Rhythm, pulse = false): LogEntry => ({ ...base(at), kind: 'rhythm', rhythm: r, pulse });
export const shock = (at: number, joules: number, synchronized = false): LogEntry => ({ ...base(at), kind: 'shock', joules, synchronized });
export const drug = (at: number, name: string, dose: number, unit: DoseUnit = 'mg'): LogEntry => ({
  ...base(at),
  kind: 'drug',
  drug: name,
  dose,
  unit,
  route: 'iv',
});
export const epi = (at: number, dose = 1): LogEntry => drug(at, 'epinephrine', dose);
export const etco2 = (at: number, mmHg: number): LogEntry => ({ ...base(at), kind: 'etco2', mmHg });
export const rosc = (at: number): LogEntry => ({ ...base(at), kind: 'rosc' });
export const rearrest = (at: number): LogEntry => ({ ...base(at), kind: 'rearrest' });
export const end = (at: number, outcome: Outcome = 'rosc'): LogEntry => ({ ...base(at), kind: 'end', outcome });
export const note = (at: number, text: string): LogEntry => ({ ...base(at), kind: 'note', text });
export const voidOf = (at: number, target: LogEntry): LogEntry => ({ ...base(at), kind: 'void', target: target.id, reason: 'tapped by mistake' });
export const amendOf = (at: number, target: LogEntry, changes: Record<string, unknown>): LogEntry => ({
  ...base(at),
  kind: 'amend',
  target: target.id,
  changes,
  reason: 'corrected after the code',
});

export const adultCode = (weightKg: number | null = null) => ({ arrestAt: iso(0), category: 'adult' as const, weightKg });
export const childCode = (weightKg: number | null) => ({ arrestAt: iso(0), category: 'pediatric' as const, weightKg });
