import { Box, Flex, Grid, Stack, Text } from '@chakra-ui/react';
import {
  REMINDER_WORDS,
  stateAt,
  stateReadings,
  type Reading,
  type ReadingTone,
  type Reminder,
  type Timeline,
} from '@steadyhand/shared';
import type { ReactNode } from 'react';
import type { LiveSyncState } from '../../../lib/live/use-live-code';
import { useSecondTick } from '../../../lib/live/use-second-tick';
import { Shape, type ShapeKind } from '../../../components/ui/shapes';

type Tone = 'calm' | 'due' | 'overdue' | 'ok';

const TONE_COLORS: Record<Tone, { bg: string; fg: string }> = {
  calm: { bg: 'ink.800', fg: 'white' },
  ok: { bg: 'seaglass.800', fg: 'white' },
  due: { bg: 'signal.300', fg: 'ink.950' },
  overdue: { bg: 'alarm.600', fg: 'white' },
};

function Tile({
  label,
  value,
  note,
  tone = 'calm',
  shape,
  testId,
  span,
}: {
  label: string;
  value: ReactNode;
  note?: ReactNode;
  tone?: Tone;
  shape?: ShapeKind;
  testId: string;
  span?: number;
}) {
  const c = TONE_COLORS[tone];
  return (
    <Box
      bg={c.bg}
      color={c.fg}
      borderRadius="l2"
      px="2"
      py="1"
      minW="0"
      data-testid={testId}
      data-tone={tone}
      gridColumn={span ? `span ${span}` : undefined}
    >
      <Text
        textStyle="xs"
        fontWeight="bold"
        textTransform="uppercase"
        letterSpacing="wider"
        opacity={0.85}
      >
        {label}
      </Text>
      <Flex align="center" gap="2">
        {shape ? <Shape kind={shape} size="1.5em" /> : null}
        <Text
          textStyle="xl"
          fontWeight="bold"
          lineHeight="1.1"
          fontVariantNumeric="tabular-nums"
          truncate
        >
          {value}
        </Text>
      </Flex>
      {note ? (
        <Text textStyle="xs" fontWeight="bold" lineHeight="1.2" truncate>
          {note}
        </Text>
      ) : null}
    </Box>
  );
}

export function SyncTile({ sync }: { sync: LiveSyncState }) {
  let value: string;
  let note: string;
  let tone: Tone;
  let shape: ShapeKind;
  if (sync.failedCount > 0) {
    value = `${sync.failedCount} not saved`;
    note = 'Refused by the server: see the list';
    tone = 'overdue';
    shape = 'cross';
  } else if (!sync.connected) {
    value = sync.waiting > 0 ? `${sync.waiting} waiting` : 'Offline';
    note = 'Offline — taps are kept on this tablet';
    tone = 'due';
    shape = sync.waiting > 0 ? 'clock' : 'triangle';
  } else if (sync.waiting > 0) {
    value = `${sync.waiting} waiting`;
    note = 'Sending to the server…';
    tone = sync.alarm ? 'overdue' : 'calm';
    shape = 'clock';
  } else {
    value = 'All saved';
    note = 'Every tap is on the server';
    tone = 'ok';
    shape = 'check';
  }
  return (
    <Box
      role="status"
      aria-live="polite"
      aria-atomic="true"
      data-testid="sync-state"
      data-waiting={sync.waiting}
      data-connected={String(sync.connected)}
    >
      <Tile label="Saving" value={value} note={note} tone={tone} shape={shape} testId="sync-tile" />
    </Box>
  );
}

const TONE_OF: Record<ReadingTone, Tone> = { calm: 'calm', ok: 'ok', due: 'due', overdue: 'overdue' };

function ReadingTile({ label, reading, testId }: { label: string; reading: Reading; testId: string }) {
  return (
    <Tile
      label={label}
      value={reading.value}
      note={`${reading.word} · ${reading.note}`}
      tone={TONE_OF[reading.tone]}
      shape={reading.shape ?? undefined}
      testId={testId}
    />
  );
}

