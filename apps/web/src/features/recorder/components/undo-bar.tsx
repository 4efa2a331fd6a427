import { Box, Button, Flex, Text } from '@chakra-ui/react';
import type { NewEntry, ProtocolSettings } from '@steadyhand/shared';
import { useEffect, useState } from 'react';
import { describeEntry } from '../../../lib/live/entry-words';
import { Shape } from '../../../components/ui/shapes';

export const UNDO_WINDOW_MS = 5_000;

export interface LastTap {
  entry: NewEntry;
  /** Device time (Date.now) until which Undo is offered. */
  undoUntil: number;
  /** Until when a drug's dose and route can be changed from here (later: from the review). */
  editUntil: number;
}

/**
 * What the last tap recorded, with Undo for five seconds and, for a drug, a way to change the
 * dose or route. Sits where the eye already is (above the latest entries).
 */
export function UndoBar({
  tap,
  protocol,
  onUndo,
  onChangeDose,
}: {
  tap: LastTap | null;
  protocol: ProtocolSettings | null;
  onUndo: () => void;
  onChangeDose?: () => void;
}) {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    if (!tap) return;
    const timer = window.setInterval(() => setNow(Date.now()), 250);
    return () => window.clearInterval(timer);
  }, [tap]);

  const leftMs = tap ? tap.undoUntil - now : 0;
  const canUndo = tap !== null && leftMs > 0;
  const showDose = tap?.entry.kind === 'drug' && onChangeDose !== undefined && tap.editUntil > now;
  if (!tap || (!canUndo && !showDose)) {
    return (
      <Box
        borderWidth="2px"
        borderStyle="dashed"
        borderColor="ink.200"
        borderRadius="l3"
        px="2"
        py="1"
        minH="12"
        display={{ base: 'none', md: 'flex' }}
        alignItems="center"
        flexShrink={0}
      >
        <Text textStyle="xs" color="ink.700">
          After each tap, Undo stays here for 5 seconds. Later, void an entry from the list below.
        </Text>
      </Box>
    );
  }
  return (
    <Box
      bg="ink.900"
      color="white"
      borderRadius="l3"
      px="2"
      py="1.5"
      flexShrink={0}
      data-testid="undo-bar"
      role="status"
      aria-live="polite"
    >
      <Flex align="center" gap="2" mb="1">
        <Shape kind="check" size="1.2em" color="seaglass.300" />
        <Text textStyle="sm" fontWeight="bold" lineClamp={1}>
          Saved on this tablet: {describeEntry(tap.entry, protocol)}
        </Text>
      </Flex>
      <Flex gap="2">
        {canUndo ? (
          <Button
            flex="1"
            minH="12"
            colorPalette="signal"
            bg="signal.300"
            color="ink.950"
            textStyle="lg"
            data-pad-action=""
            data-testid="undo"
            onClick={onUndo}
          >
            Undo ({Math.ceil(leftMs / 1000)} s)
          </Button>
        ) : null}
        {showDose ? (
          <Button
            flex="1"
            minH="12"
            variant="outline"
            color="white"
            borderColor="ink.200"
            _hover={{ bg: 'ink.700' }}
            whiteSpace="normal"
            textStyle="sm"
            lineHeight="1.1"
            data-testid="change-dose"
            onClick={onChangeDose}
          >
            Change dose or route
          </Button>
        ) : null}
      </Flex>
    </Box>
  );
}
