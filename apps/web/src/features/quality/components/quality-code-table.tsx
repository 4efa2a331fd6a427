import { Badge, Box, Button, HStack, Link, Table, Text, Wrap } from '@chakra-ui/react';
import type { QualityListItem, QualitySortField } from '@steadyhand/shared';
import { Link as RouterLink } from 'react-router';
import { paths } from '../../../config/paths';
import { formatDateTime, formatPercent, formatSeconds, OUTCOME_WORDS, RHYTHM_WORDS, TARGET_WORDS } from './words';

interface Props {
  items: QualityListItem[];
  sort: QualitySortField;
  dir: 'asc' | 'desc';
  onSort: (field: QualitySortField) => void;
}

const COLUMNS: { field: QualitySortField; label: string; numeric?: boolean }[] = [
  { field: 'arrestAt', label: 'Arrest' },
  { field: 'unit', label: 'Unit' },
  { field: 'firstRhythm', label: 'First rhythm' },
  { field: 'toFirstShockSeconds', label: 'To shock', numeric: true },
  { field: 'toFirstEpinephrineSeconds', label: 'To epinephrine', numeric: true },
  { field: 'compressionFraction', label: 'Compression fraction (from taps)', numeric: true },
  { field: 'outcome', label: 'Outcome' },
  { field: 'targetsMissed', label: 'Targets missed' },
];

/** The reviewer's list: sortable headers (buttons, with aria-sort), one row per ended code. */
export function QualityCodeTable({ items, sort, dir, onSort }: Props) {
  return (
    <Table.ScrollArea whiteSpace="normal" borderWidth="1px" borderRadius="l2">
      <Table.Root size="md" striped data-testid="quality-table">
        <Table.Header>
          <Table.Row>
            {COLUMNS.map((c) => {
              const active = sort === c.field;
              return (
                <Table.ColumnHeader key={c.field} aria-sort={active ? (dir === 'asc' ? 'ascending' : 'descending') : 'none'} textAlign={c.numeric ? 'end' : 'start'}>
                  <Button variant="plain" size="sm" px="0" fontWeight="bold" onClick={() => onSort(c.field)} data-testid={`quality-sort-${c.field}`}>
                    {c.label}
                    <Text as="span" aria-hidden="true">
                      {active ? (dir === 'asc' ? ' ▲' : ' ▼') : ' ↕'}
                    </Text>
                  </Button>
                </Table.ColumnHeader>
              );
            })}
            <Table.ColumnHeader>Review</Table.ColumnHeader>
          </Table.Row>
        </Table.Header>
        <Table.Body>
          {items.map((item) => (
            <Table.Row key={item.codeId} data-testid="quality-row" data-code-id={item.codeId}>
              <Table.Cell>
                <Link asChild color="brand.fg" fontWeight="bold" textDecoration="underline">
                  <RouterLink to={paths.quality.code.getHref(item.codeId)}>{formatDateTime(item.arrestAt)}</RouterLink>
                </Link>
                {item.location ? (
                  <Text textStyle="sm" color="fg.muted">
                    {item.location}
                  </Text>
                ) : null}
              </Table.Cell>
              <Table.Cell>{item.unitName ?? '—'}</Table.Cell>
              <Table.Cell>{item.firstRhythm ? RHYTHM_WORDS[item.firstRhythm] : 'None recorded'}</Table.Cell>
              <Table.Cell textAlign="end">{formatSeconds(item.toFirstShockSeconds)}</Table.Cell>
              <Table.Cell textAlign="end">{formatSeconds(item.toFirstEpinephrineSeconds)}</Table.Cell>
              <Table.Cell textAlign="end">{formatPercent(item.compressionFraction)}</Table.Cell>
              <Table.Cell>{item.outcome ? OUTCOME_WORDS[item.outcome] : '—'}</Table.Cell>
              <Table.Cell>
                {item.targetsMissed.length === 0 ? (
                  <Text color="fg.muted">None</Text>
                ) : (
                  <Wrap gap="1">
                    {item.targetsMissed.map((t) => (
                      <Badge key={t} colorPalette="red" variant="outline" size="md">
                        <span aria-hidden="true">✕</span> {TARGET_WORDS[t]}
                      </Badge>
                    ))}
                  </Wrap>
                )}
              </Table.Cell>
              <Table.Cell>
                <HStack gap="1" wrap="wrap">
                  {item.reviewedAt ? <Badge colorPalette="green">✓ Signed off</Badge> : <Badge variant="outline">Open</Badge>}
                  {item.recordSigned ? null : <Box as="span" textStyle="xs" color="fg.muted">record unsigned</Box>}
                </HStack>
              </Table.Cell>
            </Table.Row>
          ))}
        </Table.Body>
      </Table.Root>
    </Table.ScrollArea>
  );
}
