import { Box, Flex, Grid, Text } from '@chakra-ui/react';
import {
  deriveLiveStateFromLive,
  formatElapsedMs,
  type Code,
  type EffectiveEntry,
  type LiveState,
  type ProtocolSettings,
} from '@steadyhand/shared';
import type { ReactNode } from 'react';
import type { LiveSyncState } from '../../../lib/live/use-live-code';
import { useSecondTick } from '../../../lib/live/use-second-tick';
import { PAUSE_WORDS, RHYTHM_WORDS } from '../../../lib/live/entry-words';
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
      px={{ base: '2', md: '3' }}
      py={{ base: '1', md: '2' }}
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
          textStyle={{ base: 'xl', md: '2xl' }}
          fontWeight="bold"
          lineHeight="1.1"
          fontVariantNumeric="tabular-nums"
          truncate
        >
          {value}
        </Text>
      </Flex>
      {note ? (
        <Text textStyle="sm" fontWeight="bold" lineHeight="1.2" truncate>
          {note}
        </Text>
      ) : null}
    </Box>
  );
}

function cycleTile(s: LiveState): { value: string; note: string; tone: Tone; shape?: ShapeKind } {
  if (s.status === 'ended') return { value: 'Ended', note: 'Clocks stopped', tone: 'calm' };
  if (s.status === 'rosc')
    return {
      value: `ROSC ${formatElapsedMs(s.roscElapsedMs ?? 0)}`,
      note: 'Compressions stopped',
      tone: 'ok',
    };
  const c = s.compressions;
  if (c.cycle) {
    const left = c.cycle.checkCountdownMs;
    if (left < 0)
      return {
        value: `+${formatElapsedMs(left)}`,
        note: `Rhythm check OVERDUE · cycle ${c.cycle.number}`,
        tone: 'overdue',
        shape: 'octagon',
      };
    const shown = formatElapsedMs(Math.ceil(left / 1000) * 1000);
    if (left <= 15_000)
      return {
        value: shown,
        note: `Rhythm check DUE · cycle ${c.cycle.number}`,
        tone: 'due',
        shape: 'triangle',
      };
    return { value: shown, note: `to check · cycle ${c.cycle.number}`, tone: 'calm' };
  }
  if (c.pause) {
    const why = c.pause.reason ? ` for ${PAUSE_WORDS[c.pause.reason]}` : '';
    return c.pause.tooLong
      ? {
          value: `Paused ${formatElapsedMs(c.pause.lengthMs)}`,
          note: `TOO LONG${why}: resume compressions`,
          tone: 'overdue',
          shape: 'octagon',
        }
      : {
          value: `Paused ${formatElapsedMs(c.pause.lengthMs)}`,
          note: `Compressions paused${why}`,
          tone: 'due',
          shape: 'triangle',
        };
  }
  return { value: 'Not started', note: 'No compressions yet', tone: 'calm', shape: 'ring' };
}

function epiTile(s: LiveState): { value: string; note: string; tone: Tone; shape?: ShapeKind } {
  const e = s.epinephrine;
  if (e.sinceLastMs === null)
    return { value: 'None yet', note: 'No epinephrine given', tone: 'calm', shape: 'ring' };
  const since = formatElapsedMs(e.sinceLastMs);
  if (s.status !== 'arrest')
    return { value: since, note: `since last dose (${e.doseCount} given)`, tone: 'calm' };
  if (e.state === 'overdue')
    return {
      value: since,
      note: `OVERDUE since last dose (${e.doseCount} given)`,
      tone: 'overdue',
      shape: 'octagon',
    };
  if (e.state === 'due')
    return { value: since, note: `DUE now (${e.doseCount} given)`, tone: 'due', shape: 'triangle' };
  const dueIn = (e.dueFromMs ?? 0) - s.clockMs;
  return {
    value: since,
    note: `since last · due in ${formatElapsedMs(Math.max(0, Math.ceil(dueIn / 1000) * 1000))}`,
    tone: 'calm',
    shape: 'ring',
  };
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

/**
 * The strip that never scrolls away: arrest clock, cycle countdown, epinephrine clock, rhythm,
 * shocks, and whether every tap has reached the server. Re-rendered once a second from the
 * corrected clock; the log's expensive part (liveEntries) is computed once per change above.
 */
export function StatusStrip({
  code,
  protocol,
  live,
  sync,
  correctedNow,
}: {
  code: Code;
  protocol: ProtocolSettings;
  live: readonly EffectiveEntry[];
  sync: LiveSyncState;
  correctedNow: () => number;
}) {
  const nowMs = useSecondTick(correctedNow);
  const s = deriveLiveStateFromLive({ code, settings: protocol, nowMs, liveEntries: live });
  const cycle = cycleTile(s);
  const epi = epiTile(s);
  const rhythm = s.rhythm.current;
  return (
    <Box
      position="sticky"
      top="0"
      zIndex="sticky"
      bg="ink.950"
      mx={{ base: '-3', md: '0' }}
      px="2"
      py="2"
      borderRadius={{ base: '0', md: 'l3' }}
      data-testid="status-strip"
    >
      <Grid
        templateColumns={{
          base: 'repeat(3, minmax(0, 1fr))',
          lg: '1.1fr 1.3fr 1.5fr 1fr 0.9fr 1.2fr',
        }}
        gap="2"
      >
        <Tile
          label="Since arrest"
          value={formatElapsedMs(s.arrestElapsedMs)}
          note={
            s.status === 'ended'
              ? 'Code ended'
              : s.status === 'rosc'
                ? 'ROSC now'
                : 'Arrest running'
          }
          testId="clock-arrest"
        />
        <Tile
          label="Compression cycle"
          value={cycle.value}
          note={cycle.note}
          tone={cycle.tone}
          shape={cycle.shape}
          testId="clock-cycle"
        />
        <Tile
          label="Epinephrine"
          value={epi.value}
          note={epi.note}
          tone={epi.tone}
          shape={epi.shape}
          testId="clock-epi"
        />
        <Tile
          label="Rhythm"
          value={rhythm ? RHYTHM_WORDS[rhythm.rhythm] : '—'}
          note={rhythm ? (rhythm.pulse ? 'Pulse present' : 'No pulse') : 'Not checked yet'}
          testId="state-rhythm"
        />
        <Tile
          label="Shocks"
          value={String(s.shocks.count)}
          note={
            s.shocks.lastJoules !== null
              ? `Last ${s.shocks.lastJoules} J${s.shocks.lastSynchronized ? ' sync' : ''}`
              : 'None yet'
          }
          testId="state-shocks"
        />
        <SyncTile sync={sync} />
      </Grid>
    </Box>
  );
}
