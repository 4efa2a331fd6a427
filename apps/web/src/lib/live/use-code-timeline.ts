import { foldLog, type Code, type LogEntry, type ProtocolSettings, type Timeline } from '@steadyhand/shared';
import { useMemo } from 'react';

/**
 * A code's log folded once per change (the clinical core's first step); every screen of the code
 * reads its moment from this with stateAt, once a second, so the pad and the wall agree.
 */
export function useCodeTimeline(code: Code, protocol: ProtocolSettings, entries: readonly LogEntry[]): Timeline;
export function useCodeTimeline(code: Code | null, protocol: ProtocolSettings | null, entries: readonly LogEntry[]): Timeline | null;
export function useCodeTimeline(code: Code | null, protocol: ProtocolSettings | null, entries: readonly LogEntry[]): Timeline | null {
  return useMemo(() => (code && protocol ? foldLog(code, entries, protocol) : null), [code, protocol, entries]);
}

/** The latest moment the log speaks of: counts (doses, shocks) include every entry up to here. */
export function lastMoment(timeline: Timeline): number {
  return Math.max(timeline.lastEntryMs, timeline.end?.atMs ?? 0);
}
