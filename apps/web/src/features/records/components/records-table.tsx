import { Button, Table, Text, VisuallyHidden } from '@chakra-ui/react';
import type { RecordListItem } from '@steadyhand/shared';
import { Link as RouterLink } from 'react-router';
import { paths } from '../../../config/paths';
import { formatDateTime } from '../../../lib/format';
import { OUTCOME_WORDS } from '../../../lib/live/entry-words';
import { RecordStatusBadge } from './record-status-badge';

/** Ended codes, one row each: when, where, outcome, how far signed, and the way in. */
export function RecordsTable({ records, empty }: { records: RecordListItem[]; empty: string }) {
  if (records.length === 0) return <Text>{empty}</Text>;
  return (
    <Table.ScrollArea whiteSpace="normal" borderWidth="1px" borderRadius="l2">
      <Table.Root size="md" interactive data-testid="records-table">
        <Table.Header>
          <Table.Row>
            <Table.ColumnHeader>Arrest</Table.ColumnHeader>
            <Table.ColumnHeader>Where</Table.ColumnHeader>
            <Table.ColumnHeader>Outcome</Table.ColumnHeader>
            <Table.ColumnHeader>Record</Table.ColumnHeader>
            <Table.ColumnHeader>Signed by</Table.ColumnHeader>
            <Table.ColumnHeader>
              <VisuallyHidden>Open</VisuallyHidden>
            </Table.ColumnHeader>
          </Table.Row>
        </Table.Header>
        <Table.Body>
          {records.map(({ code, status, signatures }) => (
            <Table.Row key={code.id} data-testid="records-row" data-code-id={code.id}>
              <Table.Cell whiteSpace="nowrap">{formatDateTime(code.arrestAt)}</Table.Cell>
              <Table.Cell>{code.location ?? 'Location not recorded'}</Table.Cell>
              <Table.Cell>{code.outcome ? OUTCOME_WORDS[code.outcome] : '—'}</Table.Cell>
              <Table.Cell>
                <RecordStatusBadge status={status} />
              </Table.Cell>
              <Table.Cell>
                {signatures
                  .map((s) => `${s.printedName} (${s.meaningText.toLowerCase()})`)
                  .join('; ') || '—'}
              </Table.Cell>
              <Table.Cell>
                <Button
                  asChild
                  size="sm"
                  colorPalette="brand"
                  variant={status === 'signed' ? 'outline' : 'solid'}
                >
                  <RouterLink
                    to={paths.codes.review.getHref(code.id)}
                    aria-label={`${status === 'signed' ? 'Open' : 'Review and sign'} the record: ${code.location ?? 'code'}, ${formatDateTime(code.arrestAt)}`}
                  >
                    {status === 'signed' ? 'Open' : 'Review and sign'}
                  </RouterLink>
                </Button>
              </Table.Cell>
            </Table.Row>
          ))}
        </Table.Body>
      </Table.Root>
    </Table.ScrollArea>
  );
}
