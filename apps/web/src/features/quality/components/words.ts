import type { Outcome, QualityTargetId, Rhythm } from '@steadyhand/shared';

export const RHYTHM_WORDS: Record<Rhythm, string> = {
  vf: 'VF',
  pvt: 'pVT',
  pea: 'PEA',
  asystole: 'Asystole',
  organized: 'Organised rhythm',
  other: 'Other',
};

export const OUTCOME_WORDS: Record<Outcome, string> = {
  'sustained-rosc': 'Sustained ROSC',
  died: 'Died',
  transferred: 'Transferred',
  other: 'Other',
};

export const TARGET_WORDS: Record<QualityTargetId, string> = {
  'time-to-shock': 'Shock within 2 min',
  'time-to-epinephrine': 'Epinephrine within 5 min',
  'compression-fraction': 'Compression fraction 80%+',
  'pre-shock-pause': 'Pre-shock pauses under 10 s',
};

/** "1:42"; a dash when not recorded. */
export function formatSeconds(s: number | null | undefined): string {
  if (s === null || s === undefined) return '—';
  const total = Math.round(s);
  return `${Math.floor(total / 60)}:${String(total % 60).padStart(2, '0')}`;
}

export function formatPercent(ratio: number | null | undefined): string {
  return ratio === null || ratio === undefined ? '—' : `${Math.round(ratio * 100)}%`;
}

export function formatDateTime(iso: string | null | undefined): string {
  if (!iso) return '—';
  return new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' });
}
