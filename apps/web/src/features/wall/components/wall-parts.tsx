import { Box, Flex, Stack, Text } from '@chakra-ui/react';
import type { ReactNode } from 'react';
import { Shape, type ShapeKind } from '../../../components/ui/shapes';
import type { Reading as WallReading, ReadingTone as WallTone } from '@steadyhand/shared';

/** High contrast on a dark room-facing screen; the word and shape always repeat the colour. */
export const WALL_TONES: Record<WallTone, { bg: string; fg: string; border: string }> = {
  calm: { bg: 'ink.900', fg: 'white', border: 'ink.600' },
  ok: { bg: 'seaglass.800', fg: 'white', border: 'seaglass.400' },
  due: { bg: 'signal.300', fg: 'ink.950', border: 'signal.100' },
  overdue: { bg: 'alarm.600', fg: 'white', border: 'white' },
};

export function PanelLabel({ children }: { children: ReactNode }) {
  return (
    <Text fontSize="1.6rem" fontWeight="bold" textTransform="uppercase" letterSpacing="wider" opacity={0.9}>
      {children}
    </Text>
  );
}

/** One big clock block: label, the state word with its shape, a very large value, a note. */
export function ReadingBlock({
  label,
  reading,
  testId,
  valueSize = '8rem',
}: {
  label: string;
  reading: WallReading;
  testId: string;
  valueSize?: string;
}) {
  const c = WALL_TONES[reading.tone];
  return (
    <Stack
      gap="1"
      bg={c.bg}
      color={c.fg}
      borderWidth="4px"
      borderColor={c.border}
      borderRadius="l3"
      px="5"
      py="3"
      minW="0"
      data-testid={testId}
      data-tone={reading.tone}
      data-state={reading.word}
      role="group"
      aria-label={`${label}: ${reading.word}, ${reading.value}`}
    >
      <Flex justify="space-between" align="center" gap="3">
        <PanelLabel>{label}</PanelLabel>
        <WordBadge word={reading.word} shape={reading.shape} />
      </Flex>
      <Text
        fontSize={valueSize}
        fontWeight="bold"
        lineHeight="1"
        fontVariantNumeric="tabular-nums"
        truncate
      >
        {reading.value}
      </Text>
      <Text fontSize="2.1rem" fontWeight="bold" lineHeight="1.15" truncate>
        {reading.note}
      </Text>
    </Stack>
  );
}

export function WordBadge({ word, shape }: { word: string; shape: ShapeKind | null }) {
  return (
    <Flex align="center" gap="2" flexShrink={0}>
      {shape ? <Shape kind={shape} size="2.6rem" /> : null}
      <Text fontSize="2.6rem" fontWeight="black" letterSpacing="wide" lineHeight="1">
        {word}
      </Text>
    </Flex>
  );
}

/** A smaller fact: label over a large value, with a note. */
export function FactBlock({
  label,
  value,
  note,
  testId,
}: {
  label: string;
  value: ReactNode;
  note?: ReactNode;
  testId: string;
}) {
  return (
    <Stack
      gap="0"
      bg="ink.900"
      borderWidth="2px"
      borderColor="ink.600"
      borderRadius="l3"
      px="4"
      py="2"
      minW="0"
      data-testid={testId}
    >
      <PanelLabel>{label}</PanelLabel>
      <Text fontSize="4rem" fontWeight="bold" lineHeight="1.05" fontVariantNumeric="tabular-nums" truncate>
        {value}
      </Text>
      {note ? (
        <Text fontSize="1.6rem" fontWeight="bold" lineHeight="1.2" truncate>
          {note}
        </Text>
      ) : null}
    </Stack>
  );
}

export function WallBox({ children, testId }: { children: ReactNode; testId?: string }) {
  return (
    <Box bg="ink.900" borderWidth="2px" borderColor="ink.600" borderRadius="l3" px="4" py="3" minW="0" data-testid={testId}>
      {children}
    </Box>
  );
}
