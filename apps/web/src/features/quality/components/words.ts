import type { QualityTargetId } from '@steadyhand/shared';

// The clinical words and number formats are the same on every screen.
export { OUTCOME_WORDS, RHYTHM_WORDS } from '../../../lib/live/entry-words';
export { formatDateTime, formatPercent, formatSeconds } from '../../../lib/format';

export const TARGET_WORDS: Record<QualityTargetId, string> = {
  'time-to-shock': 'Shock within 2 min',
  'time-to-epinephrine': 'Epinephrine within 5 min',
  'compression-fraction': 'Compression fraction 80%+',
  'pre-shock-pause': 'Pre-shock pauses under 10 s',
};
