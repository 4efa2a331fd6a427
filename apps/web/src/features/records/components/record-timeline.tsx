import { Badge, Box, Button, HStack, Stack, Table, Text, VisuallyHidden } from '@chakra-ui/react';
import {
  effectiveEntries,
  type EffectiveEntry,
  type LogEntry,
  type ProtocolSettings,
  type RecordView,
} from '@steadyhand/shared';
import { useMemo } from 'react';
import { formatClockTime, formatSeconds } from '../../../lib/format';
import { describeEntry } from '../../../lib/live/entry-words';

export type CorrectionTarget = { entry: EffectiveEntry; action: 'amend' | 'void' };

interface RecordTimelineProps {
  view: RecordView;
  protocol: ProtocolSettings | null;
  /** Absent when the reader may not correct the log (not a recorder or leader). */
  onCorrect?: (target: CorrectionTarget) => void;
}

/**
 * The whole log as a table: every clinical entry as it now reads, with what it said first, each
 * correction (who, when, why) and voids struck through but kept. Nothing is hidden.
 */
export function RecordTimeline({ view, protocol, onCorrect }: RecordTimelineProps) {
  const { record, people } = view;
  const arrestMs = Date.parse(record.code.arrestAt);
  const rows = useMemo(() => effectiveEntries(record.entries), [record.entries]);
  const byId = useMemo(
    () => new Map<string, LogEntry>(record.entries.map((e) => [e.id, e])),
    [record.entries],
  );
  const who = (userId: string | undefined) => (userId ? (people[userId] ?? 'Unknown person') : '—');
  // The name kept with the stored entry when it was written comes first, as on the PDF.
  const writerOf = (id: string, userId: string | undefined) => byId.get(id)?.userName ?? who(userId);
  const recordedAt = (id: string) => {
    const stored = byId.get(id);
    return stored?.recordedAt ? formatClockTime(stored.recordedAt) : '';
  };

  return (
    <Table.ScrollArea whiteSpace="normal" borderWidth="1px" borderRadius="l2">
      {/* Long words and device ids wrap, so the table fits its frame from 1,280 px up. */}
      <Table.Root size="md" interactive data-testid="record-timeline" css={{ '& td, & th': { overflowWrap: 'anywhere', px: '2.5' } }}>
        <Table.Header>
          <Table.Row>
            <Table.ColumnHeader w="7rem">Time</Table.ColumnHeader>
            <Table.ColumnHeader>What</Table.ColumnHeader>
            <Table.ColumnHeader>Corrections and notes</Table.ColumnHeader>
            <Table.ColumnHeader>Who</Table.ColumnHeader>
            <Table.ColumnHeader>Device</Table.ColumnHeader>
            <Table.ColumnHeader>State</Table.ColumnHeader>
            {onCorrect ? (
              <Table.ColumnHeader>
                <VisuallyHidden>Change</VisuallyHidden>
              </Table.ColumnHeader>
            ) : null}
          </Table.Row>
        </Table.Header>
        <Table.Body>
          {rows.map((row) => {
            const current = describeEntry(row, protocol, byId);
            const first = describeEntry(row.original, protocol, byId);
            const stored = byId.get(row.id);
            return (
              <Table.Row
                key={row.id}
                data-testid="timeline-row"
                data-entry-id={row.id}
                data-voided={row.voided ? 'true' : undefined}
                verticalAlign="top"
              >
                <Table.Cell fontVariantNumeric="tabular-nums" whiteSpace="nowrap">
                  <Text fontWeight="bold">{formatClockTime(row.at)}</Text>
                  <Text color="fg.muted" textStyle="sm">
                    +{formatSeconds((Date.parse(row.at) - arrestMs) / 1000)}
                  </Text>
                </Table.Cell>
                <Table.Cell>
                  <Text
                    fontWeight="medium"
                    textDecoration={row.voided ? 'line-through' : undefined}
                    data-testid="timeline-what"
                  >
                    {current}
                  </Text>
                </Table.Cell>
                <Table.Cell>
                  <Stack gap="1" textStyle="sm">
                    {row.amendments.length > 0 ? (
                      <Text>
                        <strong>First recorded:</strong> {first}
                        {row.original.at !== row.at
                          ? ` at ${formatClockTime(row.original.at)}`
                          : ''}
                      </Text>
                    ) : null}
                    {row.amendments.map((a) => (
                      <Text key={a.id} data-testid="timeline-amendment">
                        <strong>Corrected</strong> at {recordedAt(a.id)} by {writerOf(a.id, a.userId)}:{' '}
                        {a.reason}
                        {byId.get(a.id)?.addendum ? ' (addendum)' : ''}
                      </Text>
                    ))}
                    {row.voided ? (
                      <Text color="alarm.700" data-testid="timeline-void">
                        <strong>Voided</strong> at {recordedAt(row.voided.id)} by{' '}
                        {writerOf(row.voided.id, row.voided.userId)}: {row.voided.reason}
                        {byId.get(row.voided.id)?.addendum ? ' (addendum)' : ''}
                      </Text>
                    ) : null}
                  </Stack>
                </Table.Cell>
                <Table.Cell>{writerOf(row.id, stored?.userId)}</Table.Cell>
                <Table.Cell>
                  <Text textStyle="sm" fontFamily="mono">
                    {row.deviceId ?? '—'}
                  </Text>
                </Table.Cell>
                <Table.Cell>
                  <HStack gap="1" wrap="wrap">
                    {row.voided ? (
                      <Badge colorPalette="red" variant="solid">
                        ✕ Voided
                      </Badge>
                    ) : null}
                    {row.amendments.length > 0 ? (
                      <Badge colorPalette="orange" variant="subtle">
                        ✎ Amended
                      </Badge>
                    ) : null}
                    {stored?.addendum ? (
                      <Badge colorPalette="purple" variant="subtle">
                        + Addendum
                      </Badge>
                    ) : null}
                  </HStack>
                </Table.Cell>
                {onCorrect ? (
                  <Table.Cell>
                    {row.voided ? null : (
                      <Stack gap="2" align="stretch">
                        <Button
                          size="sm"
                          variant="outline"
                          onClick={() => onCorrect({ entry: row, action: 'amend' })}
                          aria-label={`Correct: ${current}`}
                        >
                          Correct
                        </Button>
                        <Button
                          size="sm"
                          variant="outline"
                          colorPalette="red"
                          onClick={() => onCorrect({ entry: row, action: 'void' })}
                          aria-label={`Void: ${current}`}
                        >
                          Void
                        </Button>
                      </Stack>
                    )}
                  </Table.Cell>
                ) : null}
              </Table.Row>
            );
          })}
        </Table.Body>
      </Table.Root>
      {rows.length === 0 ? (
        <Box p="4">
          <Text>Nothing was recorded in this code.</Text>
        </Box>
      ) : null}
    </Table.ScrollArea>
  );
}
