import { DataList } from '@chakra-ui/react';
import { flaggedDoseText, SUMMARY_DEFINITIONS, type CodeSummary } from '@steadyhand/shared';
import { formatDateTime, formatPercent, formatSeconds } from '../lib/format';
import { OUTCOME_WORDS, RHYTHM_WORDS } from '../lib/live/entry-words';

/** The record's summary (review, quality): Utstein intervals, rhythm, ROSC, CPR quality; each fact's definition on hover. */
export function SummaryFacts({ summary }: { summary: CodeSummary }) {
  const facts: [string, string, string][] = [
    ['Arrest recognised', formatDateTime(summary.times.arrestAt), SUMMARY_DEFINITIONS.arrestAt],
    ['To first compressions', formatSeconds(summary.intervals.arrestToFirstCompressions), SUMMARY_DEFINITIONS.arrestToFirstCompressions],
    ['To first rhythm check', formatSeconds(summary.intervals.arrestToFirstRhythmAnalysis), SUMMARY_DEFINITIONS.arrestToFirstRhythmAnalysis],
    ['To first shock', formatSeconds(summary.intervals.arrestToFirstShock), SUMMARY_DEFINITIONS.arrestToFirstShock],
    ['To first epinephrine', formatSeconds(summary.intervals.arrestToFirstEpinephrine), SUMMARY_DEFINITIONS.arrestToFirstEpinephrine],
    ['To first ROSC', formatSeconds(summary.intervals.arrestToFirstRosc), SUMMARY_DEFINITIONS.arrestToFirstRosc],
    ['Duration', formatSeconds(summary.durationSeconds), SUMMARY_DEFINITIONS.durationSeconds],
    ['First rhythm', summary.firstRhythm ? RHYTHM_WORDS[summary.firstRhythm] : 'None recorded', SUMMARY_DEFINITIONS.firstRhythm],
    ['Any ROSC', summary.anyRosc ? 'Yes' : 'No', SUMMARY_DEFINITIONS.anyRosc],
    ['Sustained ROSC', summary.sustainedRoscText, SUMMARY_DEFINITIONS.sustainedRosc],
    ['Outcome', summary.outcome ? OUTCOME_WORDS[summary.outcome] : '—', SUMMARY_DEFINITIONS.outcome],
    ['Compression fraction (from taps)', formatPercent(summary.compressionFraction), SUMMARY_DEFINITIONS.compressionFraction],
    ['Longest pause', summary.longestPause ? `${Math.round(summary.longestPause.seconds)} s` : '—', SUMMARY_DEFINITIONS.longestPause],
    ['Pauses over 10 s', String(summary.longPauses.length), SUMMARY_DEFINITIONS.longPauses],
    ['Shocks', summary.shocks.map((s) => `${s.joules} J${s.synchronized ? ' synchronised' : ''}`).join(', ') || 'None', SUMMARY_DEFINITIONS.shocks],
    ['Doses to check', summary.flaggedDoses.map(flaggedDoseText).join('; ') || 'None', SUMMARY_DEFINITIONS.flaggedDoses],
    ['Protocol', `Version ${summary.protocolVersion ?? 1}: ${summary.protocolEdition}`, SUMMARY_DEFINITIONS.protocolVersion],
    ['Drugs', summary.drugTotals.map((d) => `${d.label} ${d.total} ${d.unit} (${d.doses})`).join('; ') || 'None', SUMMARY_DEFINITIONS.drugTotals],
  ];
  return (
    // The list itself is the grid: a <dl> may hold only its items (axe: definition-list).
    <DataList.Root
      orientation="horizontal"
      size="lg"
      data-testid="code-summary"
      display="grid"
      gridTemplateColumns={{ base: 'minmax(0, 1fr)', md: 'repeat(2, minmax(0, 1fr))' }}
      columnGap="8"
      rowGap="3"
    >
        {facts.map(([label, value, definition]) => (
          <DataList.Item key={label} title={definition}>
            <DataList.ItemLabel minW="12rem">{label}</DataList.ItemLabel>
            <DataList.ItemValue fontWeight="bold">{value}</DataList.ItemValue>
          </DataList.Item>
        ))}
    </DataList.Root>
  );
}
