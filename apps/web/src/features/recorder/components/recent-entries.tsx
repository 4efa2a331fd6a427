import { Badge, Box, Button, Flex, Heading, SimpleGrid, Stack, Text } from '@chakra-ui/react';
import {
  formatElapsedMs,
  type EffectiveEntry,
  type LogEntry,
  type ProtocolSettings,
} from '@steadyhand/shared';
import dayjs from 'dayjs';
import { useState } from 'react';
import { describeEntry } from '../../../lib/live/entry-words';
import { Shape } from '../../../components/ui/shapes';
import type { EntryStage, UnkeptTap } from '../../../lib/live/sync-engine';

/** The three stages in words and shapes; only the last two say the tap is kept. */
const STAGE_LOOK: Record<EntryStage, { words: string; shape: 'ring' | 'clock' | 'check'; palette: string; variant: 'outline' | 'solid' | 'subtle' }> = {
  recording: { words: 'Recording…', shape: 'ring', palette: 'gray', variant: 'outline' },
  'on-device': { words: 'On this tablet', shape: 'clock', palette: 'orange', variant: 'solid' },
  saved: { words: 'Saved', shape: 'check', palette: 'green', variant: 'subtle' },
};

export const VOID_REASONS = [
  'Tapped by mistake',
  'Recorded twice',
  'Wrong details or time',
  'Belongs to another code',
] as const;

interface RecentEntriesProps {
  entries: readonly EffectiveEntry[];
  /** Every entry by id, corrections included (to know whether a correction is still waiting). */
  all: readonly LogEntry[];
  /** Where each entry is on its way (recording, on this device, saved). */
  stageOf: (id: string) => EntryStage;
  /** Taps whose IndexedDB write failed: shown first, loudly. */
  unkept?: readonly UnkeptTap[];
  arrestAtMs: number;
  protocol: ProtocolSettings | null;
  count?: number;
  /** Absent on a read-only screen. */
  onVoid?: (entry: EffectiveEntry, reason: string) => void;
}

