import { Link, Table, Text } from '@chakra-ui/react';
import type { FollowUpListItem } from '@steadyhand/shared';
import { Link as RouterLink } from 'react-router';
import { formatDateTime, OUTCOME_WORDS } from './words';

const since = (days: number) => (days === 0 ? 'today' : days === 1 ? '1 day' : `${days} days`);

/** Codes waiting for their follow-up, oldest first, each with how long since the arrest and what is missing. */
export function FollowUpTable({
  items,
  hrefOf,
}: {
  items: FollowUpListItem[];
  hrefOf: (codeId: string) => string;
}) {
  return (
    <Table.ScrollArea whiteSpace="normal" borderWidth="1px" borderRadius="l2">
      <Table.Root size="md" data-testid="follow-up-table">
        <Table.Header>
          <Table.Row>
            <Table.ColumnHeader>Arrest</Table.ColumnHeader>
            <Table.ColumnHeader textAlign="end">Since the arrest</Table.ColumnHeader>
            <Table.ColumnHeader>Unit and place</Table.ColumnHeader>
            <Table.ColumnHeader>How the code ended</Table.ColumnHeader>
            <Table.ColumnHeader>Still waiting for</Table.ColumnHeader>
          </Table.Row>
        </Table.Header>
        <Table.Body>
          {items.map((i) => (
            <Table.Row key={i.codeId} data-testid="follow-up-row" data-code-id={i.codeId}>
              <Table.Cell>
                <Link asChild colorPalette="brand" fontWeight="bold">
                  <RouterLink to={hrefOf(i.codeId)}>{formatDateTime(i.arrestAt)}</RouterLink>
                </Link>
              </Table.Cell>
              <Table.Cell textAlign="end">{since(i.daysSinceArrest)}</Table.Cell>
              <Table.Cell>
                {[i.unitName, i.location].filter(Boolean).join(', ') || 'Not recorded'}
              </Table.Cell>
              <Table.Cell>
                {i.outcome ? OUTCOME_WORDS[i.outcome] : 'Not recorded'}
                {i.anyRosc ? (
                  <Text as="span" color="fg.muted">
                    {' '}
                    (ROSC recorded)
                  </Text>
                ) : null}
              </Table.Cell>
              <Table.Cell>{i.followUp.missing.join(', ')}</Table.Cell>
            </Table.Row>
          ))}
        </Table.Body>
      </Table.Root>
    </Table.ScrollArea>
  );
}
