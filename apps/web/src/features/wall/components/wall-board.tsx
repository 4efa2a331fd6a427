import { Box, Flex, Grid, Stack, Text } from '@chakra-ui/react';
import {
  compressionReading,
  epinephrineReading,
  formatElapsedMs,
  REMINDER_CAUTION,
  rhythmReading,
  stateAt,
  type Reading,
} from '@steadyhand/shared';
import { Link as RouterLink } from 'react-router';
import { Shape } from '../../../components/ui/shapes';
import { paths } from '../../../config/paths';
import { useCodeTimeline } from '../../../lib/live/use-code-timeline';
import { useLiveCode } from '../../../lib/live/use-live-code';
import { useSecondTick } from '../../../lib/live/use-second-tick';
import { useBoardCodes, type BoardCode } from '../api/get-live-codes';
import { WALL_TONES } from './wall-parts';
import { linkReading } from './wall-screen';

/** Every live code as a card: where, how long, and what is due; each card opens its wall. */
export function WallBoard() {
  const codes = useBoardCodes();
  return (
    <Stack gap="4" p="5" data-testid="wall-board">
      <Flex justify="space-between" align="baseline" wrap="wrap" gap="3">
        <Text as="h1" fontSize="3rem" fontWeight="bold">
          Live codes
        </Text>
        <Text fontSize="1.5rem">{codes.data ? `${codes.data.length} running` : ''}</Text>
      </Flex>
      {codes.isPending ? (
        <Text fontSize="2rem" role="status">
          Looking for codes in progress…
        </Text>
      ) : codes.data && codes.data.length > 0 ? (
        <Grid templateColumns="repeat(auto-fill, minmax(36rem, 1fr))" gap="4">
          {codes.data.map((c) => (
            <BoardCard key={c.id} item={c} />
          ))}
        </Grid>
      ) : codes.isError && !codes.data ? (
        <Text fontSize="2rem" role="alert">
          The list of live codes could not be loaded: {codes.error.message}
        </Text>
      ) : (
        <Text fontSize="2rem" data-testid="wall-board-empty">
          No codes are running right now.
        </Text>
      )}
      {codes.isError && codes.data ? (
        <Flex align="center" gap="3" bg="alarm.600" borderRadius="l3" px="4" py="2" role="alert">
          <Shape kind="octagon" size="2.4rem" />
          <Text fontSize="1.8rem" fontWeight="bold">
            Not connected — this list may be out of date
          </Text>
        </Flex>
      ) : null}
      <Text fontSize="1.2rem" fontWeight="bold">
        {REMINDER_CAUTION}
      </Text>
    </Stack>
  );
}

function StateLine({ label, reading }: { label: string; reading: Reading }) {
  const c = WALL_TONES[reading.tone];
  return (
    <Flex align="center" gap="3" bg={c.bg} color={c.fg} borderRadius="l2" px="3" py="1" minW="0">
      {reading.shape ? <Shape kind={reading.shape} size="2rem" /> : null}
      <Text fontSize="1.6rem" fontWeight="bold" flexShrink={0}>
        {label}
      </Text>
      <Text fontSize="1.8rem" fontWeight="black" truncate flex="1">
        {reading.word}
      </Text>
      <Text fontSize="2rem" fontWeight="bold" fontVariantNumeric="tabular-nums" flexShrink={0}>
        {reading.value}
      </Text>
    </Flex>
  );
}

function BoardCard({ item }: { item: BoardCode }) {
  const live = useLiveCode(item.id);
  const nowMs = useSecondTick(live.clock.correctedNow);
  const code = live.code;
  const timeline = useCodeTimeline(code, live.protocol, live.entries);
  const s = timeline ? stateAt(timeline, nowMs, { recentCount: 0 }) : null;
  const link = linkReading(live.sync, nowMs, live.clock.offsetMs);
  const where = item.location ?? 'Location not yet recorded';
  return (
    <Box
      asChild
      display="block"
      bg="ink.900"
      color="white"
      borderWidth="3px"
      borderColor="ink.500"
      borderRadius="l3"
      p="4"
      _hover={{ borderColor: 'seaglass.300' }}
      _focusVisible={{ outline: '4px solid', outlineColor: 'seaglass.300' }}
      data-testid="wall-board-card"
      data-code-id={item.id}
    >
      <RouterLink to={paths.codes.wall.getHref(item.id)} aria-label={`Timer wall for the code at ${where}`}>
        <Flex justify="space-between" align="baseline" gap="3">
          <Text fontSize="2rem" fontWeight="bold" truncate>
            {where}
          </Text>
          <Text fontSize="1.4rem" fontWeight="bold" flexShrink={0}>
            {item.category === 'pediatric' ? 'Pediatric' : 'Adult'}
          </Text>
        </Flex>
        <Flex align="baseline" gap="3">
          <Text fontSize="5rem" fontWeight="bold" lineHeight="1.05" fontVariantNumeric="tabular-nums">
            {formatElapsedMs(Math.max(0, (s?.clockMs ?? nowMs) - Date.parse(item.arrestAt)))}
          </Text>
          <Text fontSize="1.6rem">since arrest</Text>
        </Flex>
        {s ? (
          <Stack gap="2" mt="1">
            <StateLine label="Compressions" reading={compressionReading(s)} />
            <StateLine label="Epinephrine" reading={epinephrineReading(s)} />
            <Text fontSize="1.6rem" fontWeight="bold">
              Rhythm {s.rhythm.current ? rhythmReading(s).value : 'not checked yet'} · Shocks {s.shocks.count}
              {s.reminders.length > 0 ? ` · ${s.reminders.length} reminder${s.reminders.length === 1 ? '' : 's'}` : ''}
            </Text>
          </Stack>
        ) : (
          <Text fontSize="1.6rem">Opening…</Text>
        )}
        {link.stale ? (
          <Flex align="center" gap="2" mt="2" fontSize="1.5rem" fontWeight="bold">
            <Shape kind="octagon" size="1.8rem" color="alarm.400" /> Not connected
          </Flex>
        ) : null}
      </RouterLink>
    </Box>
  );
}