/** The newest entries first, each with its time since arrest and its clock time, and whether it has reached the server. */
export function RecentEntries({
  entries,
  all,
  stageOf,
  unkept = [],
  arrestAtMs,
  protocol,
  count = 8,
  onVoid,
}: RecentEntriesProps) {
  const [voiding, setVoiding] = useState<string | null>(null);
  const newest = entries.slice(-count).reverse();
  const waitingCorrection = new Set<string>();
  for (const e of all) {
    if ((e.kind === 'void' || e.kind === 'amend') && stageOf(e.id) !== 'saved')
      waitingCorrection.add(e.target);
  }

  return (
    <Flex as="section" direction="column" flex="1" minH={{ base: 'auto', md: '0' }} aria-labelledby="recent-title" data-testid="recent-entries">
      <Heading
        as="h2"
        id="recent-title"
        textStyle="xs"
        fontWeight="black"
        textTransform="uppercase"
        letterSpacing="wider"
        color="ink.700"
        mb="1"
      >
        Latest entries
      </Heading>
      {unkept.map((u) => (
        <Box
          key={u.entry.id}
          role="alert"
          data-testid="entry-unkept"
          bg="alarm.600"
          color="white"
          borderRadius="l2"
          px="2"
          py="1"
          mb="1"
        >
          <Text textStyle="sm" fontWeight="black">
            NOT KEPT: {describeEntry(u.entry, protocol)}
          </Text>
          <Text textStyle="xs">This tablet could not store it ({u.error}). Write it on paper.</Text>
        </Box>
      ))}
      {newest.length === 0 ? (
        <Text color="ink.700" data-testid="recent-empty">
          Nothing recorded yet. Each tap appears here at once.
        </Text>
      ) : (
        <Stack
          as="ol"
          gap="1"
          listStyleType="none"
          m="0"
          p="0"
          aria-live="polite"
          flex="1"
          minH="0"
          overflowY={{ base: 'visible', md: 'auto' }}
          tabIndex={0}
          aria-label="Latest entries, newest first"
        >
          {newest.map((e) => {
            const stage: EntryStage = waitingCorrection.has(e.id) ? 'on-device' : stageOf(e.id);
            const pending = stage !== 'saved';
            const look = STAGE_LOOK[stage];
            const voided = e.voided !== null;
            const atMs = Date.parse(e.at);
            return (
              <Box
                as="li"
                key={e.id}
                data-testid="entry-row"
                data-entry-id={e.id}
                data-kind={e.kind}
                data-pending={String(pending)}
                data-stage={stage}
                data-voided={String(voided)}
                bg={voided ? 'ink.50' : 'white'}
                borderWidth="1px"
                borderColor={pending ? 'signal.500' : 'ink.100'}
                borderLeftWidth="5px"
                borderStyle={stage === 'recording' ? 'dashed' : 'solid'}
                borderLeftColor={pending ? 'signal.400' : voided ? 'ink.300' : 'seaglass.600'}
                borderRadius="l2"
                px="2"
                py="0.5"
                flexShrink={0}
              >
                <Flex align="center" gap="2">
                  <Stack gap="0" minW="3.75rem" flexShrink={0}>
                    <Text
                      textStyle="md"
                      fontWeight="bold"
                      fontVariantNumeric="tabular-nums"
                      lineHeight="1.1"
                    >
                      {formatElapsedMs(atMs - arrestAtMs)}
                    </Text>
                    <Text textStyle="xs" color="ink.700" fontVariantNumeric="tabular-nums">
                      {dayjs(atMs).format('HH:mm:ss')}
                    </Text>
                  </Stack>
                  <Box flex="1" minW="0">
                    <Text
                      textStyle="sm"
                      fontWeight="bold"
                      lineHeight="1.2"
                      textDecoration={voided ? 'line-through' : undefined}
                      color={voided ? 'ink.500' : 'ink.950'}
                      lineClamp={2}
                    >
                      {describeEntry(e, protocol)}
                    </Text>
                    <Flex gap="1.5" wrap="wrap" mt="0.5">
                      <Badge
                        colorPalette={look.palette}
                        variant={look.variant}
                        size="sm"
                        data-testid={stage === 'saved' ? 'entry-saved' : 'entry-pending'}
                      >
                        <Shape kind={look.shape} size="1em" /> {look.words}
                      </Badge>
                      {voided ? (
                        <Badge colorPalette="gray" variant="outline" size="sm">
                          Voided: {e.voided?.reason}
                        </Badge>
                      ) : null}
                      {e.amendments.length > 0 ? (
                        <Badge colorPalette="blue" variant="outline" size="sm">
                          Corrected
                        </Badge>
                      ) : null}
                    </Flex>
                  </Box>
                  {onVoid && !voided ? (
                    <Button
                      variant="outline"
                      colorPalette="ink"
                      bg="white"
                      minH="12"
                      minW="12"
                      px="2"
                      flexShrink={0}
                      aria-expanded={voiding === e.id}
                      aria-label={`Void "${describeEntry(e, protocol)}"`}
                      data-testid="entry-void"
                      onClick={() => setVoiding(voiding === e.id ? null : e.id)}
                    >
                      Void…
                    </Button>
                  ) : null}
                </Flex>
                {onVoid && voiding === e.id ? (
                  <Box mt="2" role="group" aria-label="Why void this entry?">
                    <Text textStyle="sm" fontWeight="bold" mb="1">
                      Why void it? The entry stays in the record, struck through.
                    </Text>
                    <SimpleGrid columns={2} gap="1.5">
                      {VOID_REASONS.map((reason) => (
                        <Button
                          key={reason}
                          minH="12"
                          h="auto"
                          whiteSpace="normal"
                          colorPalette="ink"
                          data-testid="void-reason"
                          onClick={() => {
                            onVoid(e, reason);
                            setVoiding(null);
                          }}
                        >
                          {reason}
                        </Button>
                      ))}
                      <Button
                        minH="12"
                        variant="outline"
                        bg="white"
                        gridColumn="span 2"
                        onClick={() => setVoiding(null)}
                      >
                        Keep it
                      </Button>
                    </SimpleGrid>
                  </Box>
                ) : null}
              </Box>
            );
          })}
        </Stack>
      )}
    </Flex>
  );
}