const SEVERITY_TONE: Record<Reminder['severity'], Tone> = { urgent: 'overdue', attention: 'due', info: 'calm' };
const SEVERITY_SHAPE: Record<Reminder['severity'], ShapeKind> = { urgent: 'octagon', attention: 'triangle', info: 'ring' };

/** Reminders the tiles do not already carry (drug sequence, capnography, child weight), most urgent first. */
function ReminderBar({ reminders, warning }: { reminders: readonly Reminder[]; warning: string | null }) {
  const shown = reminders.filter((r) => r.kind !== 'rhythm-check' && r.kind !== 'pause' && r.kind !== 'epinephrine');
  if (shown.length === 0 && !warning) return null;
  return (
    <Stack gap="1" mt="1.5" data-testid="pad-reminders" aria-live="polite">
      {warning ? <ReminderLine tone="due" shape="triangle" word="CHECK" text={warning} testId="pad-category-warning" /> : null}
      {shown.map((r) => (
        <ReminderLine key={r.kind} tone={SEVERITY_TONE[r.severity]} shape={SEVERITY_SHAPE[r.severity]} word={REMINDER_WORDS[r.state]} text={r.message} testId={`pad-reminder-${r.kind}`} />
      ))}
    </Stack>
  );
}

function ReminderLine({ tone, shape, word, text, testId }: { tone: Tone; shape: ShapeKind; word: string; text: string; testId: string }) {
  const c = TONE_COLORS[tone];
  return (
    <Flex bg={c.bg} color={c.fg} borderRadius="l2" px="2" py="0.5" gap="2" align="center" data-testid={testId}>
      <Shape kind={shape} size="1.2em" />
      <Text textStyle="xs" fontWeight="black" flexShrink={0}>
        {word}
      </Text>
      <Text textStyle="xs" fontWeight="bold" lineHeight="1.2">
        {text}
      </Text>
    </Flex>
  );
}

/**
 * The strip that never scrolls away: arrest clock, cycle countdown, epinephrine clock, rhythm,
 * shocks, whether every tap has reached the server, and the reminders. Its words are the wall's
 * words (stateReadings), read once a second from the one fold of the log.
 */
export function StatusStrip({
  timeline,
  sync,
  correctedNow,
}: {
  timeline: Timeline;
  sync: LiveSyncState;
  correctedNow: () => number;
}) {
  const nowMs = useSecondTick(correctedNow);
  const s = stateAt(timeline, nowMs, { recentCount: 0 });
  const r = stateReadings(s);
  return (
    <Box
      position={{ base: 'sticky', md: 'static' }}
      top="0"
      zIndex="sticky"
      bg="ink.950"
      mx={{ base: '-3', md: '0' }}
      p="1.5"
      borderRadius={{ base: '0', md: 'l3' }}
      data-testid="status-strip"
    >
      <Grid
        templateColumns={{
          base: 'repeat(3, minmax(0, 1fr))',
          md: '1.1fr 1.3fr 1.5fr 1fr 0.9fr 1.2fr',
          lg: 'repeat(2, minmax(0, 1fr))',
        }}
        gap="1.5"
      >
        <ReadingTile label="Since arrest" reading={r.arrest} testId="clock-arrest" />
        <ReadingTile label="Compression cycle" reading={r.compressions} testId="clock-cycle" />
        <ReadingTile label="Epinephrine" reading={r.epinephrine} testId="clock-epi" />
        <ReadingTile label="Rhythm" reading={r.rhythm} testId="state-rhythm" />
        <ReadingTile label="Shocks" reading={r.shocks} testId="state-shocks" />
        <SyncTile sync={sync} />
      </Grid>
      <ReminderBar reminders={s.reminders} warning={s.categoryWarning} />
    </Box>
  );
}
