import {
  doseUnitLabel,
  OUTCOME_WORDS,
  PAUSE_WORDS,
  RHYTHM_WORDS,
  type LogEntry,
  type ProtocolSettings,
} from '@steadyhand/shared';

/** The words the pad and the recent list use. Clinical words are the trade's own. */

// The clinical words the strip, the wall and the record share live with the core.
export { OUTCOME_WORDS, PAUSE_WORDS, RHYTHM_WORDS } from '@steadyhand/shared';

export const ROUTE_WORDS = { iv: 'IV', io: 'IO', et: 'ET', other: 'other route' } as const;

export const AIRWAY_WORDS = {
  'bag-mask': 'Bag-mask',
  supraglottic: 'Supraglottic airway',
  endotracheal: 'Endotracheal tube',
} as const;


export function formatDose(dose: number): string {
  return String(Number(dose.toPrecision(6)));
}

export function drugLabel(protocol: ProtocolSettings | null, key: string): string {
  return protocol?.drugs.find((d) => d.key === key)?.label ?? key;
}

/** One line per entry: what happened, in words a second reader understands at a glance. */
export function describeEntry(
  entry: LogEntry,
  protocol: ProtocolSettings | null,
  byId?: ReadonlyMap<string, LogEntry>,
): string {
  switch (entry.kind) {
    case 'cpr':
      if (entry.action === 'start') return 'Compressions started';
      if (entry.action === 'swap') return 'Compressor swapped';
      return entry.reason
        ? `Compressions paused for ${PAUSE_WORDS[entry.reason]}`
        : 'Compressions paused';
    case 'rhythm':
      return `Rhythm ${RHYTHM_WORDS[entry.rhythm]}, ${entry.pulse ? 'pulse present' : 'no pulse'}`;
    case 'shock':
      return `${entry.synchronized ? 'Synchronised shock' : 'Shock'} ${formatDose(entry.joules)} J`;
    case 'drug':
      return `${drugLabel(protocol, entry.drug)} ${formatDose(entry.dose)} ${doseUnitLabel(entry.unit)} ${ROUTE_WORDS[entry.route]}`;
    case 'airway':
      return `${AIRWAY_WORDS[entry.device]}${entry.confirmation === 'waveform-capnography' ? ', confirmed by waveform capnography' : entry.confirmation ? `, confirmed (${entry.confirmation})` : ''}`;
    case 'access':
      return `${entry.route.toUpperCase()} access${entry.site ? ` (${entry.site})` : ''}`;
    case 'etco2':
      return `ETCO2 ${formatDose(entry.mmHg)} mmHg`;
    case 'lab':
      return `${entry.name} ${entry.value} ${entry.unit}`;
    case 'rosc':
      return 'ROSC';
    case 'rearrest':
      return 'Re-arrest';
    case 'note':
      return `Note: ${entry.text}`;
    case 'end':
      return `Code ended: ${OUTCOME_WORDS[entry.outcome]}`;
    case 'void': {
      const target = byId?.get(entry.target);
      return `Voided${target ? ` "${describeEntry(target, protocol, byId)}"` : ''}: ${entry.reason}`;
    }
    case 'amend': {
      const target = byId?.get(entry.target);
      return `Corrected${target ? ` "${describeEntry(target, protocol, byId)}"` : ''}: ${entry.reason}`;
    }
  }
}
