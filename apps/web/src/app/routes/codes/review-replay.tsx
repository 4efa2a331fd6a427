import { Box, Flex, Heading, Slider, Stack, Text } from '@chakra-ui/react';
import { foldLog, formatElapsedMs, stateAt, type CanonicalRecord, type ProtocolSettings } from '@steadyhand/shared';
import dayjs from 'dayjs';
import { useMemo, useState } from 'react';
import { WallFace, WallHeading } from '../../../features/wall/components/wall-screen';

/**
 * The debrief's replay: the timer wall as it was at any moment of the code, from the same fold
 * of the log and the same state the wall and the pad showed. Lives in the route module, where the
 * records and the wall meet.
 */
export function ReviewReplay({ record, protocol }: { record: CanonicalRecord; protocol: ProtocolSettings }) {
  const timeline = useMemo(() => foldLog(record.code, record.entries, protocol), [record, protocol]);
  const fromMs = timeline.arrestAtMs;
  const toMs = Math.max(timeline.end?.atMs ?? 0, timeline.lastEntryMs, fromMs + 1000);
  const [offsetS, setOffsetS] = useState(() => Math.round((toMs - fromMs) / 1000));
  const atMs = fromMs + offsetS * 1000;
  const state = useMemo(() => stateAt(timeline, atMs, { recentCount: 4 }), [timeline, atMs]);
  const code = { ...record.code, protocolVersion: record.code.protocolVersion ?? null };
  return (
    <Stack as="section" gap="3" aria-labelledby="replay-heading" data-testid="review-replay">
      <Heading as="h2" id="replay-heading" textStyle="2xl">
        The wall at any moment
      </Heading>
      <Text color="fg.muted">
        Move the slider to see what the pad and the wall showed at that moment: the same clocks, reminders and doses, computed
        from the record as it now reads.
      </Text>
      <Slider.Root
        min={0}
        max={Math.round((toMs - fromMs) / 1000)}
        step={1}
        value={[offsetS]}
        onValueChange={(d) => setOffsetS(d.value[0] ?? 0)}
        maxW="full"
        size="lg"
      >
        <Flex justify="space-between" align="baseline">
          <Slider.Label>Moment of the code</Slider.Label>
          <Text fontWeight="bold" fontVariantNumeric="tabular-nums" data-testid="replay-moment">
            +{formatElapsedMs(atMs - fromMs)} · {dayjs(atMs).format('HH:mm:ss')}
          </Text>
        </Flex>
        <Slider.Control>
          <Slider.Track>
            <Slider.Range />
          </Slider.Track>
          <Slider.Thumbs />
        </Slider.Control>
      </Slider.Root>
      {/* The wall is drawn for a room-sized screen; here it is shown at half size. */}
      <Box bg="ink.950" color="white" borderRadius="l3" p="3" overflow="hidden" style={{ zoom: 0.5 }} data-testid="replay-wall">
        <Stack gap="3">
          <WallHeading code={code} />
          <WallFace code={code} protocol={protocol} state={state} entries={record.entries} />
        </Stack>
      </Box>
    </Stack>
  );
}
